// What the simulated impedance analyzer reads: the board as built, on the fixture, through the relays
// that are closed right now, solved with the project's engine. It knows the board, the fixture map
// and the relay state only; it never sees a plan or a prediction.
//
// Model (per reading):
// - The buses HI, LO and SENSE are extra circuit nodes; each closed relay joins its bus to its board
//   node (or ground) through the contact resistance and hangs its stray capacitance on the node.
// - IMPedance: the two-point impedance between the HI and LO buses, plus the HI and LO lead impedances
//   (R + jωL each), which are in series with the measuring current and so simply add.
// - TRANsfer: V(SENSE) - V(LO bus) per ampere driven from HI to LO. The SENSE input is an ideal
//   voltmeter whose low side has its own wire to the LO bus, so neither draws current and the sense
//   contacts and leads drop no voltage; the LO contact does carry the current and shows in the reading.
// - HI or LO reaching nothing (or SENSE, for TRANsfer) reads as an overload, as does a drive impedance
//   (or a transfer) outside the analyzer's range, or a circuit that cannot be solved there.
// - Gaussian noise on re and im with standard deviation (relative·|Z| + floor)/sqrt(averages).
// - The source level does not change a linear board's reading; it stays in the request so that limit
//   checks (overdriven parts, nonlinear cores) can be added without changing the interface.
import type { Board } from '../src/board/types.js';
import type { Complex } from '../src/circuit/admittance.js';
import { ImpedanceSolver, SingularBoardError, type SolvedFrequency } from '../src/circuit/impedance.js';
import { GroundedLaplacian } from '../src/circuit/laplacian.js';
import type { FixtureMap } from '../src/instruments/fixture-map.js';
import { BUS_NODE, buildMeasurementCircuit, wiredClosedChannels, type MeasurementCircuit } from './bench-physics-circuit.js';
import { GaussianNoise } from './bench-physics-noise.js';
import { resolveBenchOptions, type BenchPhysicsOptions, type ResolvedBenchOptions } from './bench-physics-options.js';
import type { MeasurementRequest, MeasurementSource } from './bench-physics-source.js';

export { BUS_NODE } from './bench-physics-circuit.js';
export { BenchOptionError, DEFAULT_BENCH, NO_PARASITICS, type BenchPhysicsOptions } from './bench-physics-options.js';

/** One relay state: its circuit and, when the analyzer can drive it, its engine (symbolic LU shared). */
interface RelayState {
  circuit: MeasurementCircuit;
  solver?: ImpedanceSolver;
  lastSolved?: SolvedFrequency;
}

export class BenchPhysics implements MeasurementSource {
  readonly options: ResolvedBenchOptions;
  private readonly states = new Map<string, RelayState>();
  private readonly noise: GaussianNoise;

  constructor(
    readonly board: Board,
    readonly map: FixtureMap,
    private readonly closedChannels: () => ReadonlySet<number>,
    options: BenchPhysicsOptions = {},
  ) {
    this.options = resolveBenchOptions(options);
    this.noise = new GaussianNoise(this.options.noise.seed);
    const names = new Set(board.nodes.map((n) => n.name));
    for (const node of map.nodeNames) {
      if (!names.has(node)) throw new RangeError(`${map.source}: node ${node} is not on board ${board.name}`);
    }
  }

  measure(request: MeasurementRequest): Complex | 'overload' {
    const { frequencyHz, averages } = request;
    if (!(frequencyHz > 0) || !Number.isFinite(frequencyHz)) throw new RangeError(`frequency must be positive and finite, got ${frequencyHz}`);
    if (!Number.isInteger(averages) || averages < 1) throw new RangeError(`averages must be a whole number of at least 1, got ${averages}`);
    const state = this.stateFor(wiredClosedChannels(this.map, this.closedChannels()));
    const { reaches } = state.circuit;
    if (!reaches.hi || !reaches.lo || (request.function === 'transfer' && !reaches.sense)) return 'overload';

    const exact = this.noiseless(state, request);
    if (exact === 'overload') return exact;
    const sigma = (this.options.noise.relative * Math.hypot(exact.re, exact.im) + this.options.noise.floor) / Math.sqrt(averages);
    if (sigma === 0) return exact;
    return { re: exact.re + sigma * this.noise.next(), im: exact.im + sigma * this.noise.next() };
  }

  /** How many relay states are cached (each with its extended Laplacian and symbolic analysis). */
  get relayStatesCached(): number {
    return this.states.size;
  }

  private noiseless(state: RelayState, request: MeasurementRequest): Complex | 'overload' {
    const omega = 2 * Math.PI * request.frequencyHz;
    const { minOhms, maxOhms } = this.options.range;
    try {
      const solved = this.solve(state, request.frequencyHz);
      const hi = BUS_NODE.hi;
      const lo = BUS_NODE.lo;
      const between = solved.between(hi, lo);
      // Both leads carry the full measuring current: their impedances add to the reading.
      const drive = { re: between.re + 2 * this.options.leadResistance, im: between.im + 2 * omega * this.options.leadInductance };
      const driveMagnitude = Math.hypot(drive.re, drive.im);
      if (!Number.isFinite(driveMagnitude) || driveMagnitude < minOhms || driveMagnitude > maxOhms) return 'overload';
      if (request.function === 'impedance') return drive;
      // Superposition: 1 A in at HI and out at LO is the response to HI minus the response to LO.
      const sense = BUS_NODE.sense;
      const atSense = sub(solved.transfer(hi, sense), solved.transfer(lo, sense));
      const atLo = sub(solved.transfer(hi, lo), solved.transfer(lo, lo));
      const transfer = sub(atSense, atLo);
      const magnitude = Math.hypot(transfer.re, transfer.im);
      if (!Number.isFinite(magnitude) || magnitude > maxOhms) return 'overload';
      return transfer;
    } catch (error) {
      // Exactly on a lossless resonance J has no inverse: the analyzer would see an open circuit.
      if (error instanceof SingularBoardError) return 'overload';
      throw error;
    }
  }

  private solve(state: RelayState, frequencyHz: number): SolvedFrequency {
    if (state.lastSolved?.frequencyHz === frequencyHz) return state.lastSolved;
    state.solver ??= new ImpedanceSolver(new GroundedLaplacian(state.circuit.board));
    state.lastSolved = state.solver.at(frequencyHz);
    return state.lastSolved;
  }

  /** The cached state for these channels, most recently used last (a Map keeps insertion order). */
  private stateFor(channels: number[]): RelayState {
    const key = channels.join(',');
    let state = this.states.get(key);
    if (state) {
      this.states.delete(key);
    } else {
      state = { circuit: buildMeasurementCircuit(this.board, this.map, channels, this.options) };
      if (this.states.size >= this.options.cacheSize) this.states.delete(this.states.keys().next().value as string);
    }
    this.states.set(key, state);
    return state;
  }
}

function sub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}
