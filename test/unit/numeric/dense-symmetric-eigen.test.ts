// Dense symmetric eigen-solver against mathjs eigs and textbook spectra.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { symmetricEigen } from '../../../src/numeric/dense-symmetric-eigen.js';
import { seededRandom } from './helpers.js';

function randomSymmetric(n: number, rand: () => number, scale = 1): Float64Array {
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const v = scale * (2 * rand() - 1);
      a[i * n + j] = v;
      a[j * n + i] = v;
    }
  }
  return a;
}

function toRows(n: number, a: Float64Array): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
}

function frobenius(a: Float64Array): number {
  return Math.sqrt(a.reduce((s, v) => s + v * v, 0));
}

/** max_k ‖A v_k − λ_k v_k‖∞ and max |VᵀV − I|. */
function eigenDefects(n: number, a: Float64Array, values: Float64Array, vectors: Float64Array): { residual: number; orthogonality: number } {
  let residual = 0;
  let orthogonality = 0;
  for (let k = 0; k < n; k++) {
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += a[i * n + j] * vectors[j * n + k];
      residual = Math.max(residual, Math.abs(s - values[k] * vectors[i * n + k]));
    }
    for (let l = 0; l < n; l++) {
      let s = 0;
      for (let i = 0; i < n; i++) s += vectors[i * n + k] * vectors[i * n + l];
      orthogonality = Math.max(orthogonality, Math.abs(s - (k === l ? 1 : 0)));
    }
  }
  return { residual, orthogonality };
}

describe('symmetricEigen', () => {
  it.each([1, 2, 3, 5, 8, 13, 30, 64])('random symmetric n=%i agrees with mathjs eigs', (n) => {
    const rand = seededRandom(100 + n);
    const a = randomSymmetric(n, rand);
    const { values, vectors } = symmetricEigen(n, a);
    // reference: mathjs eigs (symmetric real input)
    const ref = (math.eigs(toRows(n, a)).values as unknown as number[]).slice().sort((x, y) => x - y);
    const norm = frobenius(a);
    for (let k = 0; k < n; k++) expect(Math.abs(values[k] - ref[k])).toBeLessThan(1e-12 * norm);
    for (let k = 1; k < n; k++) expect(values[k]).toBeGreaterThanOrEqual(values[k - 1]);
    const { residual, orthogonality } = eigenDefects(n, a, values, vectors);
    expect(residual).toBeLessThan(1e-13 * norm);
    expect(orthogonality).toBeLessThan(1e-13);
  });

  it('reproduces the spectrum of the [-1 2 -1] tridiagonal matrix', () => {
    // handbook: eigenvalues of tridiag(-1, 2, -1) of order n are 2 − 2cos(kπ/(n+1)), k = 1..n
    const n = 40;
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = 2;
      if (i + 1 < n) a[i * n + i + 1] = a[(i + 1) * n + i] = -1;
    }
    const { values } = symmetricEigen(n, a);
    for (let k = 1; k <= n; k++) expect(values[k - 1]).toBeCloseTo(2 - 2 * Math.cos((k * Math.PI) / (n + 1)), 13);
  });

  it('handles repeated eigenvalues (a graph Laplacian of a complete graph)', () => {
    // common practice: the Laplacian of the complete graph K_n has eigenvalue 0 once and n (n − 1 times)
    const n = 9;
    const a = new Float64Array(n * n).fill(-1);
    for (let i = 0; i < n; i++) a[i * n + i] = n - 1;
    const { values, vectors } = symmetricEigen(n, a);
    expect(values[0]).toBeCloseTo(0, 13);
    for (let k = 1; k < n; k++) expect(values[k]).toBeCloseTo(n, 13);
    const { residual, orthogonality } = eigenDefects(n, a, values, vectors);
    expect(residual).toBeLessThan(1e-13 * n);
    expect(orthogonality).toBeLessThan(1e-13);
  });

  it('handles the zero matrix, a diagonal matrix and a matrix that is already tridiagonal-split', () => {
    const z = symmetricEigen(4, new Float64Array(16));
    expect(Array.from(z.values)).toEqual([0, 0, 0, 0]);
    expect(eigenDefects(4, new Float64Array(16), z.values, z.vectors).orthogonality).toBeLessThan(1e-15);
    const d = Float64Array.from([3, 0, 0, 0, -1, 0, 0, 0, 2]);
    const dd = symmetricEigen(3, d);
    expect(Array.from(dd.values)).toEqual([-1, 2, 3]);
    // Two decoupled 2×2 blocks. reference: mathjs eigs
    const b = Float64Array.from([1, 2, 0, 0, 2, 1, 0, 0, 0, 0, 5, 1e-3, 0, 0, 1e-3, 5]);
    const ref = (math.eigs(toRows(4, b)).values as unknown as number[]).slice().sort((x, y) => x - y);
    const bb = symmetricEigen(4, b);
    ref.forEach((v, k) => expect(bb.values[k]).toBeCloseTo(v, 13));
  });

  it('keeps a small residual on a badly scaled matrix', () => {
    const n = 20;
    const rand = seededRandom(7);
    const a = randomSymmetric(n, rand);
    // D A D with D spanning 8 decades.
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * n + j] *= 10 ** ((8 * i) / n) * 10 ** ((8 * j) / n);
    const { values, vectors } = symmetricEigen(n, a);
    const { residual, orthogonality } = eigenDefects(n, a, values, vectors);
    expect(residual).toBeLessThan(1e-13 * frobenius(a));
    expect(orthogonality).toBeLessThan(1e-12);
    // reference: mathjs eigs
    const ref = (math.eigs(toRows(n, a)).values as unknown as number[]).slice().sort((x, y) => x - y);
    ref.forEach((v, k) => expect(Math.abs(values[k] - v)).toBeLessThan(1e-12 * frobenius(a)));
  });

  it('reads only the upper triangle', () => {
    const n = 6;
    const rand = seededRandom(8);
    const a = randomSymmetric(n, rand);
    const junk = a.slice();
    for (let i = 0; i < n; i++) for (let j = 0; j < i; j++) junk[i * n + j] = 99 * rand();
    expect(Array.from(symmetricEigen(n, junk).values)).toEqual(Array.from(symmetricEigen(n, a).values));
  });

  it('fixes the sign of each eigenvector: largest entry positive', () => {
    const n = 10;
    const { vectors } = symmetricEigen(n, randomSymmetric(n, seededRandom(9)));
    for (let k = 0; k < n; k++) {
      let big = 0;
      for (let i = 0; i < n; i++) if (Math.abs(vectors[i * n + k]) > Math.abs(vectors[big * n + k])) big = i;
      expect(vectors[big * n + k]).toBeGreaterThan(0);
    }
  });
});
