// A simulated bench in process for runner tests: the real session, driver and SCPI parser code on memory
// lines, with every program message both instruments receive recorded in one shared, ordered list, and
// optional link misbehaviour or a device wrapper per instrument.
import type { Board } from '../../../../src/board/types.js';
import { builtinProfile, parseProfileText, type AnalyzerProfile, type SwitchProfile } from '../../../../src/instruments/index.js';
import { analyzerLink, switchLink, type AnalyzerLink, type SwitchLink } from '../../../../src/run/bench/instrument-link.js';
import { inProcessLine } from '../../../../src/run/bench/in-process-line.js';
import { startBench } from '../../../../src/run/bench/connect-bench.js';
import { fixtureOf } from '../../../../src/run/bench/simulated-bench.js';
import type { ScanPlan } from '../../../../src/plan/types.js';
import { SimulatedBench } from '../../../../simulators/bench.js';
import type { SimulatedDevice } from '../../../../simulators/device.js';
import { Misbehaviour, type MisbehaviourOptions } from '../../../../simulators/misbehaviour.js';
import { readFileSync } from 'node:fs';
import { BUILTIN_PROFILE_DIR } from '../../../../src/instruments/index.js';
import path from 'node:path';

export interface Heard {
  who: 'analyzer' | 'switch';
  message: string;
}

export interface BenchUnderTest {
  bench: SimulatedBench;
  analyzer: AnalyzerLink;
  switchMatrix: SwitchLink;
  heard: Heard[];
  start(): Promise<void>;
  close(): Promise<void>;
}

export interface BenchOptions {
  faults?: string[];
  analyzerMisbehaviour?: Omit<MisbehaviourOptions, 'seed'>;
  switchMisbehaviour?: Omit<MisbehaviourOptions, 'seed'>;
  /** Wraps a device, e.g. to make it lie about its relays. */
  wrapSwitch?: (device: SimulatedDevice) => SimulatedDevice;
  wrapAnalyzer?: (device: SimulatedDevice) => SimulatedDevice;
  analyzerProfile?: AnalyzerProfile;
  switchProfile?: SwitchProfile;
}

function recording(device: SimulatedDevice, who: Heard['who'], heard: Heard[]): SimulatedDevice {
  return {
    get identity() {
      return device.identity;
    },
    receive(message) {
      heard.push({ who, message });
      return device.receive(message);
    },
    reset: () => device.reset(),
    injectError: (code, detail) => device.injectError?.(code, detail),
    unterminatedQuery: (fragment) => device.unterminatedQuery?.(fragment),
  };
}

export function benchUnderTest(board: Board, plan: ScanPlan, o: BenchOptions = {}): BenchUnderTest {
  const bench = new SimulatedBench({ board, faults: o.faults ?? [], seed: 7, timing: 'instant', fixture: fixtureOf(board, plan.fixture) });
  const heard: Heard[] = [];
  const aProfile = o.analyzerProfile ?? (builtinProfile('generic-analyzer') as AnalyzerProfile);
  const sProfile = o.switchProfile ?? (builtinProfile('generic-switch') as SwitchProfile);
  const mis = (m?: Omit<MisbehaviourOptions, 'seed'>) => (m ? new Misbehaviour({ seed: 11, ...m }) : undefined);
  const switchDevice = o.wrapSwitch ? o.wrapSwitch(bench.switchMatrix) : bench.switchMatrix;
  const analyzerDevice = o.wrapAnalyzer ? o.wrapAnalyzer(bench.analyzer) : bench.analyzer;
  const noSleep = { sleep: () => Promise.resolve() };
  const analyzer = analyzerLink(aProfile, inProcessLine(recording(analyzerDevice, 'analyzer', heard), 'analyzer', aProfile.terminators.read, mis(o.analyzerMisbehaviour)), { driver: noSleep });
  const switchMatrix = switchLink(sProfile, inProcessLine(recording(switchDevice, 'switch', heard), 'switch', sProfile.terminators.read, mis(o.switchMisbehaviour)), { driver: noSleep });
  return {
    bench,
    analyzer,
    switchMatrix,
    heard,
    async start() {
      await startBench(this);
    },
    async close() {
      await analyzer.close();
      await switchMatrix.close();
    },
  };
}

/** A built-in profile with a shorter command timeout, so that late answers are found out quickly. */
export function quickProfile(name: 'generic-analyzer' | 'generic-switch', timeout = '150 ms'): AnalyzerProfile & SwitchProfile {
  const file = path.join(BUILTIN_PROFILE_DIR, `${name}.yaml`);
  const text = readFileSync(file, 'utf8').replace(/timeouts: \{ command: [^,]+,/, `timeouts: { command: ${timeout},`);
  return parseProfileText(text, file) as AnalyzerProfile & SwitchProfile;
}
