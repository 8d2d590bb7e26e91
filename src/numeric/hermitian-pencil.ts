// Eigenpairs of the Hermitian-definite pencil K x = w^2 C x (K, C complex Hermitian, both positive
// semi-definite), the form the Bloch matrices of a lossless lattice take at each phase.
//
// Method (all through the real embedding, so one real symmetric solver does every step):
//  1. C = U diag(d) U^T. Directions with d ~ 0 carry no capacitance: they have no inertia, so at any finite
//     frequency they follow the rest statically (Guyan / static condensation, common practice in structural
//     dynamics): K_zr x_r + K_zz x_z = 0, x_z = -K_zz^+ K_zr x_r. Their own modes sit at infinite frequency
//     and are not returned; `infinite` counts them.
//  2. The condensed pencil S y = w^2 diag(d_r) y, S = K_rr - K_rz K_zz^+ K_zr, becomes the standard symmetric
//     problem D^-1/2 S D^-1/2 z = w^2 z.
//  3. The embedding doubles every eigenvalue; each real eigenvector [a; b] is the complex eigenvector a + ib,
//     and the two copies are complex multiples of each other, so each run of (near) equal values keeps half
//     as many C-orthonormal complex vectors (pivoted Gram-Schmidt in the C inner product).
// Directions with neither capacitance nor inductance (null in both C and K) are indeterminate and dropped
// through the pseudo-inverse; K positive semi-definite guarantees they do not couple to the rest.
import { symmetricEigen } from './dense-symmetric-eigen.js';
import { complexBasisFromEmbedded } from './hermitian-basis.js';
import { realEmbedding, type ComplexDense } from './hermitian-embedding.js';

export interface HermitianModes {
  /** Finite eigenvalues w^2, ascending; one per complex mode (rank of C entries). */
  omega2: Float64Array;
  /** Eigenvectors, n rows by omega2.length columns, row-major: column k belongs to omega2[k].
   *  C-orthonormal (x^H C x = 1), phase chosen so the largest-magnitude entry is real and positive. */
  vectors: ComplexDense;
  /** How many of the n degrees of freedom have no capacitance (modes at infinite frequency). */
  infinite: number;
}

export interface HermitianPencilOptions {
  /** Eigenvalues of C below this fraction of its largest count as zero (default 1e-11). */
  rankTolerance?: number;
  /** Eigenvalues w^2 closer than this, relative to the largest, are treated as one degenerate cluster (default 1e-9). */
  clusterTolerance?: number;
}

export function hermitianPencilModes(
  n: number,
  K: ComplexDense,
  C: ComplexDense,
  options: HermitianPencilOptions = {},
): HermitianModes {
  const rankTol = options.rankTolerance ?? 1e-11;
  const clusterTol = options.clusterTolerance ?? 1e-9;
  const N = 2 * n;
  const Ke = realEmbedding(n, K);
  const Ce = realEmbedding(n, C);

  const c = symmetricEigen(N, Ce);
  const cScale = maxAbs(c.values);
  // Embedded eigenvalues come in equal pairs; deciding per pair keeps the rank even (a whole complex direction).
  const range: number[] = [];
  const nullSpace: number[] = [];
  for (let p = 0; p < n; p++) {
    const mean = 0.5 * (c.values[2 * p] + c.values[2 * p + 1]);
    (cScale > 0 && mean > rankTol * cScale ? range : nullSpace).push(2 * p, 2 * p + 1);
  }
  const r = range.length;
  const m = r / 2;
  if (m === 0) return { omega2: new Float64Array(0), vectors: { re: new Float64Array(0), im: new Float64Array(0) }, infinite: n };

  const Kt = congruence(N, Ke, c.vectors);
  const z = nullSpace.length;
  const Krr = block(N, Kt, range, range);
  // P = K_zz^+ K_zr, the static response of the capacitance-free directions to the others.
  const P = z > 0 ? pseudoSolve(z, block(N, Kt, nullSpace, nullSpace), block(N, Kt, nullSpace, range), r, maxAbs(Kt)) : new Float64Array(0);
  if (z > 0) {
    const Krz = block(N, Kt, range, nullSpace);
    for (let i = 0; i < r; i++)
      for (let k = 0; k < z; k++) {
        const a = Krz[i * z + k];
        if (a !== 0) for (let j = 0; j < r; j++) Krr[i * r + j] -= a * P[k * r + j];
      }
  }
  const invSqrtD = Float64Array.from(range, (col) => 1 / Math.sqrt(c.values[col]));
  const A = new Float64Array(r * r);
  for (let i = 0; i < r; i++)
    for (let j = 0; j < r; j++) A[i * r + j] = 0.5 * (Krr[i * r + j] + Krr[j * r + i]) * invSqrtD[i] * invSqrtD[j];
  const s = symmetricEigen(r, A);

  // Real eigenvectors of the embedded pencil, back in the original 2n coordinates.
  const real = (col: number): Float64Array => {
    const y = new Float64Array(r);
    for (let i = 0; i < r; i++) y[i] = s.vectors[i * r + col] * invSqrtD[i];
    const x = new Float64Array(N);
    for (let i = 0; i < r; i++) addColumn(N, x, c.vectors, range[i], y[i]);
    for (let k = 0; k < z; k++) {
      let xz = 0;
      for (let j = 0; j < r; j++) xz -= P[k * r + j] * y[j];
      addColumn(N, x, c.vectors, nullSpace[k], xz);
    }
    return x;
  };

  const omega2 = new Float64Array(m);
  const out = { re: new Float64Array(n * m), im: new Float64Array(n * m) };
  const wScale = maxAbs(s.values);
  let p = 0;
  while (p < m) {
    // Extend the cluster while the next pair starts within the tolerance of the current one's end.
    let q = p + 1;
    while (q < m && s.values[2 * q] - s.values[2 * q - 1] <= clusterTol * wScale) q++;
    const candidates: Float64Array[] = [];
    for (let col = 2 * p; col < 2 * q; col++) candidates.push(real(col));
    const basis = complexBasisFromEmbedded(n, C, candidates, q - p);
    for (let k = p; k < q; k++) {
      omega2[k] = 0.5 * (s.values[2 * k] + s.values[2 * k + 1]);
      const v = basis[k - p];
      for (let i = 0; i < n; i++) {
        out.re[i * m + k] = v.re[i];
        out.im[i * m + k] = v.im[i];
      }
    }
    p = q;
  }
  return { omega2, vectors: out, infinite: n - m };
}

/** U^T A U for square N-by-N row-major A and U. */
function congruence(N: number, A: Float64Array, U: Float64Array): Float64Array {
  const AU = new Float64Array(N * N);
  for (let i = 0; i < N; i++)
    for (let k = 0; k < N; k++) {
      const a = A[i * N + k];
      if (a !== 0) for (let j = 0; j < N; j++) AU[i * N + j] += a * U[k * N + j];
    }
  const out = new Float64Array(N * N);
  for (let k = 0; k < N; k++)
    for (let i = 0; i < N; i++) {
      const u = U[k * N + i];
      if (u !== 0) for (let j = 0; j < N; j++) out[i * N + j] += u * AU[k * N + j];
    }
  return out;
}

/** The submatrix of rows `rows` and columns `cols` of an N-by-N row-major matrix. */
function block(N: number, A: Float64Array, rows: number[], cols: number[]): Float64Array {
  const out = new Float64Array(rows.length * cols.length);
  rows.forEach((ri, i) => cols.forEach((cj, j) => (out[i * cols.length + j] = A[ri * N + cj])));
  return out;
}

/**
 * X = A^+ B for symmetric positive semi-definite z-by-z A and z-by-r B, dropping eigenvalues of A below
 * 1e-12 of `scale` (the size of the whole K): those directions have neither capacitance nor inductance.
 */
function pseudoSolve(z: number, A: Float64Array, B: Float64Array, r: number, scale: number): Float64Array {
  const e = symmetricEigen(z, A);
  const cut = 1e-12 * scale;
  // X = V diag(1/mu) V^T B over the kept eigenvalues.
  const VtB = new Float64Array(z * r);
  for (let k = 0; k < z; k++)
    for (let i = 0; i < z; i++) {
      const v = e.vectors[i * z + k];
      for (let j = 0; j < r; j++) VtB[k * r + j] += v * B[i * r + j];
    }
  const X = new Float64Array(z * r);
  for (let k = 0; k < z; k++) {
    const mu = e.values[k];
    if (!(mu > cut)) continue;
    for (let i = 0; i < z; i++) {
      const v = e.vectors[i * z + k] / mu;
      for (let j = 0; j < r; j++) X[i * r + j] += v * VtB[k * r + j];
    }
  }
  return X;
}

function addColumn(N: number, x: Float64Array, U: Float64Array, col: number, scale: number): void {
  if (scale !== 0) for (let i = 0; i < N; i++) x[i] += scale * U[i * N + col];
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}
