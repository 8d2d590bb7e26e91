// Building and using complex CSC matrices: triplet assembly, products, norms, dense copies for tests.
import type { ComplexCsc, ComplexVector, CscPattern } from './types.js';

/**
 * Assemble an n-by-n complex CSC matrix from triplets (row, col, re, im). Duplicates are summed (the way
 * element stamps add up in nodal analysis) and rows come out sorted in each column.
 */
export function complexFromTriplets(
  n: number,
  rows: ArrayLike<number>,
  cols: ArrayLike<number>,
  re: ArrayLike<number>,
  im: ArrayLike<number>,
): ComplexCsc {
  const count = rows.length;
  if (cols.length !== count || re.length !== count || im.length !== count) {
    throw new RangeError('triplet arrays must have the same length');
  }
  for (let t = 0; t < count; t++) {
    const r = rows[t];
    const c = cols[t];
    if (!(r >= 0 && r < n && c >= 0 && c < n) || r !== Math.floor(r) || c !== Math.floor(c)) {
      throw new RangeError(`triplet ${t} has index (${r}, ${c}) outside a ${n}x${n} matrix`);
    }
  }
  // Two stable counting sorts (by row, then by column) leave rows ascending within each column.
  const byRow = countingOrder(n, rows, identityOrder(count));
  const order = countingOrder(n, cols, byRow);

  const colPtr = new Int32Array(n + 1);
  const rowIdx = new Int32Array(count);
  const outRe = new Float64Array(count);
  const outIm = new Float64Array(count);
  let nnz = 0;
  let t = 0;
  for (let c = 0; c < n; c++) {
    colPtr[c] = nnz;
    while (t < count && cols[order[t]] === c) {
      const k = order[t++];
      const r = rows[k];
      if (nnz > colPtr[c] && rowIdx[nnz - 1] === r) {
        outRe[nnz - 1] += re[k];
        outIm[nnz - 1] += im[k];
      } else {
        rowIdx[nnz] = r;
        outRe[nnz] = re[k];
        outIm[nnz] = im[k];
        nnz++;
      }
    }
  }
  colPtr[n] = nnz;
  return { n, colPtr, rowIdx: rowIdx.slice(0, nnz), re: outRe.slice(0, nnz), im: outIm.slice(0, nnz) };
}

function identityOrder(count: number): Int32Array {
  const order = new Int32Array(count);
  for (let t = 0; t < count; t++) order[t] = t;
  return order;
}

/** Stable counting sort of the positions in `order` by key[position] in 0..n-1. */
function countingOrder(n: number, key: ArrayLike<number>, order: Int32Array): Int32Array {
  const start = new Int32Array(n + 1);
  for (let t = 0; t < order.length; t++) start[key[order[t]] + 1]++;
  for (let i = 0; i < n; i++) start[i + 1] += start[i];
  const out = new Int32Array(order.length);
  for (let t = 0; t < order.length; t++) out[start[key[order[t]]]++] = order[t];
  return out;
}

/** y = A x. */
export function complexMatVec(A: ComplexCsc, x: ComplexVector): ComplexVector {
  const { n, colPtr, rowIdx, re, im } = A;
  const yRe = new Float64Array(n);
  const yIm = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const xr = x.re[j];
    const xi = x.im[j];
    if (xr === 0 && xi === 0) continue;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      yRe[i] += re[p] * xr - im[p] * xi;
      yIm[i] += re[p] * xi + im[p] * xr;
    }
  }
  return { re: yRe, im: yIm };
}

/** y = A^T x (plain transpose, no conjugation). */
export function complexMatVecTransposed(A: ComplexCsc, x: ComplexVector): ComplexVector {
  const { n, colPtr, rowIdx, re, im } = A;
  const yRe = new Float64Array(n);
  const yIm = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let sr = 0;
    let si = 0;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIdx[p];
      sr += re[p] * x.re[i] - im[p] * x.im[i];
      si += re[p] * x.im[i] + im[p] * x.re[i];
    }
    yRe[j] = sr;
    yIm[j] = si;
  }
  return { re: yRe, im: yIm };
}

/** ‖A‖₁: largest column sum of moduli. */
export function complexNorm1(A: ComplexCsc): number {
  let best = 0;
  for (let j = 0; j < A.n; j++) {
    let s = 0;
    for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) s += Math.sqrt(A.re[p] * A.re[p] + A.im[p] * A.im[p]);
    if (s > best) best = s;
  }
  return best;
}

/** ‖A‖∞: largest row sum of moduli. */
export function complexNormInf(A: ComplexCsc): number {
  const rowSum = new Float64Array(A.n);
  for (let p = 0; p < A.rowIdx.length; p++) {
    rowSum[A.rowIdx[p]] += Math.sqrt(A.re[p] * A.re[p] + A.im[p] * A.im[p]);
  }
  let best = 0;
  for (let i = 0; i < A.n; i++) if (rowSum[i] > best) best = rowSum[i];
  return best;
}

/** Dense row-major copy (real and imaginary parts), for tests and reference comparisons. */
export function complexCscToDense(A: ComplexCsc): { re: Float64Array; im: Float64Array } {
  const n = A.n;
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) {
      re[A.rowIdx[p] * n + j] += A.re[p];
      im[A.rowIdx[p] * n + j] += A.im[p];
    }
  }
  return { re, im };
}

/** True when two patterns describe the same sparsity structure (cheap when they share arrays). */
export function samePattern(a: CscPattern, b: CscPattern): boolean {
  if (a.n !== b.n) return false;
  if (a.colPtr === b.colPtr && a.rowIdx === b.rowIdx) return true;
  if (a.colPtr.length !== b.colPtr.length || a.rowIdx.length !== b.rowIdx.length) return false;
  for (let j = 0; j <= a.n; j++) if (a.colPtr[j] !== b.colPtr[j]) return false;
  const nnz = a.colPtr[a.n];
  for (let p = 0; p < nnz; p++) if (a.rowIdx[p] !== b.rowIdx[p]) return false;
  return true;
}

/**
 * Pattern of A + Aᵀ without the diagonal, as sorted adjacency lists: the graph that symmetric orderings
 * work on.
 */
export function symmetricAdjacency(p: CscPattern): CscPattern {
  const n = p.n;
  const degree = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      const i = p.rowIdx[q];
      if (i === j) continue;
      degree[i + 1]++;
      degree[j + 1]++;
    }
  }
  for (let i = 0; i < n; i++) degree[i + 1] += degree[i];
  const fill = degree.slice(0, n);
  const adj = new Int32Array(degree[n]);
  for (let j = 0; j < n; j++) {
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      const i = p.rowIdx[q];
      if (i === j) continue;
      adj[fill[j]++] = i;
      adj[fill[i]++] = j;
    }
  }
  // Sort each list and drop the duplicates that symmetric input produces (a_ij and a_ji both present).
  // Compacting in place is safe: the write position never passes the read position.
  const colPtr = new Int32Array(n + 1);
  let out = 0;
  for (let j = 0; j < n; j++) {
    const list = adj.subarray(degree[j], degree[j + 1]).sort();
    colPtr[j] = out;
    for (let k = 0; k < list.length; k++) {
      if (k > 0 && list[k] === list[k - 1]) continue;
      adj[out++] = list[k];
    }
  }
  colPtr[n] = out;
  return { n, colPtr, rowIdx: adj.slice(0, out) };
}
