// Lossless modes of an LC board: the symmetric pencil K x = ω² C x, with K the inverse-inductance
// Laplacian and C the capacitance Laplacian, both positive semidefinite and either possibly singular.
//
// Directions with no capacitance (nodes without capacitors, or a capacitor network floating as a whole)
// carry no kinetic energy: their frequency is infinite, and they follow the others statically. They are
// removed by static condensation on K; if K is singular there too (nodes tied only by resistors, which
// the lossless model drops), a pseudo-inverse leaves those directions at rest. What remains is a standard
// symmetric eigenproblem. Directions with no inductance give ω² = 0 and are reported as such.
import { symmetricEigen } from './dense-symmetric-eigen.js';
import { choleskyLower, invertLower, multiply, transposeMultiply } from './dense-matrix.js';

export interface ModeOptions {
  /** Relative size below which a capacitance (or condensed stiffness) direction counts as zero. Default 1e-10. */
  nullTolerance?: number;
  /** |ω²| below this fraction of the largest ω² is reported as exactly 0. Default 1e-9. */
  zeroTolerance?: number;
}

export interface GeneralizedModes {
  /** Finite ω² (rad²/s²), ascending; m = n − infiniteCount of them. */
  omega2: Float64Array;
  /** √ω² (rad/s); NaN where ω² < 0, which a positive semidefinite K cannot give. */
  omega: Float64Array;
  /** Row-major n×m; column k is the shape of mode k on all n nodes, unit 2-norm, largest entry positive. */
  vectors: Float64Array;
  /** Directions eliminated for having no capacitance (infinite frequency). */
  infiniteCount: number;
  /** Of those, directions with neither capacitance nor inductance (the pencil is singular there). */
  indeterminateCount: number;
}

/** Modes of K x = ω² C x for dense row-major symmetric K, C (n×n). */
export function generalizedModes(
  n: number,
  K: Float64Array,
  C: Float64Array,
  options: ModeOptions = {},
): GeneralizedModes {
  if (K.length !== n * n || C.length !== n * n) throw new RangeError(`K and C must have ${n * n} entries`);
  const nullTol = options.nullTolerance ?? 1e-10;
  const zeroTol = options.zeroTolerance ?? 1e-9;
  const k = symmetrized(n, K);
  const c = symmetrized(n, C);

  const cScale = maxAbs(c);
  const kScale = maxAbs(k);
  // Nodes with no capacitance at all are condensed directly (exact, and it shrinks the dense work).
  const capacitive: number[] = [];
  const inert: number[] = [];
  for (let i = 0; i < n; i++) {
    let rowMax = 0;
    for (let j = 0; j < n; j++) rowMax = Math.max(rowMax, Math.abs(c[i * n + j]));
    (cScale > 0 && rowMax > nullTol * cScale ? capacitive : inert).push(i);
  }
  const nc = capacitive.length;
  const ccc = submatrix(n, c, capacitive, capacitive);

  // Range basis B of C_cc with Bᵀ C_cc B = I, and a basis N of its null space.
  let range: Float64Array; // nc × r
  let nullBasis: Float64Array; // nc × (nc − r)
  let r: number;
  const chol = nc > 0 ? choleskyLower(nc, ccc, nullTol * cScale) : null;
  if (chol || nc === 0) {
    r = nc;
    range = chol ? transpose(nc, nc, invertLower(nc, chol)) : new Float64Array(0);
    nullBasis = new Float64Array(0);
  } else {
    // C_cc singular (e.g. a capacitor network not tied to ground): split it by its eigenvectors.
    const eig = symmetricEigen(nc, ccc);
    const top = eig.values[nc - 1];
    const keep: number[] = [];
    const drop: number[] = [];
    for (let t = 0; t < nc; t++) (eig.values[t] > nullTol * top ? keep : drop).push(t);
    r = keep.length;
    range = new Float64Array(nc * r);
    nullBasis = new Float64Array(nc * drop.length);
    for (let i = 0; i < nc; i++) {
      keep.forEach((t, col) => (range[i * r + col] = eig.vectors[i * nc + t] / Math.sqrt(eig.values[t])));
      drop.forEach((t, col) => (nullBasis[i * drop.length + col] = eig.vectors[i * nc + t]));
    }
  }

  // Full change of variables x = T [y; ζ]: y on the capacitive range, ζ on everything without capacitance.
  const nn = n - r;
  const nullCols = nc - r;
  const T = new Float64Array(n * n);
  capacitive.forEach((node, i) => {
    for (let col = 0; col < r; col++) T[node * n + col] = range[i * r + col];
    for (let col = 0; col < nullCols; col++) T[node * n + r + col] = nullBasis[i * nullCols + col];
  });
  inert.forEach((node, t) => (T[node * n + r + nullCols + t] = 1));
  const kt = transposeMultiply(n, n, n, T, multiply(n, n, n, k, T));

  // Static condensation: ζ = −K_nn⁺ K_nr y, S = K_rr − K_rn K_nn⁺ K_nr.
  const krr = block(n, kt, 0, r, 0, r);
  let condense: Float64Array = new Float64Array(0); // nn × r, the map y → −ζ
  let indeterminate = 0;
  if (nn > 0 && r > 0) {
    const knn = block(n, kt, r, nn, r, nn);
    const knr = block(n, kt, r, nn, 0, r);
    const { pinv, nullity } = pseudoInverse(nn, knn, nullTol * Math.max(kScale, Number.MIN_VALUE));
    indeterminate = nullity;
    condense = multiply(nn, nn, r, pinv, knr);
    const krn = block(n, kt, 0, r, r, nn);
    const correction = multiply(r, nn, r, krn, condense);
    for (let t = 0; t < r * r; t++) krr[t] -= correction[t];
  } else if (nn > 0) {
    indeterminate = pseudoInverse(nn, block(n, kt, r, nn, r, nn), nullTol * Math.max(kScale, Number.MIN_VALUE)).nullity;
  }

  const eig = symmetricEigen(r, krr);
  const omega2 = eig.values;
  let top = 0;
  for (let t = 0; t < r; t++) top = Math.max(top, Math.abs(omega2[t]));
  for (let t = 0; t < r; t++) if (Math.abs(omega2[t]) <= zeroTol * top) omega2[t] = 0;
  const omega = omega2.map((w2) => (w2 >= 0 ? Math.sqrt(w2) : NaN));

  // Node shapes: x = (T_r − T_n · condense) y for each eigenvector y.
  const shapeMap = new Float64Array(n * r);
  for (let i = 0; i < n; i++) {
    for (let col = 0; col < r; col++) {
      let v = T[i * n + col];
      for (let t = 0; t < nn; t++) v -= T[i * n + r + t] * condense[t * r + col];
      shapeMap[i * r + col] = v;
    }
  }
  const vectors = multiply(n, r, r, shapeMap, eig.vectors);
  normalizeColumns(n, r, vectors);
  return { omega2, omega, vectors, infiniteCount: n - r, indeterminateCount: indeterminate };
}

/** Σ|x|⁴ / (Σ|x|²)²: 1/N for a mode spread evenly over N nodes, 1 for a mode on one node; NaN for 0. */
export function inverseParticipationRatio(vector: ArrayLike<number> | { re: ArrayLike<number>; im: ArrayLike<number> }): number {
  let s2 = 0;
  let s4 = 0;
  if ('re' in vector) {
    for (let i = 0; i < vector.re.length; i++) {
      const m2 = vector.re[i] * vector.re[i] + vector.im[i] * vector.im[i];
      s2 += m2;
      s4 += m2 * m2;
    }
  } else {
    for (let i = 0; i < vector.length; i++) {
      const m2 = vector[i] * vector[i];
      s2 += m2;
      s4 += m2 * m2;
    }
  }
  return s2 === 0 ? NaN : s4 / (s2 * s2);
}

/** Column k of a row-major n×m mode matrix. */
export function modeShape(modes: GeneralizedModes, k: number): Float64Array {
  const n = modes.vectors.length / Math.max(modes.omega2.length, 1);
  const m = modes.omega2.length;
  const out = new Float64Array(m === 0 ? 0 : n);
  for (let i = 0; i < out.length; i++) out[i] = modes.vectors[i * m + k];
  return out;
}

function pseudoInverse(n: number, a: Float64Array, absTol: number): { pinv: Float64Array; nullity: number } {
  const eig = symmetricEigen(n, a);
  let top = 0;
  for (let t = 0; t < n; t++) top = Math.max(top, Math.abs(eig.values[t]));
  const cut = Math.max(absTol, 1e-13 * top);
  const pinv = new Float64Array(n * n);
  let nullity = 0;
  for (let t = 0; t < n; t++) {
    const lambda = eig.values[t];
    if (Math.abs(lambda) <= cut) {
      nullity++;
      continue;
    }
    for (let i = 0; i < n; i++) {
      const vi = eig.vectors[i * n + t] / lambda;
      if (vi === 0) continue;
      for (let j = 0; j < n; j++) pinv[i * n + j] += vi * eig.vectors[j * n + t];
    }
  }
  return { pinv, nullity };
}

function symmetrized(n: number, a: Float64Array): Float64Array {
  const s = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const v = a[i * n + j];
      if (!Number.isFinite(v)) throw new RangeError(`matrix entry (${i}, ${j}) is not finite`);
      s[i * n + j] = 0.5 * (v + a[j * n + i]);
    }
  }
  return s;
}

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (let t = 0; t < a.length; t++) m = Math.max(m, Math.abs(a[t]));
  return m;
}

function submatrix(n: number, a: Float64Array, rows: number[], cols: number[]): Float64Array {
  const out = new Float64Array(rows.length * cols.length);
  rows.forEach((i, r) => cols.forEach((j, c) => (out[r * cols.length + c] = a[i * n + j])));
  return out;
}

function block(n: number, a: Float64Array, r0: number, rows: number, c0: number, cols: number): Float64Array {
  const out = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) out[i * cols + j] = a[(r0 + i) * n + c0 + j];
  return out;
}

function transpose(rows: number, cols: number, a: Float64Array): Float64Array {
  const out = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) out[j * rows + i] = a[i * cols + j];
  return out;
}

function normalizeColumns(n: number, m: number, v: Float64Array): void {
  for (let col = 0; col < m; col++) {
    let norm2 = 0;
    let big = 0;
    for (let i = 0; i < n; i++) {
      const x = v[i * m + col];
      norm2 += x * x;
      if (Math.abs(x) > Math.abs(v[big * m + col])) big = i;
    }
    if (norm2 === 0) continue;
    const scale = (v[big * m + col] < 0 ? -1 : 1) / Math.sqrt(norm2);
    for (let i = 0; i < n; i++) v[i * m + col] *= scale;
  }
}
