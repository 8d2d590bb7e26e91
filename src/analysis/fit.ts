// fitBoard: the real values of a board's parts from a set of readings. Chosen parameters (fit-spec.ts)
// are fitted by Levenberg–Marquardt (fit-levenberg-marquardt.ts) to the readings' log|Z| and phase
// (fit-model.ts), with the Jacobian from adjoint sensitivities (sensitivity.ts); uncertainties come from
// the Jacobian at the solution (fit-covariance.ts), and an all-parts fit also reports the measured spread
// of the parts against their tolerance (fit-spread.ts). Nothing here reads files or drives instruments.
//
// Noise: given as `noise` (relative to |Z|, plus an optional floor in ohms), or else estimated. An
// estimated noise starts at DEFAULT_RELATIVE_NOISE and is set afterwards from the residual variance;
// when a prior takes part (all-parts fit) the balance between readings and prior depends on it, so the
// fit is repeated with the new estimate until the two agree within 5 %.
import type { Board } from '../board/types.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { covarianceFromJacobian } from './fit-covariance.js';
import { FitError } from './fit-errors.js';
import { levenbergMarquardt, type LmOptions, type LmResult, type LmStop } from './fit-levenberg-marquardt.js';
import { FitModel, type NoiseModel } from './fit-model.js';
import { FitParameters, type ParameterKind } from './fit-parameters.js';
import { prepareReadings, type SkippedReading } from './fit-readings.js';
import { checkFitSpec, type FitSpec } from './fit-spec.js';
import { measuredSpread, type KindSpread } from './fit-spread.js';
import type { Reading } from './readings.js';
import type { CommonLeads } from './diagnose-leads.js';
import type { UnitName } from '../units/quantity.js';

export { FitError } from './fit-errors.js';
export type { FitSpec, InductorResistanceSpec } from './fit-spec.js';
export type { KindSpread } from './fit-spread.js';
export type { LmStop } from './fit-levenberg-marquardt.js';
export type { ParameterKind } from './fit-parameters.js';
export type { SkippedReading } from './fit-readings.js';

export const DEFAULT_RELATIVE_NOISE = 1e-3;
const NOISE_PASSES = 5;

export interface FitOptions extends LmOptions {
  /** The readings' noise; estimated from the residuals when left out. */
  noise?: { relative: number; floor?: number };
  /** Multiplies each part's tolerance to give its prior's standard deviation (all-parts fit). Default 1. */
  priorWidth?: number;
  /** Tolerance assumed for the prior of a part that states none. Default 0.2. */
  defaultTolerance?: number;
  /** The fixture common to all readings (a diagnosis fits it), seen around every model reading; default none. */
  leads?: CommonLeads;
}

export interface FitParameterResult {
  kind: ParameterKind;
  label: string;
  ref?: string;
  unit?: UnitName;
  nominal: number;
  value: number;
  /** Standard uncertainty of the value (linearized: value · σ of its log); Infinity if the readings do not fix it. */
  sigma: number;
  relativeSigma: number;
  identifiable: boolean;
}

export interface WorstReading {
  index: number;
  step: number;
  point: number;
  frequency_hz: number;
  /** log|Z_model| - log|Z_measured|. */
  logMagnitude: number;
  /** arg Z_model - arg Z_measured, radians. */
  phaseRad: number;
  /** Both residuals together in units of the noise: √(r₁² + r₂²)/σ. */
  normalized: number;
}

export interface FitResult {
  converged: boolean;
  stop: LmStop;
  /** One line saying how the fit ended, and for a fit that did not converge what the values are worth. */
  message: string;
  iterations: number;
  evaluations: number;
  parameters: FitParameterResult[];
  /** Correlation of the parameters' log values (P×P; NaN where a parameter is not identifiable). */
  correlation: number[][];
  readings: { used: number; skipped: SkippedReading[] };
  noise: { relative: number; floor: number; source: 'given' | 'estimated' };
  /** s² = |r|²/(rows - parameters) of the weighted residuals; near 1 when the noise is right. */
  residualVariance: number;
  degreesOfFreedom: number;
  residuals: { logMagnitudeRms: number; phaseRmsRad: number; worst?: WorstReading };
  /** The board with the fitted values (the lattice summary kept only when no part was fitted on its own). */
  board: Board;
  /** Measured spread per kind, when parts were fitted on their own. */
  spread?: KindSpread[];
}

export function fitBoard(board: Board, readings: readonly Reading[], spec: FitSpec, options: FitOptions = {}): FitResult {
  checkOptions(options);
  const checked = checkFitSpec(board, spec);
  const laplacian = new GroundedLaplacian(board);
  const prepared = prepareReadings(readings, laplacian.index, board);
  if (prepared.used.length === 0) {
    const why = prepared.skipped.length > 0 ? ` (${prepared.skipped.length} left out, e.g. reading ${prepared.skipped[0].index + 1}: ${prepared.skipped[0].why})` : '';
    throw new FitError(`readings: none can be used for the fit${why}`);
  }
  const frequencies = prepared.groups.map((g) => g.frequencyHz);
  const parameters = new FitParameters(board, checked, {
    referenceHz: frequencies[Math.floor(frequencies.length / 2)],
    priorWidth: options.priorWidth,
    defaultTolerance: options.defaultTolerance,
  });
  const P = parameters.count;
  const given = options.noise;
  let noise: NoiseModel = given ? { relative: given.relative, floor: given.floor ?? 0 } : { relative: DEFAULT_RELATIVE_NOISE, floor: 0 };
  const model = new FitModel(laplacian, prepared, parameters, noise, options.leads);
  const rows = model.residualCount;
  if (rows <= P) {
    throw new FitError(
      `readings: ${prepared.used.length} usable readings give ${model.readingRows} residuals, not more than the ${P} parameters to fit; add readings or fit fewer parameters`,
    );
  }

  let lm = run(model, parameters.start, options);
  let iterations = lm.iterations;
  let evaluations = lm.evaluations;
  const withPrior = rows > model.readingRows;
  if (!given) {
    let changed = false;
    for (let pass = 1; pass <= NOISE_PASSES; pass++) {
      const s = Math.sqrt((2 * lm.cost) / (rows - P));
      if (!(s > 0) || !Number.isFinite(s)) break;
      noise = { relative: noise.relative * s, floor: 0 };
      model.setNoise(noise);
      changed = true;
      // Without a prior the noise only scales the cost, so one pass gives the answer.
      if (!withPrior || Math.abs(s - 1) < 0.05 || !lm.converged || pass === NOISE_PASSES) break;
      lm = run(model, lm.theta, options);
      iterations += lm.iterations;
      evaluations += lm.evaluations;
    }
    if (changed) {
      const again = model.residualsAndJacobian(lm.theta);
      lm = { ...lm, residuals: again.residuals, jacobian: again.jacobian, cost: halfSquare(again.residuals) };
      evaluations++;
    }
  }

  const dof = rows - P;
  const residualVariance = (2 * lm.cost) / dof;
  const covariance = covarianceFromJacobian(lm.jacobian, rows, P, residualVariance);
  const results = parameters.definitions.map((d, m): FitParameterResult => {
    const value = Math.exp(lm.theta[m]);
    const relativeSigma = covariance.sigma[m];
    const out: FitParameterResult = {
      kind: d.kind,
      label: d.label,
      nominal: d.nominal,
      value,
      sigma: value * relativeSigma,
      relativeSigma,
      identifiable: covariance.identifiable[m],
    };
    if (d.ref !== undefined) out.ref = d.ref;
    if (d.unit !== undefined) out.unit = d.unit;
    return out;
  });
  const correlation = Array.from({ length: P }, (_, i) =>
    Array.from({ length: P }, (_, j) => covariance.matrix[i * P + j] / (covariance.sigma[i] * covariance.sigma[j])),
  );

  const result: FitResult = {
    converged: lm.converged,
    stop: lm.stop,
    message: endMessage(lm, iterations),
    iterations,
    evaluations,
    parameters: results,
    correlation,
    readings: { used: prepared.used.length, skipped: prepared.skipped },
    noise: { ...noise, source: given ? 'given' : 'estimated' },
    residualVariance,
    degreesOfFreedom: dof,
    residuals: residualSummary(model, prepared, lm.residuals),
    board: fittedBoard(board, parameters, lm.theta),
  };
  if (parameters.hasOwnParts) {
    const byRef = new Map(board.parts.map((p) => [p.ref, p]));
    result.spread = measuredSpread(
      results.flatMap((r) => {
        const part = r.ref === undefined ? undefined : byRef.get(r.ref);
        if (!part) return [];
        const value = { kind: part.kind, nominal: part.value, fitted: r.value, relativeSigma: r.relativeSigma };
        return [part.tolerance === undefined ? value : { ...value, tolerance: part.tolerance }];
      }),
    );
  }
  return result;
}

function run(model: FitModel, start: Float64Array, options: LmOptions): LmResult {
  try {
    return levenbergMarquardt(model, start, options);
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    const why = model.lastFailure ?? 'a reading has a model value of zero';
    throw new FitError(`fit: the board cannot be evaluated at the starting values: ${why}`);
  }
}

function checkOptions(options: FitOptions): void {
  const bad = (field: string, value: unknown, want: string) => {
    throw new FitError(`fit options: ${field} must be ${want}, got ${String(value)}`);
  };
  const { noise } = options;
  if (noise) {
    if (!(noise.relative >= 0) || !Number.isFinite(noise.relative)) bad('noise.relative', noise.relative, 'a fraction of zero or more');
    if (noise.floor !== undefined && (!(noise.floor >= 0) || !Number.isFinite(noise.floor))) bad('noise.floor', noise.floor, 'zero or more ohms');
    if (noise.relative === 0 && !noise.floor) bad('noise', 'zero', 'above zero in relative or floor');
  }
  if (options.maxIterations !== undefined && !(Number.isInteger(options.maxIterations) && options.maxIterations >= 1)) {
    bad('maxIterations', options.maxIterations, 'a whole number of at least 1');
  }
  for (const key of ['initialDamping', 'stepTolerance', 'reductionTolerance', 'gradientTolerance', 'maxStep'] as const) {
    const value = options[key];
    if (value !== undefined && !(value > 0 && Number.isFinite(value))) bad(key, value, 'above zero and finite');
  }
  if (options.priorWidth !== undefined && !(options.priorWidth > 0 && Number.isFinite(options.priorWidth))) bad('priorWidth', options.priorWidth, 'above zero');
  if (options.defaultTolerance !== undefined && !(options.defaultTolerance > 0 && options.defaultTolerance < 1)) {
    bad('defaultTolerance', options.defaultTolerance, 'a fraction between 0 and 1');
  }
}

function endMessage(lm: LmResult, iterations: number): string {
  const steps = `${iterations} step${iterations === 1 ? '' : 's'}`;
  switch (lm.stop) {
    case 'small-step':
      return `converged after ${steps}: the last step changed no value by more than the step tolerance`;
    case 'small-reduction':
      return `converged after ${steps}: no step lowers the misfit by more than the reduction tolerance`;
    case 'small-gradient':
      return `converged after ${steps}: the misfit no longer changes with any parameter`;
    case 'iteration-limit':
      return `did not converge: stopped at the limit of ${steps}; the values are those of the last step, not a fit result`;
    case 'no-downhill-step':
      return `did not converge after ${steps}: no step lowers the misfit though the linearized model says one should; the values are not a fit result`;
  }
}

function residualSummary(model: FitModel, prepared: ReturnType<typeof prepareReadings>, residuals: Float64Array): FitResult['residuals'] {
  const sigma = model.readingSigma;
  let mag = 0;
  let phase = 0;
  let worst: WorstReading | undefined;
  prepared.used.forEach((r, i) => {
    const a = residuals[2 * i];
    const b = residuals[2 * i + 1];
    mag += (a * sigma[i]) ** 2;
    phase += (b * sigma[i]) ** 2;
    const normalized = Math.hypot(a, b);
    if (!worst || normalized > worst.normalized) {
      const { step, point, frequency_hz } = r.reading;
      worst = { index: r.index, step, point, frequency_hz, logMagnitude: a * sigma[i], phaseRad: b * sigma[i], normalized };
    }
  });
  const n = prepared.used.length;
  const summary: FitResult['residuals'] = { logMagnitudeRms: Math.sqrt(mag / n), phaseRmsRad: Math.sqrt(phase / n) };
  if (worst) summary.worst = worst;
  return summary;
}

function fittedBoard(board: Board, parameters: FitParameters, theta: Float64Array): Board {
  const fitted: Board = { ...board, name: `${board.name} (fitted)`, parts: parameters.fittedParts(theta) };
  delete fitted.lattice;
  // Global parameters change every cell alike, so the unit cell (for Bloch bands) still describes the board.
  if (board.lattice && !parameters.hasOwnParts) {
    fitted.lattice = { ...board.lattice, cellParts: board.lattice.cellParts.map((p) => parameters.fittedCellPart(p, theta)) };
  }
  return fitted;
}

function halfSquare(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return s / 2;
}
