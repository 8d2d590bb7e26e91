// Triplet assembly and the basic products/norms of complex CSC matrices, against mathjs.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import {
  complexCscToDense,
  complexFromTriplets,
  complexMatVec,
  complexMatVecTransposed,
  complexNorm1,
  complexNormInf,
  symmetricAdjacency,
} from '../../../src/numeric/csc.js';
import { randomComplexMatrix, randomComplexVector, seededRandom, toMathjs } from './helpers.js';

describe('complexFromTriplets', () => {
  it('sums duplicates and sorts rows, matching a mathjs dense accumulation', () => {
    const rand = seededRandom(1);
    const n = 7;
    const count = 60; // many repeats on a 7×7 matrix
    const rows: number[] = [];
    const cols: number[] = [];
    const re: number[] = [];
    const im: number[] = [];
    // reference: mathjs complex addition into a dense matrix
    const ref: math.Complex[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(0, 0)));
    for (let t = 0; t < count; t++) {
      const i = Math.floor(rand() * n);
      const j = Math.floor(rand() * n);
      const a = rand() - 0.5;
      const b = rand() - 0.5;
      rows.push(i);
      cols.push(j);
      re.push(a);
      im.push(b);
      ref[i][j] = math.add(ref[i][j], math.complex(a, b)) as math.Complex;
    }
    const A = complexFromTriplets(n, rows, cols, re, im);
    for (let j = 0; j < n; j++) {
      for (let p = A.colPtr[j] + 1; p < A.colPtr[j + 1]; p++) expect(A.rowIdx[p]).toBeGreaterThan(A.rowIdx[p - 1]);
    }
    const d = complexCscToDense(A);
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        expect(d.re[i * n + j]).toBeCloseTo(ref[i][j].re, 14);
        expect(d.im[i * n + j]).toBeCloseTo(ref[i][j].im, 14);
      }
    }
  });

  it('rejects out-of-range indices and mismatched lengths', () => {
    expect(() => complexFromTriplets(2, [0, 2], [0, 0], [1, 1], [0, 0])).toThrow(RangeError);
    expect(() => complexFromTriplets(2, [0], [0, 1], [1], [0])).toThrow(RangeError);
    expect(() => complexFromTriplets(2, [0.5], [0], [1], [0])).toThrow(RangeError);
  });

  it('keeps explicit zeros (a part whose admittance vanishes still holds its place in the pattern)', () => {
    const A = complexFromTriplets(2, [0, 1], [0, 1], [0, 0], [0, 0]);
    expect(A.rowIdx.length).toBe(2);
  });
});

describe('products and norms', () => {
  const rand = seededRandom(2);
  const A = randomComplexMatrix(11, rand, { density: 0.3 });
  const M = toMathjs(A);
  const x = randomComplexVector(11, rand);
  const xm = Array.from(x.re, (r, i) => math.complex(r, x.im[i]));

  it('A x and Aᵀ x match mathjs multiply', () => {
    // reference: mathjs multiply, transpose
    const y = complexMatVec(A, x);
    const yt = complexMatVecTransposed(A, x);
    const ref = math.multiply(M, xm) as unknown as math.Complex[];
    const reft = math.multiply(math.transpose(M), xm) as unknown as math.Complex[];
    for (let i = 0; i < 11; i++) {
      expect(y.re[i]).toBeCloseTo(ref[i].re, 13);
      expect(y.im[i]).toBeCloseTo(ref[i].im, 13);
      expect(yt.re[i]).toBeCloseTo(reft[i].re, 13);
      expect(yt.im[i]).toBeCloseTo(reft[i].im, 13);
    }
  });

  it('1- and ∞-norms match mathjs norm', () => {
    // reference: mathjs norm(A, 1) and norm(A, 'inf')
    expect(complexNorm1(A)).toBeCloseTo(math.norm(M, 1) as number, 13);
    expect(complexNormInf(A)).toBeCloseTo(math.norm(M, 'inf') as number, 13);
  });
});

describe('symmetricAdjacency', () => {
  it('is the off-diagonal pattern of A + Aᵀ', () => {
    const rand = seededRandom(3);
    const A = randomComplexMatrix(13, rand, { density: 0.2 });
    const g = symmetricAdjacency(A);
    const d = complexCscToDense(A);
    const n = 13;
    for (let j = 0; j < n; j++) {
      const listed = new Set(Array.from(g.rowIdx.subarray(g.colPtr[j], g.colPtr[j + 1])));
      for (let i = 0; i < n; i++) {
        const present = i !== j && (d.re[i * n + j] !== 0 || d.im[i * n + j] !== 0 || d.re[j * n + i] !== 0 || d.im[j * n + i] !== 0);
        expect(listed.has(i)).toBe(present);
      }
    }
  });
});
