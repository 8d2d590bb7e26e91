// Nodes that no capacitor and no inductor touches (only resistors, which the lossless model drops) have
// an all-zero row in both K and C: the pencil is singular there for every σ. They take no part in any
// lossless mode, so the sparse solver works on the other nodes and pads the mode shapes with zeros.
import type { CscPattern } from './types.js';
import { realDiagonal } from './shift-invert-real-csc.js';

export interface ReducedPencil {
  pattern: CscPattern;
  K: Float64Array;
  C: Float64Array;
  /** kept[i] = original index of reduced row i. */
  kept: Int32Array;
  originalSize: number;
}

/** A positive semidefinite matrix with a zero diagonal entry has that whole row zero, so diagonals decide. */
export function withoutInertNodes(p: CscPattern, K: Float64Array, C: Float64Array): ReducedPencil {
  const kd = realDiagonal(p, K);
  const cd = realDiagonal(p, C);
  const keptList: number[] = [];
  for (let i = 0; i < p.n; i++) if (kd[i] !== 0 || cd[i] !== 0) keptList.push(i);
  const kept = Int32Array.from(keptList);
  if (kept.length === p.n) return { pattern: p, K, C, kept, originalSize: p.n };

  const newIndex = new Int32Array(p.n).fill(-1);
  kept.forEach((old, i) => (newIndex[old] = i));
  const colPtr = new Int32Array(kept.length + 1);
  const rows: number[] = [];
  const kv: number[] = [];
  const cv: number[] = [];
  kept.forEach((old, j) => {
    for (let q = p.colPtr[old]; q < p.colPtr[old + 1]; q++) {
      const i = newIndex[p.rowIdx[q]];
      if (i < 0) continue;
      rows.push(i);
      kv.push(K[q]);
      cv.push(C[q]);
    }
    colPtr[j + 1] = rows.length;
  });
  return {
    pattern: { n: kept.length, colPtr, rowIdx: Int32Array.from(rows) },
    K: Float64Array.from(kv),
    C: Float64Array.from(cv),
    kept,
    originalSize: p.n,
  };
}

/** A reduced vector back on all nodes, zero on the inert ones. */
export function expandToAllNodes(r: ReducedPencil, x: Float64Array): Float64Array {
  if (r.kept.length === r.originalSize) return x;
  const out = new Float64Array(r.originalSize);
  r.kept.forEach((old, i) => (out[old] = x[i]));
  return out;
}
