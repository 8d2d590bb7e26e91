// The instruments of a run, ready to use: on their lines (serial or TCP addresses) or on the simulated
// bench in process, each started (identity checked against its profile, setup sent). A simulated bench
// that settles at once gets drivers that do not wait either.
import {
  parseAddress,
  transportFor,
  type AnalyzerProfile,
  type DriverOptions,
  type SwitchProfile,
  type Transport,
} from '../../instruments/index.js';
import type { SimulatedBench } from '../../../simulators/bench.js';
import { analyzerLink, switchLink, type AnalyzerLink, type SwitchLink } from './instrument-link.js';
import { simulatedLines, type SimulatedSetup } from './simulated-bench.js';

export type BenchTarget =
  | { kind: 'simulated'; setup: SimulatedSetup }
  | { kind: 'lines'; analyzer: string; switchMatrix?: string };

export interface BenchRequest {
  target: BenchTarget;
  analyzer: AnalyzerProfile;
  /** Absent in operator-probed mode. */
  switchMatrix?: SwitchProfile;
  traceFile?: string;
  /** False for a simulated bench with instant timing: nothing to wait for. */
  waitForSettling: boolean;
}

export interface ConnectedBench {
  analyzer: AnalyzerLink;
  switchMatrix?: SwitchLink;
  /** The simulated bench, when the run is simulated (for the simulated operator's probes). */
  simulated?: SimulatedBench;
  addresses: { analyzer: string; switchMatrix: string | null };
  close(): Promise<void>;
}

const noSleep: DriverOptions = { sleep: () => Promise.resolve() };

/** Builds the links; nothing is opened yet (start() opens and identifies). */
export function benchLinks(request: BenchRequest): ConnectedBench {
  const driver = request.waitForSettling ? undefined : noSleep;
  const options = { traceFile: request.traceFile, driver };
  let lines: { analyzer: Transport; switchMatrix?: Transport };
  let simulated: SimulatedBench | undefined;
  if (request.target.kind === 'simulated') {
    const sim = simulatedLines(request.target.setup, request.analyzer, request.switchMatrix);
    simulated = sim.bench;
    lines = { analyzer: sim.analyzer, switchMatrix: request.switchMatrix ? sim.switchMatrix : undefined };
  } else {
    const analyzer = transportFor(parseAddress(request.target.analyzer, '--analyzer'), request.analyzer);
    const switchMatrix =
      request.switchMatrix && request.target.switchMatrix !== undefined
        ? transportFor(parseAddress(request.target.switchMatrix, '--switch'), request.switchMatrix)
        : undefined;
    lines = { analyzer, switchMatrix };
  }
  const analyzer = analyzerLink(request.analyzer, lines.analyzer, options);
  const matrix = request.switchMatrix && lines.switchMatrix ? switchLink(request.switchMatrix, lines.switchMatrix, options) : undefined;
  return {
    analyzer,
    switchMatrix: matrix,
    simulated,
    addresses: { analyzer: lines.analyzer.endpoint, switchMatrix: lines.switchMatrix?.endpoint ?? null },
    async close() {
      await Promise.all([analyzer.close().catch(() => undefined), matrix?.close().catch(() => undefined)]);
    },
  };
}

/**
 * Starts every instrument, the analyzer first with its excitation brought to the minimum, so that the
 * matrix's setup (which may move relays) never switches a live source. On a failure the instruments
 * already open are closed again before it is thrown.
 */
export async function startBench(bench: Pick<ConnectedBench, 'analyzer' | 'switchMatrix' | 'close'>): Promise<void> {
  try {
    await bench.analyzer.start();
    await bench.analyzer.driver.setLevel(bench.analyzer.profile.limits.levelV.min);
    await bench.switchMatrix?.start();
  } catch (error) {
    await bench.close();
    throw error;
  }
}
