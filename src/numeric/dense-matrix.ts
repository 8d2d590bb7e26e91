// Small dense row-major kernels for the mode solver. Loop orders keep the innermost access contiguous.

/** C = A B with A m×k and B k×n. */
export function multiply(m: number, k: number, n: number, a: Float64Array, b: Float64Array): Float64Array {
  const c = new Float64Array(m * n);
  for (let i = 0; i < m; i++) {
    const ci = i * n;
    for (let p = 0; p < k; p++) {
      const aip = a[i * k + p];
      if (aip === 0) continue;
      const bp = p * n;
      for (let j = 0; j < n; j++) c[ci + j] += aip * b[bp + j];
    }
  }
  return c;
}

/** C = Aᵀ B with A k×m and B k×n. */
export function transposeMultiply(k: number, m: number, n: number, a: Float64Array, b: Float64Array): Float64Array {
  const c = new Float64Array(m * n);
  for (let p = 0; p < k; p++) {
    const ap = p * m;
    const bp = p * n;
    for (let i = 0; i < m; i++) {
      const api = a[ap + i];
      if (api === 0) continue;
      const ci = i * n;
      for (let j = 0; j < n; j++) c[ci + j] += api * b[bp + j];
    }
  }
  return c;
}

/**
 * Lower Cholesky factor of a symmetric matrix (upper triangle read through symmetry of the input), or
 * null when a pivot falls to minPivot or below: the matrix is then treated as singular.
 */
export function choleskyLower(n: number, a: Float64Array, minPivot: number): Float64Array | null {
  const l = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    const lj = j * n;
    let d = a[lj + j];
    for (let p = 0; p < j; p++) d -= l[lj + p] * l[lj + p];
    if (!(d > minPivot)) return null;
    const root = Math.sqrt(d);
    l[lj + j] = root;
    for (let i = j + 1; i < n; i++) {
      const li = i * n;
      let s = a[j * n + i];
      for (let p = 0; p < j; p++) s -= l[li + p] * l[lj + p];
      l[li + j] = s / root;
    }
  }
  return l;
}

/** Inverse of a lower-triangular matrix (also lower triangular). */
export function invertLower(n: number, l: Float64Array): Float64Array {
  const inv = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    inv[j * n + j] = 1 / l[j * n + j];
    for (let i = j + 1; i < n; i++) {
      let s = 0;
      const li = i * n;
      for (let p = j; p < i; p++) s += l[li + p] * inv[p * n + j];
      inv[li + j] = -s / l[li + i];
    }
  }
  return inv;
}
