// A whole run as one stream: the scan's events, then, however the scan ended (done, stopped, failed),
// the bench brought to its safe state and a final `done` event saying how it ended and whether the bench
// is safe. The stream itself never errors: a failure is the `done` event's status and reason.
import { catchError, concat, defer, EMPTY, from, mergeMap, tap, type Observable } from 'rxjs';
import { OperatorGone } from './probe-guide.js';
import { bringToSafeState } from './safe-state.js';
import { now, type RunEvent, type ScanDone } from './run-events.js';
import { errorMessage } from './recovery.js';
import { addEvent, EMPTY_TALLY, type Tally } from './run-tally.js';
import { planChannels, runScan, type ScanOptions } from './scan-runner.js';

export type FailureCause = 'instrument' | 'input' | 'internal';

export interface JobOutcome {
  done: ScanDone;
  /** For a failed run: whose fault it was (the CLI turns this into the exit code). */
  cause?: FailureCause;
}

export interface ScanJobOptions extends ScanOptions {
  /** The counts of the readings an earlier run logged. */
  previous?: Tally;
  /** Told the outcome just before the `done` event goes out. */
  onOutcome?(outcome: JobOutcome): void;
}

export function runScanJob(o: ScanJobOptions): Observable<RunEvent> {
  let tally = o.previous ?? EMPTY_TALLY;
  let failure: unknown;
  const scan$ = runScan(o).pipe(
    tap((e) => (tally = addEvent(tally, e))),
    catchError((error: unknown) => {
      // The operator walking away (stdin closed) ends the run like Ctrl-C, not like a broken instrument.
      if (error instanceof OperatorGone) o.stop.request(error.message);
      else failure = error;
      return EMPTY;
    }),
  );
  const finish$ = defer(async () => {
    const result = await bringToSafeState({ analyzer: o.analyzer, switchMatrix: o.switchMatrix, probes: o.probes, channels: planChannels(o.plan) });
    // A stop raised by a failure outside the scan (the log) ends the run as failed, not interrupted.
    failure ??= o.stop.failure;
    const status = failure !== undefined ? 'failed' : o.stop.requested ? 'interrupted' : 'complete';
    const reason = failure !== undefined ? errorMessage(failure) : o.stop.requested ? o.stop.reason : undefined;
    const done: ScanDone = { event: 'done', time: now(), status, ...tally, ...(reason ? { reason } : {}), safe: result.safe };
    const outcome: JobOutcome = { done, ...(failure !== undefined ? { cause: causeOf(failure) } : {}) };
    o.onOutcome?.(outcome);
    return [...result.warnings, done] as RunEvent[];
  }).pipe(mergeMap((events) => from(events)));
  return concat(scan$, finish$);
}

export function causeOf(error: unknown): FailureCause {
  const code = (error as { exitCode?: unknown })?.exitCode;
  if (code === 3) return 'instrument';
  if (code === 2) return 'input';
  return 'internal';
}
