// The run as a stream of events. Steps run one after the other; inside a step the bench is prepared
// (BenchControl.enterStep), then every pending point is read; each raw reading is judged against its band
// by a pure operator the moment it arrives. Trouble is ridden out per step: the step starts again where it
// stopped, after a pause or a reconnect, until the policy's attempts are used up.
import { concat, concatMap, defer, EMPTY, from, ignoreElements, map, merge, Observable, of, range, retry, throwError, timer, type OperatorFunction } from 'rxjs';
import type { Complex, Invalid, SessionNotice } from '../instruments/index.js';
import { formatErrorEntries } from '../instruments/error-queue.js';
import type { PlanStep, ScanPlan } from '../plan/types.js';
import { BenchControl, type Waits } from './bench-control.js';
import type { AnalyzerLink, InstrumentLink, SwitchLink } from './bench/instrument-link.js';
import { judgeReading } from './judge-reading.js';
import type { ProbeGuide } from './probe-guide.js';
import { backoffMs, classifyTrouble, DEFAULT_RETRY, errorMessage, type RetryPolicy } from './recovery.js';
import { now, warning, type DeviationFound, type ReadingTaken, type RunEvent, type RunWarning, type StepStarted } from './run-events.js';
import type { StopSignal } from './stop-signal.js';
import { pendingOfStep, totalReadings, type PendingPoint, type PendingStep } from './work-list.js';

export interface ScanOptions {
  plan: ScanPlan;
  /** Names the plan in the `started` event (its file). */
  planName: string;
  analyzer: AnalyzerLink;
  /** Absent: operator-probed mode, `probes` asks a person to move the probes. */
  switchMatrix?: SwitchLink;
  probes?: ProbeGuide;
  /** Readings already logged by an earlier run, by readingKey(step, point). */
  done?: ReadonlySet<string>;
  stop: StopSignal;
  waits: Waits;
  retry?: RetryPolicy;
}

/** A reading before judgement: what the analyzer said for one point of one step. */
export interface RawReading {
  event: 'raw-reading';
  time: string;
  step: PlanStep;
  point: PendingPoint;
  value: Complex | Invalid;
  note?: string;
}

type Inner = RunEvent | RawReading;

/** Every channel a plan can close: its steps' and its fixture's. */
export function planChannels(plan: ScanPlan): number[] {
  const all = new Set<number>();
  for (const step of plan.steps) for (const c of step.channels) all.add(c);
  for (const channels of [...Object.values(plan.fixture.nodes), plan.fixture.gnd]) {
    for (const c of Object.values(channels)) if (typeof c === 'number') all.add(c);
  }
  return [...all].sort((a, b) => a - b);
}

/** The scan as events; completes when the work is done or a stop was asked for, errors on a failure. */
export function runScan(o: ScanOptions): Observable<RunEvent> {
  return new Observable<Inner>((subscriber) => {
    const warn = (w: RunWarning) => subscriber.next(w);
    const policy = o.retry ?? DEFAULT_RETRY;
    const bench = new BenchControl({
      analyzer: o.analyzer,
      switchMatrix: o.switchMatrix,
      probes: o.probes,
      channels: planChannels(o.plan),
      settleAfterFrequencyS: o.plan.timing.settle_after_frequency_s,
      waits: o.waits,
      stop: o.stop,
      retry: policy,
      warn,
    });
    const unlisten = bench.links.map((link) => link.onNotice((n) => warn(noticeWarning(link, n))));
    const done = o.done ?? new Set<string>();
    const started: RunEvent = {
      event: 'started',
      time: now(),
      plan: o.planName,
      board: o.plan.board.name,
      mode: o.switchMatrix ? 'switched' : 'operator',
      steps: o.plan.steps.length,
      readings_total: totalReadings(o.plan),
      readings_done: o.done?.size ?? 0,
    };
    const scan$ = concat(
      of(started),
      // Start from a known state: excitation down, every relay open and confirmed so.
      defer(() => bench.excitationToMinimum()).pipe(ignoreElements()),
      o.switchMatrix ? defer(() => bench.openEverything(o.switchMatrix!)).pipe(ignoreElements()) : EMPTY,
      // Step by step, each step's pending points worked out only when it starts.
      range(0, o.plan.steps.length).pipe(
        concatMap((i) =>
          defer(() => {
            const work = pendingOfStep(o.plan.steps[i], done);
            return work.points.length > 0 ? stepRun(bench, work, o.stop, policy, warn) : EMPTY;
          }),
        ),
      ),
    );
    const subscription = scan$.subscribe(subscriber);
    return () => {
      subscription.unsubscribe();
      for (const off of unlisten) off();
    };
  }).pipe(judgeReadings());
}

/** Pure: raw readings become `reading` events, followed by a `deviation` event when outside the band. */
export function judgeReadings(): OperatorFunction<Inner, RunEvent> {
  return concatMap((item: Inner) => (item.event === 'raw-reading' ? judged(item) : of(item)));
}

function judged(raw: RawReading): Observable<RunEvent> {
  const { step, point, value } = raw;
  const verdict = judgeReading(value, point.data.band);
  const reading: ReadingTaken = {
    event: 'reading',
    time: raw.time,
    step: step.step,
    point: point.point,
    kind: step.kind,
    hi: step.hi,
    lo: step.lo,
    ...(step.sense !== undefined ? { sense: step.sense } : {}),
    frequency_hz: point.data.frequency_hz,
    re: value === 'invalid' ? null : value.re,
    im: value === 'invalid' ? null : value.im,
    pred_re: point.data.pred_re,
    pred_im: point.data.pred_im,
    flag: verdict.flag,
    ...(raw.note !== undefined && verdict.flag === 'invalid' ? { note: raw.note } : {}),
  };
  if (verdict.flag !== 'deviation') return of(reading);
  const deviation: DeviationFound = {
    event: 'deviation',
    time: raw.time,
    step: step.step,
    point: point.point,
    hi: step.hi,
    lo: step.lo,
    ...(step.sense !== undefined ? { sense: step.sense } : {}),
    frequency_hz: point.data.frequency_hz,
    magnitude_ohm: verdict.magnitude_ohm,
    phase_deg: verdict.phase_deg,
    band: point.data.band,
    outside: verdict.outside,
  };
  return of(reading, deviation);
}

/**
 * One step: announced once, then (per attempt) the bench prepared and the points not yet read measured.
 * `next` is where an attempt resumes, so a retry or reconnect neither repeats nor skips a point.
 */
function stepRun(bench: BenchControl, work: PendingStep, stop: StopSignal, policy: RetryPolicy, warn: (w: RunWarning) => void): Observable<Inner> {
  let next = 0;
  const announce: StepStarted = {
    event: 'step-started',
    time: now(),
    step: work.step.step,
    kind: work.step.kind,
    purpose: work.step.purpose,
    hi: work.step.hi,
    lo: work.step.lo,
    ...(work.step.sense !== undefined ? { sense: work.step.sense } : {}),
    channels: [...work.step.channels],
    points: work.points.length,
  };
  const attempt$ = defer(() =>
    stop.requested
      ? EMPTY
      : concat(
          defer(() => bench.enterStep(work.step)).pipe(ignoreElements()),
          defer(() => from(work.points.slice(next))).pipe(
            concatMap((point) =>
              stop.requested
                ? EMPTY
                : defer(() => bench.measureAt(point.data.frequency_hz)).pipe(
                    map((m): RawReading => {
                      next++;
                      return { event: 'raw-reading', time: now(), step: work.step, point, value: m.value, ...(m.note ? { note: m.note } : {}) };
                    }),
                  ),
            ),
          ),
          defer(() => bench.drainAfterStep(work.step)).pipe(ignoreElements()),
        ),
  );
  const where = () => `step ${work.step.step} (${work.step.hi} to ${work.step.lo})${next < work.points.length ? `, point ${work.points[next].point}` : ''}`;
  return concat(
    stop.requested ? EMPTY : of(announce),
    attempt$.pipe(
      retry({
        resetOnSuccess: true,
        delay: (error: unknown, attempt: number) => {
          if (stop.requested) return EMPTY;
          const trouble = classifyTrouble(error);
          if (trouble === 'fatal') return throwError(() => error);
          if (trouble === 'line-lost') {
            warn(warning('runner', `line lost at ${where()}: ${errorMessage(error)}; reconnecting`));
            if (attempt > policy.retries + 1) return throwError(() => error);
            return from(bench.reconnect(error));
          }
          if (attempt > policy.retries) return throwError(() => gaveUp(error, attempt - 1, where()));
          const pause = backoffMs(policy, attempt);
          const detail = error instanceof Error && 'entries' in error ? ` (${formatErrorEntries((error as { entries: [] }).entries)})` : '';
          warn(warning('runner', `${errorMessage(error)}${detail} at ${where()}; trying again in ${pause} ms (attempt ${attempt + 1} of ${policy.retries + 1})`));
          return merge(timer(pause), stop.requested$);
        },
      }),
    ),
  );
}

function gaveUp(error: unknown, retries: number, where: string): Error {
  const exitCode = (error as { exitCode?: number }).exitCode ?? 3;
  return Object.assign(new Error(`${errorMessage(error)} (at ${where}, still after ${retries} ${retries === 1 ? 'retry' : 'retries'})`), { exitCode, cause: error });
}

function noticeWarning(link: InstrumentLink<unknown>, notice: SessionNotice): RunWarning {
  const errors = 'errors' in notice && notice.errors.length > 0 ? `; its error queue held ${formatErrorEntries(notice.errors)}` : '';
  switch (notice.kind) {
    case 'unexpected-answer':
      return warning(link.role, `${link.session.endpoint} sent ${notice.lines.length} line(s) nobody asked for (${notice.lines.slice(0, 3).map((l) => JSON.stringify(l)).join(', ')})${errors}`);
    case 'resynchronized':
      return warning(link.role, `${link.session.endpoint} was out of step; skipped ${notice.discarded.length} stale line(s) and found its place again${errors}`);
    case 'trace-failed':
      return warning(link.role, notice.reason);
  }
}
