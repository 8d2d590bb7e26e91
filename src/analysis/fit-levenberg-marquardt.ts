// Levenberg–Marquardt least squares (K. Levenberg, Q. Appl. Math. 2, 164 (1944); D. Marquardt, J. SIAM 11,
// 431 (1963)), in its standard form without geodesic acceleration: each step solves
//   (JᵀJ + λ·diag(JᵀJ)) δ = -Jᵀr
// (Marquardt's scaling, so the damping does not depend on the parameters' units) and is taken if the
// cost ½|r|² falls. λ follows the gain ratio ρ = actual / predicted decrease (H. B. Nielsen, IMM report
// 1999-05; K. Madsen, H. B. Nielsen, O. Tingleff, "Methods for non-linear least squares problems", 2004;
// from memory): after a step λ *= max(1/3, 1 - (2ρ - 1)³), after a refused one λ *= ν with ν doubling.
// Marquardt's plain ×10 / ÷10 bounces between two λ in the long curved valleys of an all-parts fit and
// then creeps. Steps are capped at `maxStep` in every parameter: the parameters are logarithms, and one
// step should not change a value by more than a factor e.
//
// It stops, converged, when an accepted step is below `stepTolerance` in every parameter, when a step
// (or the undamped Gauss–Newton step's prediction) lowers the cost by less than `reductionTolerance` of
// it, or when the gradient is orthogonal to the residuals to within `gradientTolerance` (the cosine
// test, common practice); and it stops, not converged, at `maxIterations` accepted steps, or when λ
// grows past MAX_DAMPING without finding a downhill step.
import { choleskyLower, transposeMultiply } from '../numeric/dense-matrix.js';

export interface LeastSquaresProblem {
  readonly parameterCount: number;
  residuals(theta: Float64Array): Float64Array;
  residualsAndJacobian(theta: Float64Array): { residuals: Float64Array; jacobian: Float64Array };
}

export interface LmOptions {
  maxIterations?: number;
  initialDamping?: number;
  stepTolerance?: number;
  reductionTolerance?: number;
  gradientTolerance?: number;
  maxStep?: number;
}

export const LM_DEFAULTS: Required<LmOptions> = {
  maxIterations: 200,
  initialDamping: 1e-3,
  stepTolerance: 1e-10,
  reductionTolerance: 1e-12,
  gradientTolerance: 1e-10,
  maxStep: 1,
};

export const MAX_DAMPING = 1e16;
const MIN_DAMPING = 1e-15;

export type LmStop = 'small-step' | 'small-reduction' | 'small-gradient' | 'iteration-limit' | 'no-downhill-step';

export interface LmResult {
  theta: Float64Array;
  residuals: Float64Array;
  /** Jacobian at theta (row-major, residuals × parameters). */
  jacobian: Float64Array;
  cost: number;
  converged: boolean;
  stop: LmStop;
  /** Accepted steps. */
  iterations: number;
  /** Evaluations of the residuals (with or without Jacobian). */
  evaluations: number;
  damping: number;
}

export function levenbergMarquardt(problem: LeastSquaresProblem, start: Float64Array, options: LmOptions = {}): LmResult {
  // Options left undefined keep their defaults (a spread would let an explicit undefined through).
  const o = { ...LM_DEFAULTS };
  for (const key of Object.keys(LM_DEFAULTS) as (keyof LmOptions)[]) if (options[key] !== undefined) o[key] = options[key]!;
  const P = problem.parameterCount;
  let theta = Float64Array.from(start);
  let { residuals, jacobian } = problem.residualsAndJacobian(theta);
  let cost = halfSquare(residuals);
  if (!Number.isFinite(cost)) throw new RangeError('the residuals are not finite at the starting values');
  let evaluations = 1;
  let damping = o.initialDamping;
  let growth = 2;
  let iterations = 0;
  const done = (stop: LmStop, converged: boolean): LmResult => ({
    theta, residuals, jacobian, cost, converged, stop, iterations, evaluations, damping,
  });

  for (;;) {
    const N = residuals.length;
    const normal = normalMatrix(jacobian, N, P);
    const gradient = transposeMultiply(N, P, 1, jacobian, residuals);
    if (cost === 0 || gradientCosine(normal, gradient, cost, P) <= o.gradientTolerance) return done('small-gradient', true);
    if (iterations >= o.maxIterations) return done('iteration-limit', false);
    const scale = marquardtScale(normal, P);
    // What the undamped (Gauss–Newton) step promises; nothing left to gain means a minimum to rounding.
    const gaussNewton = dampedStep(normal, gradient, scale, 1e-12, P, Infinity);
    if (gaussNewton && predictedReduction(normal, gradient, gaussNewton, P) <= o.reductionTolerance * cost) {
      return done('small-reduction', true);
    }

    for (;;) {
      const step = dampedStep(normal, gradient, scale, damping, P, o.maxStep);
      if (step) {
        const trial = theta.map((t, m) => t + step[m]);
        const evaluated = problem.residualsAndJacobian(trial);
        evaluations++;
        const trialCost = halfSquare(evaluated.residuals);
        const gain = (cost - trialCost) / predictedReduction(normal, gradient, step, P);
        if (trialCost < cost && gain > 0) {
          const reduction = cost - trialCost;
          const largest = step.reduce((s, d) => Math.max(s, Math.abs(d)), 0);
          theta = trial;
          ({ residuals, jacobian } = evaluated);
          cost = trialCost;
          iterations++;
          // Nielsen's update: a step the linear model predicted well (gain near 1) lowers λ by up to 3,
          // a poorly predicted one keeps λ about where it is.
          damping = Math.max(damping * Math.max(1 / 3, 1 - (2 * gain - 1) ** 3), MIN_DAMPING);
          growth = 2;
          if (largest <= o.stepTolerance) return done('small-step', true);
          if (reduction <= o.reductionTolerance * trialCost) return done('small-reduction', true);
          break;
        }
      }
      damping *= growth;
      growth *= 2;
      if (damping > MAX_DAMPING) return done('no-downhill-step', false);
    }
  }
}

/**
 * JᵀJ, computing the upper triangle only and mirroring it: the product is symmetric, and for an
 * all-parts fit (hundreds of parameters, thousands of rows) it is the largest cost of a step.
 */
export function normalMatrix(jacobian: Float64Array, rows: number, P: number): Float64Array {
  const c = new Float64Array(P * P);
  // Four rows at a time: each pass over a row of c then does four multiply-adds per load and store.
  let r = 0;
  for (; r + 4 <= rows; r += 4) {
    const b0 = r * P;
    const b1 = b0 + P;
    const b2 = b1 + P;
    const b3 = b2 + P;
    for (let i = 0; i < P; i++) {
      const a0 = jacobian[b0 + i];
      const a1 = jacobian[b1 + i];
      const a2 = jacobian[b2 + i];
      const a3 = jacobian[b3 + i];
      if (a0 === 0 && a1 === 0 && a2 === 0 && a3 === 0) continue;
      const ci = i * P;
      for (let j = i; j < P; j++) {
        c[ci + j] += a0 * jacobian[b0 + j] + a1 * jacobian[b1 + j] + a2 * jacobian[b2 + j] + a3 * jacobian[b3 + j];
      }
    }
  }
  for (; r < rows; r++) {
    const base = r * P;
    for (let i = 0; i < P; i++) {
      const a = jacobian[base + i];
      if (a === 0) continue;
      const ci = i * P;
      for (let j = i; j < P; j++) c[ci + j] += a * jacobian[base + j];
    }
  }
  for (let i = 0; i < P; i++) for (let j = 0; j < i; j++) c[i * P + j] = c[j * P + i];
  return c;
}

function halfSquare(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return Number.isNaN(s) ? Infinity : s / 2;
}

/** max_m |g_m| / (√A_mm · |r|): how far the residuals are from orthogonal to each Jacobian column. */
function gradientCosine(normal: Float64Array, gradient: Float64Array, cost: number, P: number): number {
  const norm = Math.sqrt(2 * cost);
  let worst = 0;
  for (let m = 0; m < P; m++) {
    const column = Math.sqrt(normal[m * P + m]);
    if (column > 0) worst = Math.max(worst, Math.abs(gradient[m]) / (column * norm));
  }
  return worst;
}

/** diag(JᵀJ), with columns the readings do not see raised to a small share of the largest. */
function marquardtScale(normal: Float64Array, P: number): Float64Array {
  const d = Float64Array.from({ length: P }, (_, m) => normal[m * P + m]);
  const floor = 1e-12 * Math.max(...d, 0) || 1;
  return d.map((x) => Math.max(x, floor));
}

/** δ from (A + λD) δ = -g by Cholesky, capped at maxStep; null when the damped matrix is not positive. */
function dampedStep(normal: Float64Array, gradient: Float64Array, scale: Float64Array, damping: number, P: number, maxStep: number): Float64Array | null {
  const a = Float64Array.from(normal);
  for (let m = 0; m < P; m++) a[m * P + m] += damping * scale[m];
  const l = choleskyLower(P, a, 0);
  if (!l) return null;
  const y = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    let s = -gradient[i];
    for (let p = 0; p < i; p++) s -= l[i * P + p] * y[p];
    y[i] = s / l[i * P + i];
  }
  const x = new Float64Array(P);
  for (let i = P - 1; i >= 0; i--) {
    let s = y[i];
    for (let p = i + 1; p < P; p++) s -= l[p * P + i] * x[p];
    x[i] = s / l[i * P + i];
  }
  const largest = x.reduce((s, d) => Math.max(s, Math.abs(d)), 0);
  if (!Number.isFinite(largest)) return null;
  return largest > maxStep ? x.map((d) => (d * maxStep) / largest) : x;
}

/** The cost decrease the linearized model promises for δ: -(gᵀδ + ½ δᵀAδ). */
function predictedReduction(normal: Float64Array, gradient: Float64Array, step: Float64Array, P: number): number {
  let linear = 0;
  let quadratic = 0;
  for (let i = 0; i < P; i++) {
    linear += gradient[i] * step[i];
    let row = 0;
    for (let j = 0; j < P; j++) row += normal[i * P + j] * step[j];
    quadratic += step[i] * row;
  }
  return -(linear + quadratic / 2);
}
