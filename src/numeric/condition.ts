// Reliability figures for a solve near resonance, where J is nearly singular by design: a cheap estimate
// of the reciprocal condition number and the normwise relative residual of a computed solution.
import type { ComplexCsc, ComplexVector } from './types.js';
import type { LuFactors } from './lu-numeric.js';
import { complexMatVec, complexNorm1, complexNormInf } from './csc.js';
import { solveLu, solveLuTransposed } from './lu-solve.js';

/**
 * 1 / (‖A‖₁ ‖A⁻¹‖₁) with ‖A⁻¹‖₁ estimated by Hager's method in Higham's complex form (a few solves with
 * A and Aᴴ instead of forming A⁻¹). The estimate of ‖A⁻¹‖₁ never exceeds the true value, so the result
 * errs towards optimism by a small factor at most in practice; near 0 means the solve is not to be trusted.
 */
export function estimateReciprocalCondition(f: LuFactors, A: ComplexCsc): number {
  const n = f.n;
  if (n === 0) return Infinity;
  const anorm = complexNorm1(A);
  if (anorm === 0) return 0;
  const inverseNorm = estimateInverseNorm1(f);
  if (!Number.isFinite(inverseNorm)) return 0;
  if (inverseNorm === 0) return Infinity;
  return 1 / (anorm * inverseNorm);
}

/** Lower-bound estimate of ‖A⁻¹‖₁ from the factors (Hager 1984; Higham 1988, complex case). */
export function estimateInverseNorm1(f: LuFactors, maxIterations = 5): number {
  const n = f.n;
  const applyInverse = (v: ComplexVector) => solveLu(f, v);
  // A⁻ᴴ v = conj(A⁻ᵀ conj(v)).
  const applyInverseAdjoint = (v: ComplexVector) => conjugate(solveLuTransposed(f, conjugate(v)));

  let x: ComplexVector = { re: new Float64Array(n).fill(1 / n), im: new Float64Array(n) };
  let y = applyInverse(x);
  let estimate = norm1(y);
  if (n > 1) {
    let j = argMaxModulus(applyInverseAdjoint(unitPhases(y)));
    for (let iteration = 2; iteration <= maxIterations; iteration++) {
      x = unitVector(n, j);
      y = applyInverse(x);
      const previous = estimate;
      estimate = norm1(y);
      if (estimate <= previous) {
        estimate = previous;
        break; // no longer increasing: converged
      }
      const z = applyInverseAdjoint(unitPhases(y));
      const last = j;
      j = argMaxModulus(z);
      if (modulus(z, j) === modulus(z, last)) break; // same column again: converged
    }
  }
  // Safeguard against matrices that fool the gradient steps: an alternating, growing test vector.
  const alt: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
  for (let i = 0; i < n; i++) alt.re[i] = (i % 2 === 0 ? 1 : -1) * (1 + (n > 1 ? i / (n - 1) : 0));
  const altEstimate = (2 * norm1(applyInverse(alt))) / (3 * n);
  return Math.max(estimate, altEstimate);
}

/** ‖A x − b‖∞ / (‖A‖∞ ‖x‖∞ + ‖b‖∞): a backward-error measure, about machine epsilon for a stable solve. */
/** `normA`: ‖A‖∞ when the caller already has it (many solves with one matrix). */
export function relativeResidual(A: ComplexCsc, x: ComplexVector, b: ComplexVector, normA?: number): number {
  const ax = complexMatVec(A, x);
  let r = 0;
  for (let i = 0; i < A.n; i++) {
    const dr = ax.re[i] - b.re[i];
    const di = ax.im[i] - b.im[i];
    r = Math.max(r, Math.sqrt(dr * dr + di * di));
  }
  const scale = (normA ?? complexNormInf(A)) * normInf(x) + normInf(b);
  if (scale === 0) return r === 0 ? 0 : Infinity;
  return r / scale;
}

function norm1(v: ComplexVector): number {
  let s = 0;
  for (let i = 0; i < v.re.length; i++) s += Math.sqrt(v.re[i] * v.re[i] + v.im[i] * v.im[i]);
  return s;
}

function normInf(v: ComplexVector): number {
  let s = 0;
  for (let i = 0; i < v.re.length; i++) s = Math.max(s, Math.sqrt(v.re[i] * v.re[i] + v.im[i] * v.im[i]));
  return s;
}

function modulus(v: ComplexVector, i: number): number {
  return Math.sqrt(v.re[i] * v.re[i] + v.im[i] * v.im[i]);
}

function argMaxModulus(v: ComplexVector): number {
  let best = 0;
  let bestValue = -1;
  for (let i = 0; i < v.re.length; i++) {
    const m = v.re[i] * v.re[i] + v.im[i] * v.im[i];
    if (m > bestValue) {
      bestValue = m;
      best = i;
    }
  }
  return best;
}

/** v_i / |v_i| (1 where v_i = 0): the subgradient of ‖·‖₁ at v. */
function unitPhases(v: ComplexVector): ComplexVector {
  const n = v.re.length;
  const out: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const m = Math.sqrt(v.re[i] * v.re[i] + v.im[i] * v.im[i]);
    if (m === 0) out.re[i] = 1;
    else {
      out.re[i] = v.re[i] / m;
      out.im[i] = v.im[i] / m;
    }
  }
  return out;
}

function conjugate(v: ComplexVector): ComplexVector {
  const im = new Float64Array(v.im.length);
  for (let i = 0; i < im.length; i++) im[i] = -v.im[i];
  return { re: v.re, im };
}

function unitVector(n: number, j: number): ComplexVector {
  const v: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
  v.re[j] = 1;
  return v;
}
