// Undoing the doubling of the real embedding: the real eigenvectors [a; b] of the embedded problem are the
// complex eigenvectors a + ib, but each complex direction arrives twice (as x and as ix), mixed arbitrarily
// with the others of the same eigenvalue. This picks one C-orthonormal complex basis out of them.
import { complexDot, complexMatVec, type ComplexDense } from './hermitian-embedding.js';

/**
 * From 2s real embedded vectors spanning an s-dimensional complex eigenspace, s C-orthonormal complex
 * vectors: pivoted modified Gram-Schmidt, always taking the candidate with the largest remaining C-norm
 * (the partner copy of a chosen vector is left with a zero remainder and never picked).
 */
export function complexBasisFromEmbedded(n: number, C: ComplexDense, realVectors: Float64Array[], s: number): ComplexDense[] {
  const cands = realVectors.map((x) => {
    const re = x.slice(0, n);
    const im = x.slice(n, 2 * n);
    return { re, im, c: complexMatVec(n, C, re, im) };
  });
  const basis: ComplexDense[] = [];
  const used = new Set<number>();
  for (let step = 0; step < s; step++) {
    let best = -1;
    let bestNorm = -Infinity;
    cands.forEach((u, k) => {
      if (used.has(k)) return;
      const norm2 = complexDot(u.re, u.im, u.c.re, u.c.im).re;
      if (norm2 > bestNorm) [best, bestNorm] = [k, norm2];
    });
    used.add(best);
    const q = cands[best];
    const scale = 1 / Math.sqrt(Math.max(bestNorm, Number.MIN_VALUE));
    for (const arr of [q.re, q.im, q.c.re, q.c.im]) for (let i = 0; i < n; i++) arr[i] *= scale;
    cands.forEach((u, k) => {
      if (used.has(k)) return;
      const a = complexDot(q.re, q.im, u.c.re, u.c.im); // q^H C u
      subtractMultiple(u.re, u.im, q.re, q.im, a);
      subtractMultiple(u.c.re, u.c.im, q.c.re, q.c.im, a);
    });
    basis.push(fixPhase(q.re, q.im));
  }
  return basis;
}

/** u -= a q for complex a. */
function subtractMultiple(uRe: Float64Array, uIm: Float64Array, qRe: Float64Array, qIm: Float64Array, a: { re: number; im: number }): void {
  for (let i = 0; i < uRe.length; i++) {
    uRe[i] -= a.re * qRe[i] - a.im * qIm[i];
    uIm[i] -= a.re * qIm[i] + a.im * qRe[i];
  }
}

/** Rotate the vector's global phase so its largest-magnitude entry is real and positive (repeatable output). */
function fixPhase(re: Float64Array, im: Float64Array): ComplexDense {
  let k = 0;
  for (let i = 1; i < re.length; i++) if (Math.hypot(re[i], im[i]) > Math.hypot(re[k], im[k])) k = i;
  const mag = Math.hypot(re[k], im[k]);
  const cr = mag > 0 ? re[k] / mag : 1;
  const ci = mag > 0 ? -im[k] / mag : 0;
  const outRe = new Float64Array(re.length);
  const outIm = new Float64Array(re.length);
  for (let i = 0; i < re.length; i++) {
    outRe[i] = re[i] * cr - im[i] * ci;
    outIm[i] = re[i] * ci + im[i] * cr;
  }
  outIm[k] = 0;
  return { re: outRe, im: outIm };
}
