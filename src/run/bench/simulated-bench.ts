// `run --sim`: the simulated bench built from the plan's board snapshot, the faults given on the command
// line and the plan's fixture wiring (which channel reaches which node), never from the plan's predictions,
// with each instrument on an in-process line.
import type { Board } from '../../board/types.js';
import { defaultFixtureMap, FixtureMap, type FixtureMapData } from '../../instruments/fixture-map.js';
import type { Transport } from '../../instruments/index.js';
import type { AnalyzerProfile, SwitchProfile } from '../../instruments/index.js';
import { SimulatedBench, type BenchTiming } from '../../../simulators/bench.js';
import { inProcessLine } from './in-process-line.js';

export interface SimulatedSetup {
  board: Board;
  faults: readonly string[];
  seed: number;
  timing: BenchTiming;
  /** The plan's wiring; an empty map (operator plans) means the board's default map. */
  fixture: FixtureMapData;
}

export interface SimulatedLines {
  bench: SimulatedBench;
  analyzer: Transport;
  switchMatrix: Transport;
}

export function fixtureOf(board: Board, data: FixtureMapData): FixtureMap {
  return Object.keys(data.nodes).length === 0 ? defaultFixtureMap(board) : new FixtureMap(data, `fixture map of the plan for ${board.name}`);
}

export function simulatedLines(setup: SimulatedSetup, analyzer: AnalyzerProfile, switchProfile: SwitchProfile | undefined): SimulatedLines {
  const bench = new SimulatedBench({
    board: setup.board,
    faults: setup.faults,
    seed: setup.seed,
    timing: setup.timing,
    fixture: fixtureOf(setup.board, setup.fixture),
  });
  return {
    bench,
    analyzer: inProcessLine(bench.analyzer, 'analyzer', analyzer.terminators.read),
    switchMatrix: inProcessLine(bench.switchMatrix, 'switch', switchProfile?.terminators.read ?? 'LF'),
  };
}
