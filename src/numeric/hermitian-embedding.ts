// The real embedding of a complex Hermitian matrix, and the small complex helpers that go with it.
// A = R + iI (R symmetric, I antisymmetric) acts on x = a + ib like the real symmetric block matrix
// [[R, -I], [I, R]] acts on [a; b], so real symmetric solvers apply to Hermitian problems (each
// eigenvalue of A then appears twice: [a; b] and [-b; a] are the realified x and ix).

/** An n-by-n complex matrix, row-major, real and imaginary parts in separate arrays. */
export interface ComplexDense {
  re: Float64Array;
  im: Float64Array;
}

/** The 2n-by-2n real symmetric embedding [[R, -I], [I, R]] of the Hermitian matrix R + iI, row-major. */
export function realEmbedding(n: number, a: ComplexDense): Float64Array {
  checkSize(n, a);
  const N = 2 * n;
  const out = new Float64Array(N * N);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      // Average with the transpose so that round-off asymmetry in the input cannot leak in.
      const re = 0.5 * (a.re[i * n + j] + a.re[j * n + i]);
      const im = 0.5 * (a.im[i * n + j] - a.im[j * n + i]);
      out[i * N + j] = re;
      out[(i + n) * N + (j + n)] = re;
      out[i * N + (j + n)] = -im;
      out[(i + n) * N + j] = im;
    }
  }
  return out;
}

/** y = A x for a complex n-by-n matrix and complex vector x (given as re/im arrays). */
export function complexMatVec(n: number, a: ComplexDense, xRe: Float64Array, xIm: Float64Array): ComplexDense {
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let sr = 0;
    let si = 0;
    for (let j = 0; j < n; j++) {
      const ar = a.re[i * n + j];
      const ai = a.im[i * n + j];
      sr += ar * xRe[j] - ai * xIm[j];
      si += ar * xIm[j] + ai * xRe[j];
    }
    re[i] = sr;
    im[i] = si;
  }
  return { re, im };
}

/** The Hermitian inner product x^H y, conjugate-linear in x. */
export function complexDot(xRe: Float64Array, xIm: Float64Array, yRe: Float64Array, yIm: Float64Array): { re: number; im: number } {
  let re = 0;
  let im = 0;
  for (let i = 0; i < xRe.length; i++) {
    re += xRe[i] * yRe[i] + xIm[i] * yIm[i];
    im += xRe[i] * yIm[i] - xIm[i] * yRe[i];
  }
  return { re, im };
}

function checkSize(n: number, a: ComplexDense): void {
  if (a.re.length !== n * n || a.im.length !== n * n) {
    throw new RangeError(`expected ${n}x${n} real and imaginary parts, got ${a.re.length} and ${a.im.length} entries`);
  }
}
