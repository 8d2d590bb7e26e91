// Solves with the sparse LU of a REAL matrix. factorLu works in complex arithmetic; fed a matrix whose
// imaginary parts are all zero, every imaginary part it produces is exactly zero too, so the real parts
// alone are the real factors and a real triangular solve does the same job at a quarter of the flops.
import type { LuFactors } from './lu-numeric.js';

/** True when every imaginary part of the factors is zero, i.e. they came from a real matrix. */
export function isRealFactorization(f: LuFactors): boolean {
  const allZero = (a: Float64Array) => a.every((v) => v === 0);
  return allZero(f.lIm) && allZero(f.uIm) && allZero(f.pivotIm);
}

/** out = A⁻¹ b for A(rowOrder, colOrder) = L U; `work` is scratch of length n. out may alias b. */
export function solveRealLu(f: LuFactors, b: Float64Array, out: Float64Array, work: Float64Array): Float64Array {
  const { n, rowOrder, colOrder, lColPtr, lRowIdx, lRe, uColPtr, uRowIdx, uRe, pivotRe } = f;
  for (let k = 0; k < n; k++) work[k] = b[rowOrder[k]];
  for (let k = 0; k < n; k++) {
    const v = work[k];
    if (v === 0) continue;
    for (let s = lColPtr[k]; s < lColPtr[k + 1]; s++) work[lRowIdx[s]] -= lRe[s] * v;
  }
  for (let k = n - 1; k >= 0; k--) {
    const v = work[k] / pivotRe[k];
    work[k] = v;
    if (v === 0) continue;
    for (let s = uColPtr[k]; s < uColPtr[k + 1]; s++) work[uRowIdx[s]] -= uRe[s] * v;
  }
  for (let k = 0; k < n; k++) out[colOrder[k]] = work[k];
  return out;
}
