// The simulated bench: a board as built (with its injected faults), the fixture that wires it to a
// simulated switch matrix, and a simulated analyzer whose readings come from the physics of that board
// through whichever relays are closed. It never sees a plan or a prediction.
import type { Board } from '../src/board/types.js';
import { defaultFixtureMap, type FixtureMap } from '../src/instruments/fixture-map.js';
import { SimulatedAnalyzer } from './analyzer.js';
import { buildBoardAsBuilt } from './board-as-built.js';
import { BenchPhysics, type BenchPhysicsOptions } from './bench-physics.js';
import { parseFaults, type PartFault } from './faults.js';
import { SimulatedSwitchMatrix, type StuckState } from './switch-matrix.js';

export type BenchTiming = 'instant' | 'realistic';

export interface BenchSetup {
  board: Board;
  /** `REF=open|short|VALUE` texts, as on the command line. */
  faults?: readonly string[];
  fixture?: FixtureMap;
  /** Seeds the measurement noise (and is recorded by callers for repeatability). */
  seed?: number;
  timing?: BenchTiming;
  physics?: BenchPhysicsOptions;
  stuck?: ReadonlyMap<number, StuckState>;
  /** The matrix reads back its contacts: its queries report what the relays did (a stuck relay shows). */
  senseContacts?: boolean;
  /** Relays closed before any client speaks (left so by an earlier session). */
  closedAtStart?: readonly number[];
}

/** Realistic timing, in ms: a reed relay's operate and bounce time, and an analyzer's reading time. */
export const REALISTIC = { relayOperateMs: 5, measurementBaseMs: 20, perAverageMs: 5 } as const;

export class SimulatedBench {
  readonly boardAsBuilt: Board;
  readonly faults: PartFault[];
  readonly fixture: FixtureMap;
  readonly switchMatrix: SimulatedSwitchMatrix;
  readonly analyzer: SimulatedAnalyzer;
  readonly physics: BenchPhysics;

  constructor(setup: BenchSetup) {
    const realistic = (setup.timing ?? 'realistic') === 'realistic';
    this.faults = parseFaults(setup.faults ?? [], setup.board);
    this.boardAsBuilt = buildBoardAsBuilt(setup.board, this.faults);
    this.fixture = setup.fixture ?? defaultFixtureMap(setup.board);
    const fixture = this.fixture;
    this.switchMatrix = new SimulatedSwitchMatrix({
      routes: (channel) => fixture.terminal(channel),
      operateTimeMs: realistic ? REALISTIC.relayOperateMs : 0,
      stuck: setup.stuck,
      senseContacts: setup.senseContacts,
      closedAtStart: setup.closedAtStart,
    });
    const seed = setup.seed ?? 1;
    const physicsOptions: BenchPhysicsOptions = {
      ...setup.physics,
      noise: { ...setup.physics?.noise, seed: setup.physics?.noise?.seed ?? seed },
    };
    this.physics = new BenchPhysics(this.boardAsBuilt, fixture, () => this.switchMatrix.closedChannels(), physicsOptions);
    this.analyzer = new SimulatedAnalyzer({
      source: this.physics,
      timeScale: realistic ? 1 : 0,
      baseTimeMs: REALISTIC.measurementBaseMs,
      perAverageMs: REALISTIC.perAverageMs,
    });
  }
}
