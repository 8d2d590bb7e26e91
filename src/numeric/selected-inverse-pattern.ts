// Symbolic step of selected inversion: where the entries of Z = (L U)⁻¹ on the pattern of (L + U)ᵀ are
// kept, and the index lists the Takahashi recurrences walk. It depends only on the patterns of L and U and
// on the pivot sequence, so every refactorization that replays the same pivots can share it.
//
// Why that pattern is enough (Erisman–Tinney): the recurrences for row and column i of Z read Z(k, j)
// only for U(i, k) ≠ 0 and L(j, i) ≠ 0 with k, j > i. Eliminating pivot i then creates (j, k) in L + U
// (left-looking: j is reachable from i in the graph of L when column k is solved), so Z(k, j) sits at a
// transposed position of L + U again: the set is closed and nothing outside it is ever needed.
import type { LuFactors } from './lu-numeric.js';

export interface SelectedInversePattern {
  n: number;
  /**
   * Z is stored by rows. Row k holds Z(k, k) and Z(k, j) for every j with (j, k) in L + U: the transpose
   * of column k of L + U. Columns run descending, so a scan can stop at the first column ≤ i.
   */
  zRowPtr: Int32Array;
  zCol: Int32Array;
  /** Position of Z(k, k) in row k. */
  zDiagonal: Int32Array;
  /** Strict upper U by rows: for pivot i the columns k > i with U(i, k) ≠ 0, last pivot first. */
  uRowPtr: Int32Array;
  uRowCol: Int32Array;
  /** Position of U(i, k) in the factors' uRe/uIm. */
  uRowSource: Int32Array;
  /** Position of Z(k, i) in Z's storage: the entry that the column recurrence for i produces from U(i, k). */
  uRowTarget: Int32Array;
  /**
   * For each original index v, where (A⁻¹)(v, v) = Z(colOrderInverse[v], rowOrderInverse[v]) is stored, or
   * -1 when that entry lies outside the pattern (possible only when A(v, v) is structurally absent).
   */
  nodeDiagonal: Int32Array;
  /** The factor arrays this was built from, to tell whether later factors still fit. */
  source: Pick<LuFactors, 'lColPtr' | 'lRowIdx' | 'uColPtr' | 'uRowIdx' | 'rowOrder' | 'colOrder'>;
}

export function analyzeSelectedInverse(f: LuFactors): SelectedInversePattern {
  const n = f.n;
  const { lColPtr, lRowIdx, uColPtr, uRowIdx, colOrder, rowOrderInverse } = f;

  // Row k of Z mirrors column k of L + U (strict parts plus the diagonal); L and U never share a row.
  const zRowPtr = new Int32Array(n + 1);
  for (let k = 0; k < n; k++) {
    zRowPtr[k + 1] = zRowPtr[k] + (lColPtr[k + 1] - lColPtr[k]) + (uColPtr[k + 1] - uColPtr[k]) + 1;
  }
  const zCol = new Int32Array(zRowPtr[n]);
  const zDiagonal = new Int32Array(n);
  const uTarget = new Int32Array(uRowIdx.length);
  const where = new Int32Array(n); // column → position within the row being built
  for (let k = 0; k < n; k++) {
    let t = zRowPtr[k];
    for (let s = lColPtr[k]; s < lColPtr[k + 1]; s++) zCol[t++] = lRowIdx[s];
    for (let s = uColPtr[k]; s < uColPtr[k + 1]; s++) zCol[t++] = uRowIdx[s];
    zCol[t] = k;
    const row = zCol.subarray(zRowPtr[k], zRowPtr[k + 1]).sort().reverse();
    for (let r = 0; r < row.length; r++) where[row[r]] = zRowPtr[k] + r;
    zDiagonal[k] = where[k];
    for (let s = uColPtr[k]; s < uColPtr[k + 1]; s++) uTarget[s] = where[uRowIdx[s]];
  }

  // Transpose the strict U by a counting sort; visiting columns from the last keeps rows descending.
  const uRowPtr = new Int32Array(n + 1);
  for (let s = 0; s < uRowIdx.length; s++) uRowPtr[uRowIdx[s] + 1]++;
  for (let i = 0; i < n; i++) uRowPtr[i + 1] += uRowPtr[i];
  const next = uRowPtr.slice(0, n);
  const uRowCol = new Int32Array(uRowIdx.length);
  const uRowSource = new Int32Array(uRowIdx.length);
  const uRowTarget = new Int32Array(uRowIdx.length);
  for (let k = n - 1; k >= 0; k--) {
    for (let s = uColPtr[k]; s < uColPtr[k + 1]; s++) {
      const q = next[uRowIdx[s]]++;
      uRowCol[q] = k;
      uRowSource[q] = s;
      uRowTarget[q] = uTarget[s];
    }
  }

  // A⁻¹ = Q Z P, so (A⁻¹)(v, v) = Z(a, b) with a = step of column v, b = step of row v. When A(v, v) is in
  // A's pattern, (b, a) is in L + U (every entry of A lands in the factors' pattern) and Z(a, b) is stored
  // in row a. Each row is searched once, since v ↦ a is a bijection: O(nnz) in all.
  const nodeDiagonal = new Int32Array(n).fill(-1);
  for (let a = 0; a < n; a++) {
    const v = colOrder[a];
    const b = rowOrderInverse[v];
    for (let t = zRowPtr[a]; t < zRowPtr[a + 1]; t++) {
      if (zCol[t] === b) {
        nodeDiagonal[v] = t;
        break;
      }
    }
  }

  const { rowOrder } = f;
  return {
    n,
    zRowPtr,
    zCol,
    zDiagonal,
    uRowPtr,
    uRowCol,
    uRowSource,
    uRowTarget,
    nodeDiagonal,
    source: { lColPtr, lRowIdx, uColPtr, uRowIdx, rowOrder, colOrder },
  };
}

/**
 * True when `f` has the L and U patterns and pivot sequence the pattern was built from. Refactorizations
 * share those arrays, so the usual check is by identity; equal copies are accepted after a comparison.
 */
export function inversePatternFits(pattern: SelectedInversePattern, f: LuFactors): boolean {
  const s = pattern.source;
  if (pattern.n !== f.n) return false;
  const pairs: [Int32Array, Int32Array][] = [
    [s.lColPtr, f.lColPtr],
    [s.lRowIdx, f.lRowIdx],
    [s.uColPtr, f.uColPtr],
    [s.uRowIdx, f.uRowIdx],
    [s.rowOrder, f.rowOrder],
    [s.colOrder, f.colOrder],
  ];
  return pairs.every(([a, b]) => a === b || sameEntries(a, b));
}

/** The earlier pattern while it still fits `f` (a sweep that replays its pivots), otherwise a new one. */
export function fittingInversePattern(
  previous: SelectedInversePattern | undefined,
  f: LuFactors,
): SelectedInversePattern {
  return previous && inversePatternFits(previous, f) ? previous : analyzeSelectedInverse(f);
}

function sameEntries(a: Int32Array, b: Int32Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}
