// Test-only builders: a seeded generator, random sparse complex matrices, lattice patterns, and bridges
// to mathjs (the outside reference the numeric core is checked against).
import * as math from 'mathjs';
import type { ComplexCsc, ComplexVector, CscPattern } from '../../../src/numeric/types.js';
import { complexCscToDense, complexFromTriplets } from '../../../src/numeric/csc.js';

/** Small deterministic generator (xorshift32) so every failure reproduces. */
export function seededRandom(seed: number): () => number {
  // Spread small seeds over all bits, then let the state mix a little before use.
  let s = (Math.imul(seed ^ 0x5bd1e995, 0x9e3779b1) ^ 0xdeadbeef) >>> 0 || 1;
  const next = () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 4294967296;
  };
  for (let i = 0; i < 8; i++) next();
  return next;
}

export interface RandomMatrixOptions {
  density: number;
  symmetric?: boolean;
  /** Added to |diagonal|, relative to the number of off-diagonals, to steer how hard pivoting is. */
  diagonalWeight?: number;
  /** Leave the diagonal out of the pattern entirely (forces off-diagonal pivots). */
  noDiagonal?: boolean;
}

/** Random sparse complex matrix; symmetric means complex symmetric (Aᵀ = A), like J(ω). */
export function randomComplexMatrix(n: number, rand: () => number, opts: RandomMatrixOptions): ComplexCsc {
  const rows: number[] = [];
  const cols: number[] = [];
  const re: number[] = [];
  const im: number[] = [];
  const push = (i: number, j: number, a: number, b: number) => {
    rows.push(i);
    cols.push(j);
    re.push(a);
    im.push(b);
  };
  for (let j = 0; j < n; j++) {
    for (let i = opts.symmetric ? j + 1 : 0; i < n; i++) {
      if (i === j || rand() >= opts.density) continue;
      const a = 2 * rand() - 1;
      const b = 2 * rand() - 1;
      push(i, j, a, b);
      if (opts.symmetric) push(j, i, a, b);
    }
  }
  if (!opts.noDiagonal) {
    for (let i = 0; i < n; i++) {
      const w = (opts.diagonalWeight ?? 0) * n * opts.density;
      push(i, i, 2 * rand() - 1 + Math.sign(rand() - 0.5) * w, 2 * rand() - 1);
    }
  }
  // Make sure no row or column is empty, so the matrix is not trivially singular.
  const perm = shuffled(n, rand);
  for (let j = 0; j < n; j++) {
    const a = 0.5 + rand();
    const b = rand() - 0.5;
    push(perm[j], j, a, b);
    if (opts.symmetric && perm[j] !== j) push(j, perm[j], a, b);
  }
  return complexFromTriplets(n, rows, cols, re, im);
}

export function shuffled(n: number, rand: () => number): number[] {
  const p = Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(rand() * (i + 1));
    [p[i], p[j]] = [p[j], p[i]];
  }
  return p;
}

export function randomComplexVector(n: number, rand: () => number): ComplexVector {
  const v: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    v.re[i] = 2 * rand() - 1;
    v.im[i] = 2 * rand() - 1;
  }
  return v;
}

/** The matrix as a mathjs dense array of Complex entries. */
export function toMathjs(A: ComplexCsc): math.Complex[][] {
  const d = complexCscToDense(A);
  const n = A.n;
  return Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => math.complex(d.re[i * n + j], d.im[i * n + j])),
  );
}

export function vectorToMathjs(v: ComplexVector): math.Complex[][] {
  return Array.from(v.re, (r, i) => [math.complex(r, v.im[i])]);
}

export function vectorFromMathjs(x: math.Matrix | math.MathArray): ComplexVector {
  const nested = math.isMatrix(x) ? x.toArray() : x;
  const flat = (nested as unknown[]).flat(Infinity) as (math.Complex | number)[];
  const v: ComplexVector = { re: new Float64Array(flat.length), im: new Float64Array(flat.length) };
  flat.forEach((z, i) => {
    const c = math.complex(z as math.Complex);
    v.re[i] = c.re;
    v.im[i] = c.im;
  });
  return v;
}

/** A real mathjs SparseMatrix on a CSC pattern (the class is public at run time but absent from the typings). */
export function mathjsSparse(p: CscPattern, values: ArrayLike<number>): math.Matrix {
  const SparseMatrix = (math as unknown as { SparseMatrix: new (data: object) => math.Matrix }).SparseMatrix;
  return new SparseMatrix({
    values: Array.from(values),
    index: Array.from(p.rowIdx),
    ptr: Array.from(p.colPtr),
    size: [p.n, p.n],
  });
}

/** Reference solve of A x = b with mathjs dense lusolve. */
export function mathjsSolve(A: ComplexCsc, b: ComplexVector, transposed = false): ComplexVector {
  const M = toMathjs(A);
  return vectorFromMathjs(math.lusolve(transposed ? math.transpose(M) : M, vectorToMathjs(b)));
}

/** max_i |x_i − y_i| / max_i |y_i|. */
export function relativeDifference(x: ComplexVector, y: ComplexVector): number {
  let d = 0;
  let s = 0;
  for (let i = 0; i < x.re.length; i++) {
    d = Math.max(d, Math.hypot(x.re[i] - y.re[i], x.im[i] - y.im[i]));
    s = Math.max(s, Math.hypot(y.re[i], y.im[i]));
  }
  return d / s;
}

/** 5-point (2D) or 7-point (3D) lattice pattern with the diagonal, as nodal matrices have. */
export function latticePattern(dims: number[]): CscPattern {
  const n = dims.reduce((a, b) => a * b, 1);
  const strides = dims.map((_, d) => dims.slice(0, d).reduce((a, b) => a * b, 1));
  const lists: number[][] = Array.from({ length: n }, (_, i) => [i]);
  for (let i = 0; i < n; i++) {
    dims.forEach((size, d) => {
      const coord = Math.floor(i / strides[d]) % size;
      if (coord + 1 < size) {
        lists[i].push(i + strides[d]);
        lists[i + strides[d]].push(i);
      }
    });
  }
  const colPtr = new Int32Array(n + 1);
  lists.forEach((l, j) => (colPtr[j + 1] = colPtr[j] + l.length));
  const rowIdx = new Int32Array(colPtr[n]);
  lists.forEach((l, j) => rowIdx.set(l.sort((a, b) => a - b), colPtr[j]));
  return { n, colPtr, rowIdx };
}

/** A grounded-Laplacian-like matrix on a pattern: diagonally dominant, real, so pivots stay on the diagonal. */
export function laplacianValues(p: CscPattern): ComplexCsc {
  const nnz = p.colPtr[p.n];
  const re = new Float64Array(nnz);
  const im = new Float64Array(nnz);
  for (let j = 0; j < p.n; j++) {
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      re[q] = p.rowIdx[q] === j ? p.colPtr[j + 1] - p.colPtr[j] + 1 : -1;
    }
  }
  return { ...p, re, im };
}
