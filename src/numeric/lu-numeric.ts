// Numeric sparse complex LU, left-looking (Gilbert & Peierls, 1988): column k of L and U comes from one
// sparse triangular solve with the columns already done, whose nonzero pattern is found first by a
// depth-first search in the graph of L, so the work is proportional to the flops.
//
// Pivoting is threshold partial pivoting that prefers the diagonal, as circuit-matrix solvers do: the
// symmetric fill-reducing order only pays off if pivots stay on the diagonal, and J is complex symmetric,
// so an off-diagonal pivot is taken only when the diagonal is too small against its column.
//
// refactorLu replays an earlier pivot sequence on new values with the same pattern (the next frequency of
// a sweep), skipping the search; if a replayed pivot loses too much against its column it starts over.
import type { ComplexCsc } from './types.js';
import type { LuSymbolic } from './lu-symbolic.js';
import { samePattern } from './csc.js';
import { SingularMatrixError } from './singular-matrix-error.js';

export { SingularMatrixError } from './singular-matrix-error.js';

export interface LuOptions {
  /**
   * The diagonal is kept as pivot while |a_jj| ≥ pivotTolerance · max |candidate| in its column.
   * 1 is plain partial pivoting; default 0.001 (common practice for circuit matrices).
   */
  pivotTolerance?: number;
}

export const DEFAULT_PIVOT_TOLERANCE = 0.001;

/**
 * A(rowOrder, colOrder) = L U. L is unit lower triangular (diagonal not stored), U upper triangular with
 * its diagonal in pivotRe/pivotIm; row indices of both are pivot steps.
 */
export interface LuFactors {
  n: number;
  symbolic: LuSymbolic;
  pivotTolerance: number;
  /** colOrder[k] = original column eliminated at step k. */
  colOrder: Int32Array;
  /** rowOrder[k] = original row chosen as pivot at step k. */
  rowOrder: Int32Array;
  /** rowOrderInverse[i] = step at which original row i was pivotal. */
  rowOrderInverse: Int32Array;
  lColPtr: Int32Array;
  lRowIdx: Int32Array;
  lRe: Float64Array;
  lIm: Float64Array;
  /** Strictly upper part; rows within a column are in a topological order of the solve (reused by refactor). */
  uColPtr: Int32Array;
  uRowIdx: Int32Array;
  uRe: Float64Array;
  uIm: Float64Array;
  pivotRe: Float64Array;
  pivotIm: Float64Array;
  /** nnz(L) counting the unit diagonal. */
  nnzL: number;
  /** nnz(U) counting the diagonal. */
  nnzU: number;
  /** Steps whose pivot is not the diagonal entry of the column. */
  offDiagonalPivots: number;
  /** max over columns of max|U(:,k)| / max|A(:,colOrder[k])|; large values flag unstable elimination. */
  pivotGrowth: number;
  smallestPivot: number;
  largestPivot: number;
  /** True when produced by replaying an earlier pivot sequence. */
  refactored: boolean;
  /** Step at which a refactorization rejected a replayed pivot and fell back to factorLu; -1 otherwise. */
  refactorRejectedAt: number;
}

/** Full numeric factorization with pivot search. Throws SingularMatrixError on an exactly zero column. */
export function factorLu(sym: LuSymbolic, A: ComplexCsc, options: LuOptions = {}): LuFactors {
  const tol = options.pivotTolerance ?? DEFAULT_PIVOT_TOLERANCE;
  if (!(tol > 0 && tol <= 1)) throw new RangeError(`pivotTolerance must be in (0, 1], got ${tol}`);
  checkMatrix(sym, A);
  const n = A.n;
  const { colPtr: Ap, rowIdx: Ai, re: Are, im: Aim } = A;
  const q = sym.colOrder;
  const tol2 = tol * tol;

  const pinv = new Int32Array(n).fill(-1);
  const lColPtr = new Int32Array(n + 1);
  const uColPtr = new Int32Array(n + 1);
  const pivotRe = new Float64Array(n);
  const pivotIm = new Float64Array(n);
  let lCap = Math.max(sym.lowerNnzEstimate - n, 0) + n;
  let uCap = Math.max(sym.upperNnzEstimate - n, 0) + n;
  let lRowIdx: Int32Array = new Int32Array(lCap);
  let lRe: Float64Array = new Float64Array(lCap);
  let lIm: Float64Array = new Float64Array(lCap);
  let uRowIdx: Int32Array = new Int32Array(uCap);
  let uRe: Float64Array = new Float64Array(uCap);
  let uIm: Float64Array = new Float64Array(uCap);
  let lnz = 0;
  let unz = 0;

  // Dense accumulator indexed by original row, plus DFS workspace.
  const xRe = new Float64Array(n);
  const xIm = new Float64Array(n);
  const mark = new Int32Array(n);
  const stack = new Int32Array(n);
  const resume = new Int32Array(n);
  const reach = new Int32Array(n);

  let offDiagonalPivots = 0;
  let pivotGrowth = 0;
  let smallest = Infinity;
  let largest = 0;

  for (let k = 0; k < n; k++) {
    const col = q[k];
    const stamp = k + 1;
    lColPtr[k] = lnz;
    uColPtr[k] = unz;

    // --- Pattern of x = L \ A(:,col): everything reachable from A's rows in the graph of L. ---
    // Topological order comes out in reach[top..n).
    let top = n;
    for (let p = Ap[col]; p < Ap[col + 1]; p++) {
      const r = Ai[p];
      if (mark[r] === stamp) continue;
      let head = 0;
      stack[0] = r;
      while (head >= 0) {
        const j = stack[head];
        const J = pinv[j];
        if (mark[j] !== stamp) {
          mark[j] = stamp;
          resume[head] = J < 0 ? 0 : lColPtr[J];
        }
        const end = J < 0 ? 0 : lColPtr[J + 1];
        let descended = false;
        for (let t = resume[head]; t < end; t++) {
          const i = lRowIdx[t];
          if (mark[i] === stamp) continue;
          resume[head] = t + 1;
          stack[++head] = i;
          descended = true;
          break;
        }
        if (!descended) {
          head--;
          reach[--top] = j;
        }
      }
    }

    // --- Numeric sparse triangular solve. ---
    let colMax2 = 0;
    for (let p = Ap[col]; p < Ap[col + 1]; p++) {
      const r = Ai[p];
      xRe[r] += Are[p];
      xIm[r] += Aim[p];
      const m2 = Are[p] * Are[p] + Aim[p] * Aim[p];
      if (m2 > colMax2) colMax2 = m2;
    }
    for (let t = top; t < n; t++) {
      const j = reach[t];
      const J = pinv[j];
      if (J < 0) continue;
      const br = xRe[j];
      const bi = xIm[j];
      if (br === 0 && bi === 0) continue;
      for (let s = lColPtr[J]; s < lColPtr[J + 1]; s++) {
        const i = lRowIdx[s];
        xRe[i] -= lRe[s] * br - lIm[s] * bi;
        xIm[i] -= lRe[s] * bi + lIm[s] * br;
      }
    }

    // --- U part of the column, and the pivot search among rows not yet pivotal. ---
    if (unz + (n - top) > uCap) {
      uCap = Math.max(2 * uCap, unz + (n - top));
      [uRowIdx, uRe, uIm] = grow(uRowIdx, uRe, uIm, unz, uCap);
    }
    let best = -1;
    let best2 = -1;
    let uMax2 = 0;
    for (let t = top; t < n; t++) {
      const i = reach[t];
      const m2 = xRe[i] * xRe[i] + xIm[i] * xIm[i];
      if (pinv[i] < 0) {
        if (m2 > best2) {
          best2 = m2;
          best = i;
        }
      } else {
        uRowIdx[unz] = pinv[i];
        uRe[unz] = xRe[i];
        uIm[unz] = xIm[i];
        unz++;
        if (m2 > uMax2) uMax2 = m2;
      }
    }
    if (best < 0 || !(best2 > 0)) {
      throw new SingularMatrixError(col, k, best < 0 ? 'structural' : 'numerical');
    }
    let pivotRow = best;
    if (col !== best && pinv[col] < 0 && mark[col] === stamp) {
      const d2 = xRe[col] * xRe[col] + xIm[col] * xIm[col];
      if (d2 > 0 && d2 >= tol2 * best2) pivotRow = col;
    }
    if (pivotRow !== col) offDiagonalPivots++;
    const pr = xRe[pivotRow];
    const pi = xIm[pivotRow];
    const p2 = pr * pr + pi * pi;
    pivotRe[k] = pr;
    pivotIm[k] = pi;
    pinv[pivotRow] = k;
    const pm = Math.sqrt(p2);
    if (pm < smallest) smallest = pm;
    if (pm > largest) largest = pm;
    if (p2 > uMax2) uMax2 = p2;
    if (colMax2 > 0) pivotGrowth = Math.max(pivotGrowth, Math.sqrt(uMax2 / colMax2));

    // --- L part: the remaining candidates divided by the pivot. ---
    if (lnz + (n - top) > lCap) {
      lCap = Math.max(2 * lCap, lnz + (n - top));
      [lRowIdx, lRe, lIm] = grow(lRowIdx, lRe, lIm, lnz, lCap);
    }
    const invRe = pr / p2;
    const invIm = -pi / p2;
    for (let t = top; t < n; t++) {
      const i = reach[t];
      if (pinv[i] < 0) {
        const vr = xRe[i];
        const vi = xIm[i];
        lRowIdx[lnz] = i;
        lRe[lnz] = vr * invRe - vi * invIm;
        lIm[lnz] = vr * invIm + vi * invRe;
        lnz++;
      }
      xRe[i] = 0;
      xIm[i] = 0;
    }
  }
  lColPtr[n] = lnz;
  uColPtr[n] = unz;
  // L rows were kept as original rows while the search needed them; renumber to pivot steps.
  for (let s = 0; s < lnz; s++) lRowIdx[s] = pinv[lRowIdx[s]];

  const rowOrder = new Int32Array(n);
  for (let i = 0; i < n; i++) rowOrder[pinv[i]] = i;
  return {
    n,
    symbolic: sym,
    pivotTolerance: tol,
    colOrder: q,
    rowOrder,
    rowOrderInverse: pinv,
    lColPtr,
    lRowIdx: lRowIdx.slice(0, lnz),
    lRe: lRe.slice(0, lnz),
    lIm: lIm.slice(0, lnz),
    uColPtr,
    uRowIdx: uRowIdx.slice(0, unz),
    uRe: uRe.slice(0, unz),
    uIm: uIm.slice(0, unz),
    pivotRe,
    pivotIm,
    nnzL: lnz + n,
    nnzU: unz + n,
    offDiagonalPivots,
    pivotGrowth,
    smallestPivot: n > 0 ? smallest : 0,
    largestPivot: largest,
    refactored: false,
    refactorRejectedAt: -1,
  };
}

/**
 * Factor a matrix with the same pattern as the one behind `f`, replaying f's pivot sequence and L/U
 * patterns. A replayed pivot smaller than f.pivotTolerance times the largest entry below it (or zero)
 * means the old sequence no longer suits these values: a fresh factorLu is returned instead, with
 * refactorRejectedAt telling the step.
 */
export function refactorLu(f: LuFactors, A: ComplexCsc): LuFactors {
  checkMatrix(f.symbolic, A);
  const n = f.n;
  const { colPtr: Ap, rowIdx: Ai, re: Are, im: Aim } = A;
  const { colOrder: q, rowOrderInverse: pinv, lColPtr, lRowIdx, uColPtr, uRowIdx } = f;
  const tol2 = f.pivotTolerance * f.pivotTolerance;
  const lRe = new Float64Array(lRowIdx.length);
  const lIm = new Float64Array(lRowIdx.length);
  const uRe = new Float64Array(uRowIdx.length);
  const uIm = new Float64Array(uRowIdx.length);
  const pivotRe = new Float64Array(n);
  const pivotIm = new Float64Array(n);
  // Accumulator indexed by pivot step: every row already has its final position.
  const xRe = new Float64Array(n);
  const xIm = new Float64Array(n);
  let pivotGrowth = 0;
  let smallest = Infinity;
  let largest = 0;

  for (let k = 0; k < n; k++) {
    const col = q[k];
    let colMax2 = 0;
    for (let p = Ap[col]; p < Ap[col + 1]; p++) {
      const r = pinv[Ai[p]];
      xRe[r] += Are[p];
      xIm[r] += Aim[p];
      const m2 = Are[p] * Are[p] + Aim[p] * Aim[p];
      if (m2 > colMax2) colMax2 = m2;
    }
    let uMax2 = 0;
    for (let s = uColPtr[k]; s < uColPtr[k + 1]; s++) {
      const j = uRowIdx[s];
      const br = xRe[j];
      const bi = xIm[j];
      xRe[j] = 0;
      xIm[j] = 0;
      uRe[s] = br;
      uIm[s] = bi;
      const m2 = br * br + bi * bi;
      if (m2 > uMax2) uMax2 = m2;
      if (br === 0 && bi === 0) continue;
      for (let t = lColPtr[j]; t < lColPtr[j + 1]; t++) {
        const i = lRowIdx[t];
        xRe[i] -= lRe[t] * br - lIm[t] * bi;
        xIm[i] -= lRe[t] * bi + lIm[t] * br;
      }
    }
    const pr = xRe[k];
    const pi = xIm[k];
    xRe[k] = 0;
    xIm[k] = 0;
    const p2 = pr * pr + pi * pi;
    let below2 = 0;
    for (let t = lColPtr[k]; t < lColPtr[k + 1]; t++) {
      const i = lRowIdx[t];
      const m2 = xRe[i] * xRe[i] + xIm[i] * xIm[i];
      if (m2 > below2) below2 = m2;
    }
    if (!(p2 > 0) || p2 < tol2 * below2) {
      const fresh = factorLu(f.symbolic, A, { pivotTolerance: f.pivotTolerance });
      return { ...fresh, refactorRejectedAt: k };
    }
    pivotRe[k] = pr;
    pivotIm[k] = pi;
    const pm = Math.sqrt(p2);
    if (pm < smallest) smallest = pm;
    if (pm > largest) largest = pm;
    if (p2 > uMax2) uMax2 = p2;
    if (colMax2 > 0) pivotGrowth = Math.max(pivotGrowth, Math.sqrt(uMax2 / colMax2));
    const invRe = pr / p2;
    const invIm = -pi / p2;
    for (let t = lColPtr[k]; t < lColPtr[k + 1]; t++) {
      const i = lRowIdx[t];
      const vr = xRe[i];
      const vi = xIm[i];
      lRe[t] = vr * invRe - vi * invIm;
      lIm[t] = vr * invIm + vi * invRe;
      xRe[i] = 0;
      xIm[i] = 0;
    }
  }
  return {
    ...f,
    lRe,
    lIm,
    uRe,
    uIm,
    pivotRe,
    pivotIm,
    pivotGrowth,
    smallestPivot: n > 0 ? smallest : 0,
    largestPivot: largest,
    refactored: true,
    refactorRejectedAt: -1,
  };
}

function checkMatrix(sym: LuSymbolic, A: ComplexCsc): void {
  if (!samePattern(sym.pattern, A)) {
    throw new Error('matrix pattern differs from the one given to analyzeLu');
  }
  const nnz = A.colPtr[A.n];
  for (let p = 0; p < nnz; p++) {
    if (!Number.isFinite(A.re[p]) || !Number.isFinite(A.im[p])) {
      throw new RangeError(`matrix entry ${p} is not finite`);
    }
  }
}

function grow(
  idx: Int32Array,
  re: Float64Array,
  im: Float64Array,
  used: number,
  cap: number,
): [Int32Array, Float64Array, Float64Array] {
  const i2 = new Int32Array(cap);
  const r2 = new Float64Array(cap);
  const m2 = new Float64Array(cap);
  i2.set(idx.subarray(0, used));
  r2.set(re.subarray(0, used));
  m2.set(im.subarray(0, used));
  return [i2, r2, m2];
}
