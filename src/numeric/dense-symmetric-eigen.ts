// Dense real symmetric eigen-decomposition: Householder reduction to tridiagonal form, then implicit QL
// iterations with Wilkinson-type shifts on the tridiagonal matrix, rotating the eigenvector basis along.
//
// Layout choice: the basis is kept transposed (row i = basis vector i) so that both the Householder
// accumulation and every plane rotation touch contiguous rows, which matters for n in the hundreds.

export interface SymmetricEigen {
  /** Eigenvalues, ascending. */
  values: Float64Array;
  /** Row-major n×n; column k is the unit eigenvector of values[k]. */
  vectors: Float64Array;
}

/**
 * Eigenvalues and orthonormal eigenvectors of a symmetric matrix given row-major. Only the upper triangle
 * is read. Each eigenvector's sign is fixed so that its largest-magnitude entry is positive.
 */
export function symmetricEigen(n: number, a: Float64Array): SymmetricEigen {
  if (a.length !== n * n) throw new RangeError(`expected ${n * n} entries, got ${a.length}`);
  for (let i = 0; i < a.length; i++) {
    if (!Number.isFinite(a[i])) throw new RangeError(`matrix entry ${i} is not finite`);
  }
  if (n === 0) return { values: new Float64Array(0), vectors: new Float64Array(0) };
  const diag = new Float64Array(n);
  const off = new Float64Array(n); // off[i] couples i and i+1
  const basisT = tridiagonalize(n, a, diag, off);
  tridiagonalQl(n, diag, off, basisT);

  const order = Array.from({ length: n }, (_, k) => k).sort((x, y) => diag[x] - diag[y]);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    const src = order[k];
    values[k] = diag[src];
    const row = src * n;
    let norm2 = 0;
    let big = 0;
    for (let i = 0; i < n; i++) {
      const v = basisT[row + i];
      norm2 += v * v;
      if (Math.abs(v) > Math.abs(basisT[row + big])) big = i;
    }
    const scale = (basisT[row + big] < 0 ? -1 : 1) / Math.sqrt(norm2);
    for (let i = 0; i < n; i++) vectors[i * n + k] = basisT[row + i] * scale;
  }
  return { values, vectors };
}

/**
 * Reduce A to tridiagonal T = Qᵀ A Q with Householder reflections H_k (acting on indices k+1..n-1, built
 * from row k). Returns Qᵀ row-major and fills the diagonal and off-diagonal of T.
 */
function tridiagonalize(n: number, a: Float64Array, diag: Float64Array, off: Float64Array): Float64Array {
  // Work on the upper triangle of a copy: w[i*n+j] for j >= i.
  const w = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) w[i * n + j] = a[i * n + j];
  const betas = new Float64Array(n);
  const p = new Float64Array(n);

  for (let k = 0; k < n - 2; k++) {
    const rowK = k * n;
    // The reflector maps x = A[k, k+1:] to alpha·e1; v is stored over x in row k.
    let scale = 0;
    for (let j = k + 1; j < n; j++) scale = Math.max(scale, Math.abs(w[rowK + j]));
    if (scale === 0) {
      betas[k] = 0;
      off[k] = 0;
      diag[k] = w[rowK + k];
      continue;
    }
    let sigma = 0;
    for (let j = k + 1; j < n; j++) {
      const t = w[rowK + j] / scale;
      sigma += t * t;
    }
    const x0 = w[rowK + k + 1];
    const alpha = -(x0 >= 0 ? 1 : -1) * scale * Math.sqrt(sigma);
    w[rowK + k + 1] = x0 - alpha;
    // beta = 2 / (vᵀv) with vᵀv = 2 alpha (alpha - x0), no cancellation by the choice of sign.
    const beta = 1 / (alpha * (alpha - x0));
    betas[k] = beta;
    diag[k] = w[rowK + k];
    off[k] = alpha;

    // p = beta · A22 v, using only the upper triangle of A22 (indices k+1..n-1).
    for (let i = k + 1; i < n; i++) p[i] = 0;
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      const vi = w[rowK + i];
      let s = w[rowI + i] * vi;
      for (let j = i + 1; j < n; j++) {
        const aij = w[rowI + j];
        s += aij * w[rowK + j];
        p[j] += aij * vi;
      }
      p[i] += s;
    }
    let pv = 0;
    for (let i = k + 1; i < n; i++) {
      p[i] *= beta;
      pv += p[i] * w[rowK + i];
    }
    // A22 ← A22 − v qᵀ − q vᵀ with q = p − (beta pᵀv / 2) v.
    const half = 0.5 * beta * pv;
    for (let i = k + 1; i < n; i++) p[i] -= half * w[rowK + i];
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      const vi = w[rowK + i];
      const qi = p[i];
      for (let j = i; j < n; j++) w[rowI + j] -= vi * p[j] + qi * w[rowK + j];
    }
  }
  if (n >= 2) {
    diag[n - 2] = w[(n - 2) * n + n - 2];
    off[n - 2] = w[(n - 2) * n + n - 1];
  }
  diag[n - 1] = w[(n - 1) * n + n - 1];
  off[n - 1] = 0;

  // Qᵀ = H_{n-3} ⋯ H_0, built as M ← M H_k for k descending; M H_k only changes columns k+1.. of rows
  // k+1.. (the rows above are still identity there).
  const qt = new Float64Array(n * n);
  for (let i = 0; i < n; i++) qt[i * n + i] = 1;
  for (let k = n - 3; k >= 0; k--) {
    const beta = betas[k];
    if (beta === 0) continue;
    const rowK = k * n;
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      let s = 0;
      for (let j = k + 1; j < n; j++) s += qt[rowI + j] * w[rowK + j];
      s *= beta;
      if (s === 0) continue;
      for (let j = k + 1; j < n; j++) qt[rowI + j] -= s * w[rowK + j];
    }
  }
  return qt;
}

/**
 * Implicit QL on the symmetric tridiagonal (diag, off), accumulating rotations into the rows of basisT.
 * On return diag holds the eigenvalues (unsorted) and row i of basisT the eigenvector of diag[i].
 */
function tridiagonalQl(n: number, diag: Float64Array, off: Float64Array, basisT: Float64Array): void {
  const eps = Number.EPSILON;
  for (let l = 0; l < n; l++) {
    for (let sweeps = 0; ; sweeps++) {
      // Find the first negligible coupling at or after l: the block l..m is unreduced.
      let m = l;
      while (m < n - 1 && Math.abs(off[m]) > eps * (Math.abs(diag[m]) + Math.abs(diag[m + 1]))) m++;
      if (m === l) break;
      if (sweeps >= 60) throw new Error('symmetricEigen: QL iteration did not converge');

      // Shift: the eigenvalue of the leading 2×2 block closer to diag[l].
      const theta = (diag[l + 1] - diag[l]) / (2 * off[l]);
      const r0 = Math.hypot(theta, 1);
      let g = diag[m] - diag[l] + off[l] / (theta + (theta >= 0 ? r0 : -r0));
      let s = 1;
      let c = 1;
      let shiftCarry = 0;
      let i = m - 1;
      let underflow = false;
      // Chase the bulge from the bottom of the block up to l with plane rotations.
      for (; i >= l; i--) {
        const f = s * off[i];
        const b = c * off[i];
        const r = Math.hypot(f, g);
        off[i + 1] = r;
        if (r === 0) {
          // The rotation is trivial: the block splits; undo the partial shift and start over.
          diag[i + 1] -= shiftCarry;
          off[m] = 0;
          underflow = true;
          break;
        }
        s = f / r;
        c = g / r;
        const h = diag[i + 1] - shiftCarry;
        const t = (diag[i] - h) * s + 2 * c * b;
        shiftCarry = s * t;
        diag[i + 1] = h + shiftCarry;
        g = c * t - b;
        rotateRows(basisT, n, i, i + 1, c, s);
      }
      if (underflow) continue;
      diag[l] -= shiftCarry;
      off[l] = g;
      off[m] = 0;
    }
  }
}

/** Rows i and j of the transposed basis ← the plane rotation that the QL step applied to columns i, j. */
function rotateRows(m: Float64Array, n: number, i: number, j: number, c: number, s: number): void {
  const ri = i * n;
  const rj = j * n;
  for (let k = 0; k < n; k++) {
    const x = m[ri + k];
    const y = m[rj + k];
    m[rj + k] = s * x + c * y;
    m[ri + k] = c * x - s * y;
  }
}
