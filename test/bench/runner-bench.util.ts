// Shared pieces of the runner benchmarks (not a benchmark module itself): plans for the demo chain, an
// in-process simulated bench on the real session and driver code, and a run of the whole job into a log.
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { lastValueFrom, tap } from 'rxjs';
import { loadBoard } from '../../src/board/index.js';
import type { Board } from '../../src/board/types.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import type { ScanPlan } from '../../src/plan/types.js';
import { benchLinks, startBench, type ConnectedBench } from '../../src/run/bench/connect-bench.js';
import { noWaits, realWaits } from '../../src/run/bench-control.js';
import { runScanJob } from '../../src/run/scan-job.js';
import { StopSignal } from '../../src/run/stop-signal.js';
import type { RunEvent, ScanDone } from '../../src/run/run-events.js';
import { ScanLog } from '../../src/log/scan-log.js';

export const CHAIN = 'shared/boards/chain-24.yaml';

export function chainBoard(): Board {
  return loadBoard(CHAIN);
}

export function profiles(): { analyzer: AnalyzerProfile; switchMatrix: SwitchProfile } {
  return { analyzer: builtinProfile('generic-analyzer') as AnalyzerProfile, switchMatrix: builtinProfile('generic-switch') as SwitchProfile };
}

export async function simulatedBench(board: Board, plan: ScanPlan, timing: 'instant' | 'realistic'): Promise<ConnectedBench> {
  const p = profiles();
  const bench = benchLinks({
    target: { kind: 'simulated', setup: { board, faults: [], seed: 1, timing, fixture: plan.fixture } },
    analyzer: p.analyzer,
    switchMatrix: p.switchMatrix,
    waitForSettling: timing === 'realistic',
  });
  await startBench(bench);
  return bench;
}

export interface JobRun {
  ms: number;
  done: ScanDone;
}

/** The whole job (runner, judging, safe state) with every event also going to a log in a temporary folder when `log`. */
export async function runJob(plan: ScanPlan, bench: Pick<ConnectedBench, 'analyzer' | 'switchMatrix'>, o: { log: boolean; timing: 'instant' | 'realistic'; each?: (e: RunEvent) => void }): Promise<JobRun> {
  const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-bench-'));
  const log = o.log
    ? ScanLog.create(path.join(dir, 'scan.csv'), {
        plan: { file: 'bench', sha256: '0'.repeat(64), created: plan.created, software: plan.software },
        board: plan.board,
        mode: 'switched',
        instruments: { analyzer: { profile: 'generic-analyzer', address: 'memory', identity: null }, switch: null },
        simulated: { faults: [], seed: 1, timing: o.timing },
      })
    : undefined;
  let done: ScanDone | undefined;
  const t0 = performance.now();
  await lastValueFrom(
    runScanJob({ plan, planName: 'bench', analyzer: bench.analyzer, switchMatrix: bench.switchMatrix, stop: new StopSignal(), waits: o.timing === 'instant' ? noWaits : realWaits }).pipe(
      tap((e) => {
        log?.record(e);
        o.each?.(e);
        if (e.event === 'done') done = e;
      }),
    ),
  );
  const ms = performance.now() - t0;
  rmSync(dir, { recursive: true, force: true });
  return { ms, done: done! };
}

export const median = (xs: number[]): number => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
