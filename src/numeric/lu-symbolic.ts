// Symbolic step of the sparse LU, done once per sparsity pattern (once per board): the fill-reducing
// column order and the fill it predicts if every pivot stays on the diagonal. The numeric step may pivot
// off the diagonal; the estimate then only sizes the first allocation.
import type { CscPattern } from './types.js';
import { approximateMinimumDegree } from './amd.js';
import { symmetricAdjacency } from './csc.js';

export interface LuSymbolic {
  n: number;
  /** The analyzed pattern; the numeric steps check that a matrix still has it. */
  pattern: CscPattern;
  /** colOrder[k] = original column eliminated k-th (and the preferred pivot row). */
  colOrder: Int32Array;
  /** colOrderInverse[j] = step at which original column j is eliminated. */
  colOrderInverse: Int32Array;
  /** Elimination tree of the permuted A + Aᵀ, in step numbering (-1 for a root). */
  eliminationTree: Int32Array;
  /** Predicted nnz(L) including the unit diagonal, for diagonal pivots. */
  lowerNnzEstimate: number;
  /** Predicted nnz(U) including the diagonal, for diagonal pivots. */
  upperNnzEstimate: number;
}

export interface AnalyzeOptions {
  /** 'amd' (default), 'natural', or an explicit order with order[k] = original column placed k-th. */
  ordering?: 'amd' | 'natural' | Int32Array;
}

export function analyzeLu(p: CscPattern, options: AnalyzeOptions = {}): LuSymbolic {
  const n = p.n;
  checkPattern(p);
  const ordering = options.ordering ?? 'amd';
  let colOrder: Int32Array;
  if (ordering === 'amd') colOrder = approximateMinimumDegree(p);
  else if (ordering === 'natural') colOrder = Int32Array.from({ length: n }, (_, k) => k);
  else colOrder = Int32Array.from(ordering);
  const colOrderInverse = inversePermutation(colOrder);

  const { eliminationTree, strictLowerCount } = choleskyFill(p, colOrder, colOrderInverse);
  return {
    n,
    pattern: { n, colPtr: p.colPtr, rowIdx: p.rowIdx },
    colOrder,
    colOrderInverse,
    eliminationTree,
    lowerNnzEstimate: strictLowerCount + n,
    upperNnzEstimate: strictLowerCount + n,
  };
}

/** A malformed pattern would corrupt the factorization silently, so it is rejected up front (O(nnz)). */
function checkPattern(p: CscPattern): void {
  const n = p.n;
  if (p.colPtr.length !== n + 1 || p.colPtr[0] !== 0) throw new RangeError('pattern colPtr must have n + 1 entries from 0');
  if (p.rowIdx.length < p.colPtr[n]) throw new RangeError('pattern rowIdx is shorter than colPtr[n]');
  for (let j = 0; j < n; j++) {
    if (p.colPtr[j + 1] < p.colPtr[j]) throw new RangeError(`pattern colPtr decreases at column ${j}`);
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      const i = p.rowIdx[q];
      if (!(i >= 0 && i < n) || (q > p.colPtr[j] && i <= p.rowIdx[q - 1])) {
        throw new RangeError(`pattern rows of column ${j} must be distinct, sorted and within 0..${n - 1}`);
      }
    }
  }
}

/** Inverse of a permutation; throws if `perm` is not one. */
export function inversePermutation(perm: Int32Array): Int32Array {
  const n = perm.length;
  const inv = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const j = perm[k];
    if (!(j >= 0 && j < n) || inv[j] !== -1) throw new RangeError('ordering is not a permutation');
    inv[j] = k;
  }
  return inv;
}

/**
 * Elimination tree (Liu's algorithm with path compression) and the strict-lower nonzero count of the
 * Cholesky factor of the permuted A + Aᵀ, found by walking each row's subtree: O(nnz(L)).
 */
function choleskyFill(
  p: CscPattern,
  order: Int32Array,
  inverse: Int32Array,
): { eliminationTree: Int32Array; strictLowerCount: number } {
  const n = p.n;
  const g = symmetricAdjacency(p);
  const parent = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const node = order[k];
    for (let q = g.colPtr[node]; q < g.colPtr[node + 1]; q++) {
      let i = inverse[g.rowIdx[q]];
      while (i !== -1 && i < k) {
        const up = ancestor[i];
        ancestor[i] = k;
        if (up === -1) parent[i] = k;
        i = up;
      }
    }
  }
  // Row k of L is the union of the tree paths from each earlier neighbour up to k.
  const visited = new Int32Array(n).fill(-1);
  let count = 0;
  for (let k = 0; k < n; k++) {
    visited[k] = k;
    const node = order[k];
    for (let q = g.colPtr[node]; q < g.colPtr[node + 1]; q++) {
      let i = inverse[g.rowIdx[q]];
      if (i > k) continue;
      while (visited[i] !== k) {
        visited[i] = k;
        count++;
        i = parent[i];
      }
    }
  }
  return { eliminationTree: parent, strictLowerCount: count };
}
