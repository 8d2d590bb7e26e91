// The fit's parameter vector θ and how each part's value and series resistance follow from it, with the
// derivatives the Jacobian needs. Every parameter is a positive quantity, so θ holds its natural logarithm:
// steps are relative, a value can never cross zero, and a 1 % change means the same for a 10 nF capacitor
// as for a 22 µH inductor (common practice for positive quantities in least squares).
//
// An all-parts fit has as many parameters as parts, and a scan rarely pins down every one of them (two
// capacitors in series to a node that is never read, say). Each part's log value is therefore held toward
// its nominal value by a Gaussian prior whose standard deviation is the part's stated tolerance (times
// `priorWidth`, default 1; DEFAULT_PRIOR_TOLERANCE when none is stated). Read as a bound, a tolerance is
// about three standard deviations, so this prior is weak: readings move any part they see, and only the
// parts the readings cannot tell apart stay near nominal instead of drifting off.
import type { Board, CellPart, Part, PartKind } from '../board/types.js';
import { formatQuantity, type UnitName } from '../units/quantity.js';
import type { CheckedSpec, InductorResistanceSpec } from './fit-spec.js';

export const DEFAULT_PRIOR_TOLERANCE = 0.2;
/** The Q assumed for a starting resistance when no inductor states its losses (a typical ferrite coil). */
export const DEFAULT_START_Q = 50;

export type ParameterKind = 'capacitance-scale' | 'inductance-scale' | 'inductor-resistance' | 'inductor-q' | 'part-value';

export interface ParameterDefinition {
  kind: ParameterKind;
  /** Shown in results: "capacitance scale", "inductor Q at 100 kHz", or the part's ref. */
  label: string;
  /** The part, for a part value. */
  ref?: string;
  /** SI unit of the value; undefined for a scale or a Q. */
  unit?: UnitName;
  /** What the board says: the part's value, 1 for a scale, the inductors' mean resistance or Q. */
  nominal: number;
  /** Standard deviation of the prior on log(value), for an all-parts fit. */
  priorWidth?: number;
}

/** d(quantity)/dθ_m for the parameters m a quantity depends on. */
export type Dependence = [parameter: number, derivative: number][];

export interface PartState {
  value: number;
  esr: number;
  valueDeps: Dependence;
  esrDeps: Dependence;
}

export interface ParameterOptions {
  /** A frequency typical of the readings, for a starting resistance when the board states none. */
  referenceHz: number;
  priorWidth?: number;
  defaultTolerance?: number;
}

export class FitParameters {
  readonly definitions: ParameterDefinition[] = [];
  /** θ at the start: log of each definition's nominal value. */
  readonly start: Float64Array;
  private readonly capacitanceScale: number = -1;
  private readonly inductanceScale: number = -1;
  private readonly resistance: number = -1;
  private readonly resistanceSpec?: InductorResistanceSpec;
  /** Parameter of each part fitted on its own, -1 for the others. */
  private readonly ownParameter: Int32Array;

  constructor(private readonly board: Board, spec: CheckedSpec, options: ParameterOptions) {
    const defs = this.definitions;
    if (spec.capacitanceScale) {
      this.capacitanceScale = defs.length;
      defs.push({ kind: 'capacitance-scale', label: 'capacitance scale', nominal: 1 });
    }
    if (spec.inductanceScale) {
      this.inductanceScale = defs.length;
      defs.push({ kind: 'inductance-scale', label: 'inductance scale', nominal: 1 });
    }
    if (spec.inductorResistance) {
      this.resistance = defs.length;
      this.resistanceSpec = spec.inductorResistance;
      defs.push(resistanceDefinition(board.parts, spec.inductorResistance, options.referenceHz));
    }
    this.ownParameter = new Int32Array(board.parts.length).fill(-1);
    const width = options.priorWidth ?? 1;
    for (const k of spec.ownParts) {
      const part = board.parts[k];
      this.ownParameter[k] = defs.length;
      const def: ParameterDefinition = { kind: 'part-value', label: part.ref, ref: part.ref, unit: UNIT[part.kind], nominal: part.value };
      if (spec.withPrior) def.priorWidth = width * (part.tolerance ?? options.defaultTolerance ?? DEFAULT_PRIOR_TOLERANCE);
      defs.push(def);
    }
    this.start = Float64Array.from(defs, (d) => Math.log(d.nominal));
  }

  get count(): number {
    return this.definitions.length;
  }

  /** True when a parameter belongs to one part only (the fitted board then no longer follows its cell). */
  get hasOwnParts(): boolean {
    return this.ownParameter.some((m) => m >= 0);
  }

  /** Value, series resistance and their θ-derivatives of every part, in board order. */
  partStates(theta: Float64Array): PartState[] {
    return this.board.parts.map((part, k) => this.stateOf(part.kind, part.value, part.esr ?? 0, this.ownParameter[k], theta));
  }

  /** The board's parts with the values at θ. */
  fittedParts(theta: Float64Array): Part[] {
    const states = this.partStates(theta);
    return this.board.parts.map((part, k) => withState(part, states[k], `${part.origin}, fitted`));
  }

  /** A unit-cell part under the global parameters only (scales and the inductors' resistance). */
  fittedCellPart(part: CellPart, theta: Float64Array): CellPart {
    return withState(part, this.stateOf(part.kind, part.value, part.esr ?? 0, -1, theta));
  }

  private stateOf(kind: PartKind, nominal: number, nominalEsr: number, own: number, theta: Float64Array): PartState {
    let value = nominal;
    let valueDeps: Dependence = [];
    const scale = kind === 'C' ? this.capacitanceScale : kind === 'L' ? this.inductanceScale : -1;
    if (own >= 0) {
      value = Math.exp(theta[own]);
      valueDeps = [[own, value]];
    } else if (scale >= 0) {
      value = nominal * Math.exp(theta[scale]);
      valueDeps = [[scale, value]];
    }
    if (kind !== 'L' || this.resistance < 0) return { value, esr: kind === 'R' ? 0 : nominalEsr, valueDeps, esrDeps: [] };
    const fitted = Math.exp(theta[this.resistance]);
    if (this.resistanceSpec!.form === 'ohms') return { value, esr: fitted, valueDeps, esrDeps: [[this.resistance, fitted]] };
    // Q = ωL/R at the stated frequency, so R = ωL/Q follows L as well as Q.
    const esr = (2 * Math.PI * this.resistanceSpec!.atHz * value) / fitted;
    const esrDeps: Dependence = [[this.resistance, -esr], ...valueDeps.map(([m, d]): [number, number] => [m, (d * esr) / value])];
    return { value, esr, valueDeps, esrDeps };
  }
}

const UNIT: Record<PartKind, UnitName> = { C: 'F', L: 'H', R: 'ohm' };

function withState<T extends { kind: PartKind; value: number; esr?: number; origin?: string }>(part: T, state: PartState, origin?: string): T {
  const out: T = { ...part, value: state.value };
  if (part.kind === 'R') delete out.esr;
  else if (state.esr > 0 || part.esr !== undefined) out.esr = state.esr;
  if (origin !== undefined) out.origin = origin;
  return out;
}

function resistanceDefinition(parts: readonly Part[], spec: InductorResistanceSpec, referenceHz: number): ParameterDefinition {
  const inductors = parts.filter((p) => p.kind === 'L');
  const lossy = inductors.filter((p) => (p.esr ?? 0) > 0);
  const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
  if (spec.form === 'ohms') {
    const nominal =
      lossy.length > 0
        ? mean(lossy.map((p) => p.esr!))
        : (2 * Math.PI * referenceHz * mean(inductors.map((p) => p.value))) / DEFAULT_START_Q;
    return { kind: 'inductor-resistance', label: 'inductor series resistance', unit: 'ohm', nominal };
  }
  const omega = 2 * Math.PI * spec.atHz;
  const nominal = lossy.length > 0 ? mean(lossy.map((p) => (omega * p.value) / p.esr!)) : DEFAULT_START_Q;
  return { kind: 'inductor-q', label: `inductor Q at ${formatQuantity(spec.atHz, 'Hz')}`, nominal };
}
