// The Hermitian-definite pencil solver against mathjs (an independent reference library): mathjs works
// on the complex matrices directly (complex inv, multiply, eigs, qr), never on our real embedding.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { hermitianPencilModes } from '../../../src/numeric/hermitian-pencil.js';
import type { ComplexDense } from '../../../src/numeric/hermitian-embedding.js';
import { seededRandom } from '../../support/make-board.js';

type Cx = math.Complex;

function fromMathjs(n: number, m: math.Matrix): ComplexDense {
  const re = new Float64Array(n * n);
  const im = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const z = math.complex(m.get([i, j]) as Cx);
      re[i * n + j] = z.re;
      im[i * n + j] = z.im;
    }
  return { re, im };
}

/** B^H B (+ shift I) for a random complex rows-by-n B: Hermitian positive semi-definite of rank <= rows. */
function randomGram(n: number, rows: number, shift: number, rand: () => number): math.Matrix {
  const B = math.matrix(Array.from({ length: rows }, () => Array.from({ length: n }, () => math.complex(rand() - 0.5, rand() - 0.5))));
  const G = math.multiply(math.ctranspose(B), B) as math.Matrix;
  return math.add(G, math.multiply(shift, math.identity(n))) as math.Matrix;
}

/** Real parts of mathjs eigenvalues of a (non-Hermitian) complex matrix, ascending. */
function mathjsEigenvalues(m: math.Matrix): number[] {
  const values = math.eigs(m).values as math.Matrix;
  return (values.toArray() as (number | Cx)[]).map((z) => math.complex(z).re).sort((a, b) => a - b);
}

function column(n: number, m: number, v: ComplexDense, k: number): math.Matrix {
  return math.matrix(Array.from({ length: n }, (_, i) => [math.complex(v.re[i * m + k], v.im[i * m + k])]));
}

const norm = (m: math.MathType) => math.norm(m as math.Matrix, 'fro') as number;

describe('hermitianPencilModes against mathjs', () => {
  it.each([1, 2, 3, 4, 5, 6])('random definite pencil, seed %i', (seed) => {
    const rand = seededRandom(seed);
    const n = 3 + (seed % 4);
    const Km = randomGram(n, n, 0, rand); // positive semi-definite
    const Cm = randomGram(n, n, 0.1, rand); // positive definite
    const K = fromMathjs(n, Km);
    const C = fromMathjs(n, Cm);
    const ours = hermitianPencilModes(n, K, C);

    // Reference: eigenvalues of C^-1 K computed by mathjs on the complex matrices.
    const ref = mathjsEigenvalues(math.multiply(math.inv(Cm), Km) as math.Matrix);
    expect(ours.infinite).toBe(0);
    expect(ours.omega2.length).toBe(n);
    const scale = Math.max(...ref.map(Math.abs));
    ref.forEach((w2, k) => expect(Math.abs(ours.omega2[k] - w2) / scale).toBeLessThan(1e-9));

    // Eigenvectors: residual of K x = w^2 C x and C-orthonormality, evaluated with mathjs arithmetic.
    for (let k = 0; k < n; k++) {
      const x = column(n, n, ours.vectors, k);
      const residual = math.subtract(math.multiply(Km, x), math.multiply(ours.omega2[k], math.multiply(Cm, x)));
      expect(norm(residual) / (norm(Km) * norm(x))).toBeLessThan(1e-10);
      for (let l = 0; l < n; l++) {
        const y = column(n, n, ours.vectors, l);
        const g = math.complex((math.multiply(math.ctranspose(x), math.multiply(Cm, y)) as math.Matrix).get([0, 0]) as Cx);
        expect(Math.abs(g.re - (k === l ? 1 : 0))).toBeLessThan(1e-10);
        expect(Math.abs(g.im)).toBeLessThan(1e-10);
      }
    }
  });

  it.each([7, 8, 9])('singular capacitance: the missing rank goes to infinite frequency, seed %i', (seed) => {
    const rand = seededRandom(seed);
    const n = 6;
    const rank = 3 + (seed % 2);
    const Km = randomGram(n, n, 0.2, rand); // positive definite, so the inverted pencil C x = mu K x is safe
    const Cm = randomGram(n, rank, 0, rand); // rank-deficient
    const ours = hermitianPencilModes(n, fromMathjs(n, Km), fromMathjs(n, Cm));

    // Reference: mu = 1/w^2 are the eigenvalues of K^-1 C (mathjs); mu = 0 is a mode at infinite frequency.
    const mu = mathjsEigenvalues(math.multiply(math.inv(Km), Cm) as math.Matrix);
    const muMax = Math.max(...mu.map(Math.abs));
    const finite = mu.filter((m) => m > 1e-9 * muMax).map((m) => 1 / m).sort((a, b) => a - b);
    expect(finite.length).toBe(rank);
    expect(ours.infinite).toBe(n - rank);
    expect(Array.from(ours.omega2).length).toBe(rank);
    finite.forEach((w2, k) => expect(Math.abs(ours.omega2[k] / w2 - 1)).toBeLessThan(1e-8));
    for (let k = 0; k < rank; k++) {
      const x = column(n, rank, ours.vectors, k);
      const residual = math.subtract(math.multiply(Km, x), math.multiply(ours.omega2[k], math.multiply(Cm, x)));
      expect(norm(residual) / (norm(Km) * norm(x))).toBeLessThan(1e-9);
    }
  });

  it.each([
    [42, [1, 1, 2, 5, 5]],
    [43, [3, 3, 3, 3, 7]],
    [44, [2, 2, 2, 2, 2, 2]],
    [45, [0, 0, 1, 4, 4, 4]],
  ])('repeated eigenvalues keep one independent complex vector per multiplicity, seed %i', (seed, diagonal) => {
    // K = Q diag(...) Q^H with Q unitary from mathjs qr of a random complex matrix; C = I.
    // Spectral theorem (common practice): the eigenvalues are exactly the diagonal.
    const rand = seededRandom(seed);
    const n = diagonal.length;
    const M = math.matrix(Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(rand() - 0.5, rand() - 0.5))));
    const Q = math.qr(M).Q as math.Matrix;
    const D = math.diag(diagonal) as math.Matrix;
    const Km = math.multiply(math.multiply(Q, D), math.ctranspose(Q)) as math.Matrix;
    const I = math.identity(n) as math.Matrix;
    const ours = hermitianPencilModes(n, fromMathjs(n, Km), fromMathjs(n, I));
    diagonal.forEach((w2, k) => expect(ours.omega2[k]).toBeCloseTo(w2, 10));
    // The vectors of the doubled values must be orthonormal (hence independent), not two copies of one.
    const X = math.matrix(Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, k) => math.complex(ours.vectors.re[i * n + k], ours.vectors.im[i * n + k]))));
    const gram = math.multiply(math.ctranspose(X), X);
    expect(norm(math.subtract(gram, I))).toBeLessThan(1e-10);
    expect(norm(math.subtract(math.multiply(Km, X), math.multiply(X, D))) / norm(Km)).toBeLessThan(1e-10);
  });
});
