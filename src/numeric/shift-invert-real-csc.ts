// Real symmetric matrices stored as value arrays over one shared CSC pattern (the lossless board's K and C,
// and K − σC): the few products and norms the shift-invert iteration needs.
import type { ComplexCsc, CscPattern } from './types.js';

/** out = A x for A given by its values on pattern p. */
export function realMatVec(p: CscPattern, values: Float64Array, x: Float64Array, out: Float64Array): Float64Array {
  out.fill(0);
  const { n, colPtr, rowIdx } = p;
  for (let j = 0; j < n; j++) {
    const xj = x[j];
    if (xj === 0) continue;
    for (let q = colPtr[j]; q < colPtr[j + 1]; q++) out[rowIdx[q]] += values[q] * xj;
  }
  return out;
}

/** ‖A‖₁, the largest absolute column sum; for a symmetric A it bounds ‖A‖₂ from above. */
export function realNorm1(p: CscPattern, values: Float64Array): number {
  let best = 0;
  for (let j = 0; j < p.n; j++) {
    let sum = 0;
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) sum += Math.abs(values[q]);
    if (sum > best) best = sum;
  }
  return best;
}

/** The diagonal of A (zero where the pattern has no diagonal entry). */
export function realDiagonal(p: CscPattern, values: Float64Array): Float64Array {
  const d = new Float64Array(p.n);
  for (let j = 0; j < p.n; j++) {
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) if (p.rowIdx[q] === j) d[j] += values[q];
  }
  return d;
}

/** Values of K − σC on the shared pattern, as a complex matrix with zero imaginary part (what factorLu takes). */
export function shiftedMatrix(p: CscPattern, K: Float64Array, C: Float64Array, sigma: number): ComplexCsc {
  const re = new Float64Array(K.length);
  for (let q = 0; q < re.length; q++) re[q] = K[q] - sigma * C[q];
  return { ...p, re, im: new Float64Array(K.length) };
}

export function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

export function norm2(a: Float64Array): number {
  return Math.sqrt(dot(a, a));
}
