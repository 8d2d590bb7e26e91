// The scan plan: a self-contained file with every step, every frequency and every predicted value with its
// band, so the runner can execute and judge a scan without computing any physics.
import type { Board } from '../board/types.js';
import type { FixtureMapData } from '../instruments/fixture-map.js';

export const PLAN_FORMAT = 'topoprobe-plan/1';

/**
 * The acceptance band of one reading, in magnitude and phase (how tolerances move an impedance).
 *
 * Magnitude: mag_lo_ohm ≤ |Z| ≤ mag_hi_ohm (mag_lo_ohm may be 0).
 * Phase (degrees, both ends in [−180, 180]): the arc that starts at phase_lo_deg and runs
 * COUNTER-CLOCKWISE (increasing angle) to phase_hi_deg. When phase_hi_deg < phase_lo_deg the arc crosses
 * ±180°: lo 170, hi −170 is the 20° arc through 180°. lo −180 with hi 180 is the whole circle (phase
 * unconstrained). Test membership with wrap-around, never with lo ≤ φ ≤ hi:
 *   width = hi ≥ lo ? hi − lo : hi − lo + 360;   inside ⇔ ((φ − lo) mod 360, in [0, 360)) ≤ width
 * `readingInBand` / `phaseInBand` in src/plan/band-membership.ts do exactly this.
 */
export interface ReadingBand {
  mag_lo_ohm: number;
  mag_hi_ohm: number;
  phase_lo_deg: number;
  phase_hi_deg: number;
}

export interface PlanPoint {
  frequency_hz: number;
  /** Predicted reading (ohms, or volts per ampere for transfer steps). */
  pred_re: number;
  pred_im: number;
  band: ReadingBand;
}

export type StepKind = 'to-ground' | 'two-point' | 'transfer';
export type StepPurpose = 'profile' | 'sweep' | 'reference' | 'neighbour' | 'transfer';

export interface PlanStep {
  /** 1-based, unique, ascending in execution order; the log's `step` column. */
  step: number;
  kind: StepKind;
  purpose: StepPurpose;
  /** Terminals: `lo` is "gnd" for node-to-ground; `sense` only for transfer steps. */
  hi: string;
  lo: string;
  sense?: string;
  /** Matrix channels to close for this step (from the plan's fixture map), HI first. */
  channels: number[];
  level_v: number;
  /**
   * The rated part that binds this step's level, with the voltage the plan predicts across it per volt of
   * level (largest over the step's points). Absent when the board states no ratings. The runner checks
   * level_v · volts_per_volt against the part's rating without any physics of its own.
   */
  rated?: { part: string; volts_per_volt: number };
  averages: number;
  /**
   * Wait after closing the relays (operator-probed plans: after the operator confirms the probes) before
   * the first reading. Every step carries it; a step that closes the channels already closed needs none.
   */
  settle_s: number;
  points: PlanPoint[];
}

export interface PlanMode {
  frequency_hz: number;
  localization: number;
  profile: Record<string, number>;
}

export interface ScanPlan {
  format: typeof PLAN_FORMAT;
  created: string;
  software: string;
  board: {
    name: string;
    /** sha256 of the canonical board snapshot; a run refuses a board with another hash. */
    hash: string;
    snapshot: Board;
  };
  instruments: {
    /** Profile names (built in) or paths. */
    analyzer: string;
    /** null: no switch matrix, the operator moves the probes (operator-probed mode). */
    switch: string | null;
  };
  fixture: FixtureMapData;
  modes: PlanMode[];
  /** How the bands were made: Monte Carlo over tolerances (with its seed and count) or first-order sensitivity. */
  bands: {
    method: 'monte-carlo' | 'first-order';
    samples?: number;
    seed?: number;
    /** Probability that a reading of a board within tolerance falls in its band (before the floor). */
    coverage: number;
    /** The assumed distribution of part values within their tolerances. */
    distribution?: string;
    /** First-order only: how the parts' contributions were combined. */
    combine?: 'quadrature' | 'worst-case';
    /** Measurement uncertainty added around every band (so a perfect board never leaves its band). */
    floor?: BandFloor;
  };
  timing: {
    settle_after_relay_s: number;
    settle_after_frequency_s: number;
    measurement_s: number;
    per_average_s: number;
    /** Operator-probed plans: time assumed for moving the probes between steps (estimate only). */
    probe_move_s?: number;
  };
  estimate: {
    duration_s: number;
    readings: number;
    relay_operations: number;
    frequency_changes: number;
    /** Operator-probed plans: how often the probes move (relay_operations is 0 there). */
    probe_moves?: number;
  };
  /** The limits the plan was checked against and how close it comes to them (informative). */
  limits?: PlanLimits;
  steps: PlanStep[];
}

export interface BandFloor {
  /** Fraction of |Z| added on both sides of the magnitude band. */
  relative: number;
  /** Ohms added on both sides of the magnitude band (also widens the phase band by asin(abs/|Z|)). */
  absolute_ohm: number;
  /** Degrees added on both sides of the phase band. */
  phase_deg: number;
}

export interface PlanLimits {
  level_v: { min: number; max: number };
  frequency_hz: { min: number; max: number };
  /** The analyzer's excitation current limit, if its profile states one. */
  current_a?: number;
  /** Highest level / |Z| over every point of the plan, at each step's level. */
  highest_current_a: number;
  /** Highest voltage across any part over every point (nominal board), and the part. */
  highest_part_voltage_v: number;
  highest_part: string;
}
