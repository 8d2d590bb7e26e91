// Entries of A⁻¹ from the sparse LU factors of A without forming A⁻¹: the diagonal (every node's
// impedance to ground) and the entries on the factors' transposed pattern, by selected inversion
// (selected-inverse-takahashi.ts). Each value is checked against a rounding-error estimate and the few
// that fail it are recomputed by solves, so the results are as trustworthy as the solve path's.
//
// Index bookkeeping: the factors satisfy A(rowOrder[i], colOrder[j]) = (L U)(i, j), so A = Pᵀ (L U) Qᵀ and
// A⁻¹ = Q Z P with Z = (L U)⁻¹, that is (A⁻¹)(colOrder[k], rowOrder[j]) = Z(k, j).
import type { ComplexCsc, ComplexVector } from './types.js';
import type { LuFactors } from './lu-numeric.js';
import { solveLu } from './lu-solve.js';
import { complexFromTriplets } from './csc.js';
import { fittingInversePattern, type SelectedInversePattern } from './selected-inverse-pattern.js';
import { selectedInverse } from './selected-inverse-takahashi.js';
import { estimateRoundingErrors } from './selected-inverse-check.js';
import { entryWorkspace, inverseEntryBySolves } from './selected-inverse-entry.js';

export interface SelectedInverseOptions {
  /** Symbolic pattern from earlier factors; reused when it fits, rebuilt otherwise. */
  pattern?: SelectedInversePattern;
  /**
   * Largest estimated relative rounding error accepted from the recurrences; entries above it are
   * recomputed by solves. Default 1e-11, which keeps the results within 1e-9 of the solve path with a
   * wide margin for the estimate's scatter. Infinity skips the check (and its extra pass).
   */
  tolerance?: number;
}

export const DEFAULT_SELECTED_INVERSE_TOLERANCE = 1e-11;

export interface InverseDiagonal {
  /** (A⁻¹)(v, v) in original order. */
  diagonal: ComplexVector;
  /** Estimated relative error of the recurrences' value per v (0 when unchecked; Infinity if not stored). */
  estimatedError: Float64Array;
  /** Original indices whose value was recomputed by solves. */
  recomputed: Int32Array;
  pattern: SelectedInversePattern;
}

/** Diagonal of A⁻¹ in original order, from the factors of A. */
export function diagonalOfInverse(f: LuFactors, options: SelectedInverseOptions = {}): ComplexVector {
  return inverseDiagonal(f, options).diagonal;
}

/** Diagonal of A⁻¹ with the error estimates and the list of entries that needed solves. */
export function inverseDiagonal(f: LuFactors, options: SelectedInverseOptions = {}): InverseDiagonal {
  const n = f.n;
  const pattern = fittingInversePattern(options.pattern, f);
  const tolerance = options.tolerance ?? DEFAULT_SELECTED_INVERSE_TOLERANCE;
  const z = selectedInverse(f, pattern);
  const where = pattern.nodeDiagonal;
  const estimatedError = Number.isFinite(tolerance)
    ? estimateRoundingErrors(f, z, where)
    : Float64Array.from(where, (t) => (t < 0 ? Infinity : 0));

  const diagonal: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
  const recomputed: number[] = [];
  const colOrderInverse = inverseOf(f.colOrder);
  const work = entryWorkspace(n);
  for (let v = 0; v < n; v++) {
    const t = where[v];
    // Not stored (A(v, v) structurally zero) or not trusted: the solve path, restricted to what it needs.
    if (t < 0 || !(estimatedError[v] <= tolerance)) {
      const value = inverseEntryBySolves(f, pattern, colOrderInverse[v], f.rowOrderInverse[v], work);
      diagonal.re[v] = value.re;
      diagonal.im[v] = value.im;
      recomputed.push(v);
    } else {
      diagonal.re[v] = z.re[t];
      diagonal.im[v] = z.im[t];
    }
  }
  return { diagonal, estimatedError, recomputed: Int32Array.from(recomputed), pattern };
}

/**
 * A⁻¹ on the pattern Q (L + U)ᵀ P in original indices. That pattern contains Aᵀ's (for a symmetric nodal
 * matrix: every diagonal and every pair of nodes joined by a part). Entries failing the check come from
 * one full solve per column concerned.
 */
export function inverseEntriesOnPattern(f: LuFactors, options: SelectedInverseOptions = {}): ComplexCsc {
  const n = f.n;
  const pattern = fittingInversePattern(options.pattern, f);
  const tolerance = options.tolerance ?? DEFAULT_SELECTED_INVERSE_TOLERANCE;
  const z = selectedInverse(f, pattern);
  const { zRowPtr, zCol } = pattern;
  const all = Int32Array.from({ length: zCol.length }, (_, t) => t);
  const estimate = Number.isFinite(tolerance) ? estimateRoundingErrors(f, z, all) : new Float64Array(zCol.length);

  const rows = new Int32Array(zCol.length);
  const cols = new Int32Array(zCol.length);
  const re = z.re.slice();
  const im = z.im.slice();
  const untrusted = new Map<number, number[]>(); // original column → storage positions to recompute
  for (let k = 0; k < n; k++) {
    for (let t = zRowPtr[k]; t < zRowPtr[k + 1]; t++) {
      rows[t] = f.colOrder[k];
      cols[t] = f.rowOrder[zCol[t]];
      if (!(estimate[t] <= tolerance)) {
        const list = untrusted.get(cols[t]) ?? [];
        list.push(t);
        untrusted.set(cols[t], list);
      }
    }
  }
  for (const [col, positions] of untrusted) {
    const e: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
    e.re[col] = 1;
    const x = solveLu(f, e);
    for (const t of positions) {
      re[t] = x.re[rows[t]];
      im[t] = x.im[rows[t]];
    }
  }
  return complexFromTriplets(n, rows, cols, re, im);
}

function inverseOf(perm: Int32Array): Int32Array {
  const inv = new Int32Array(perm.length);
  for (let k = 0; k < perm.length; k++) inv[perm[k]] = k;
  return inv;
}
