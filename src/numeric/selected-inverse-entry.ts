// One entry Z(a, b) = e_aᵀ U⁻¹ L⁻¹ e_b of (L U)⁻¹ by the two triangular solves of the solve path,
// restricted to the entries that can be nonzero or are needed:
//   y = L⁻¹ e_b   is nonzero only on the steps reachable from b in the graph of L (columns → rows);
//   x = U⁻¹ y     is needed only on the steps reachable from a in the graph of U's rows (row i → column k).
// The arithmetic on those steps is that of a full solve, so the entry is as accurate as the solve path.
// (The shorter (row a of U⁻¹) · (column b of L⁻¹) is avoided on purpose: after small pivots those two
// vectors are huge while their product is not, and the dot product cancels catastrophically.)
import type { LuFactors } from './lu-numeric.js';
import type { SelectedInversePattern } from './selected-inverse-pattern.js';

/** Work arrays for repeated entries of one factorization; every call leaves them clean again. */
export interface EntryWorkspace {
  yRe: Float64Array;
  yIm: Float64Array;
  xRe: Float64Array;
  xIm: Float64Array;
  mark: Uint8Array;
  list: Int32Array;
}

export function entryWorkspace(n: number): EntryWorkspace {
  return {
    yRe: new Float64Array(n),
    yIm: new Float64Array(n),
    xRe: new Float64Array(n),
    xIm: new Float64Array(n),
    mark: new Uint8Array(n),
    list: new Int32Array(n),
  };
}

/** Z(a, b) in pivot-step indices; `pattern` supplies U by rows. */
export function inverseEntryBySolves(
  f: LuFactors,
  pattern: SelectedInversePattern,
  a: number,
  b: number,
  work: EntryWorkspace = entryWorkspace(f.n),
): { re: number; im: number } {
  const { lColPtr, lRowIdx, lRe, lIm, uRe, uIm, pivotRe, pivotIm } = f;
  const { uRowPtr, uRowCol, uRowSource } = pattern;
  const { yRe, yIm, xRe, xIm } = work;

  // Every edge of either graph goes to a later step, so ascending step order is a topological order.
  const fromB = reach(b, lColPtr, lRowIdx, work);
  yRe[b] = 1;
  for (const k of fromB) {
    const br = yRe[k];
    const bi = yIm[k];
    if (br === 0 && bi === 0) continue;
    for (let t = lColPtr[k]; t < lColPtr[k + 1]; t++) {
      const i = lRowIdx[t];
      yRe[i] -= lRe[t] * br - lIm[t] * bi;
      yIm[i] -= lRe[t] * bi + lIm[t] * br;
    }
  }

  const fromA = reach(a, uRowPtr, uRowCol, work);
  for (let r = fromA.length - 1; r >= 0; r--) {
    const k = fromA[r];
    let sr = yRe[k];
    let si = yIm[k];
    for (let q = uRowPtr[k]; q < uRowPtr[k + 1]; q++) {
      const m = uRowCol[q];
      const s = uRowSource[q];
      sr -= uRe[s] * xRe[m] - uIm[s] * xIm[m];
      si -= uRe[s] * xIm[m] + uIm[s] * xRe[m];
    }
    const dr = pivotRe[k];
    const di = pivotIm[k];
    const d2 = dr * dr + di * di;
    xRe[k] = (sr * dr + si * di) / d2;
    xIm[k] = (si * dr - sr * di) / d2;
  }
  const value = { re: xRe[a], im: xIm[a] };

  for (const k of fromB) yRe[k] = yIm[k] = 0;
  for (const k of fromA) xRe[k] = xIm[k] = 0;
  return value;
}

/** Steps reachable from `start` along ptr/idx adjacency lists, ascending; leaves `mark` clear. */
function reach(start: number, ptr: Int32Array, idx: Int32Array, work: EntryWorkspace): Int32Array {
  const { mark, list } = work;
  let count = 0;
  list[count++] = start;
  mark[start] = 1;
  for (let head = 0; head < count; head++) {
    const k = list[head];
    for (let t = ptr[k]; t < ptr[k + 1]; t++) {
      const j = idx[t];
      if (mark[j] === 0) {
        mark[j] = 1;
        list[count++] = j;
      }
    }
  }
  const found = list.slice(0, count).sort();
  for (let r = 0; r < count; r++) mark[found[r]] = 0;
  return found;
}
