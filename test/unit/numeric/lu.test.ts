// Sparse complex LU (factor, refactor, solves) checked against mathjs dense lusolve.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { complexFromTriplets, complexMatVec } from '../../../src/numeric/csc.js';
import { analyzeLu } from '../../../src/numeric/lu-symbolic.js';
import { factorLu, refactorLu, SingularMatrixError } from '../../../src/numeric/lu-numeric.js';
import { solveLu, solveLuMany, solveLuTransposed } from '../../../src/numeric/lu-solve.js';
import { estimateReciprocalCondition, relativeResidual } from '../../../src/numeric/condition.js';
import type { ComplexCsc } from '../../../src/numeric/types.js';
import {
  mathjsSolve,
  randomComplexMatrix,
  randomComplexVector,
  relativeDifference,
  seededRandom,
  toMathjs,
  vectorFromMathjs,
  vectorToMathjs,
} from './helpers.js';

/** LC ladder: C from every node to ground, L between neighbours and from node 0 to ground. */
function ladder(n: number, omega: number, c: number, l: number): ComplexCsc {
  const rows: number[] = [];
  const cols: number[] = [];
  const re: number[] = [];
  const im: number[] = [];
  const add = (i: number, j: number, y: number) => {
    rows.push(i);
    cols.push(j);
    re.push(0);
    im.push(y);
  };
  for (let i = 0; i < n; i++) add(i, i, omega * c);
  add(0, 0, -1 / (omega * l));
  for (let i = 0; i + 1 < n; i++) {
    const y = -1 / (omega * l); // 1/(jωL) = −j/(ωL)
    add(i, i, y);
    add(i + 1, i + 1, y);
    add(i, i + 1, -y);
    add(i + 1, i, -y);
  }
  return complexFromTriplets(n, rows, cols, re, im);
}

/** Exact 1-norm reciprocal condition from a dense inverse. reference: mathjs inv, norm */
function exactReciprocalCondition(A: ComplexCsc): number {
  const M = toMathjs(A);
  return 1 / ((math.norm(M, 1) as number) * (math.norm(math.inv(M), 1) as number));
}

describe('factorLu + solveLu', () => {
  it.each([
    [1, 5, 0.6, false],
    [2, 12, 0.3, false],
    [3, 25, 0.15, false],
    [4, 40, 0.08, false],
    [5, 12, 0.3, true],
    [6, 30, 0.1, true],
    [7, 60, 0.05, true],
  ])('seed %i: n=%i, density %f, symmetric=%s, agrees with mathjs lusolve', (seed, n, density, symmetric) => {
    const rand = seededRandom(seed);
    const A = randomComplexMatrix(n, rand, { density, symmetric });
    const b = randomComplexVector(n, rand);
    const f = factorLu(analyzeLu(A), A);
    const x = solveLu(f, b);
    // reference: mathjs lusolve
    expect(relativeDifference(x, mathjsSolve(A, b))).toBeLessThan(1e-9);
    expect(relativeResidual(A, x, b)).toBeLessThan(1e-13);
    expect(f.refactored).toBe(false);
  });

  it('handles matrices without a diagonal (every pivot off the diagonal)', () => {
    const rand = seededRandom(11);
    const A = randomComplexMatrix(20, rand, { density: 0.15, noDiagonal: true });
    const b = randomComplexVector(20, rand);
    const f = factorLu(analyzeLu(A), A);
    expect(f.offDiagonalPivots).toBeGreaterThan(0);
    // reference: mathjs lusolve
    expect(relativeDifference(solveLu(f, b), mathjsSolve(A, b))).toBeLessThan(1e-9);
  });

  it('plain partial pivoting (tolerance 1) also agrees with mathjs', () => {
    const rand = seededRandom(12);
    const A = randomComplexMatrix(30, rand, { density: 0.12 });
    const b = randomComplexVector(30, rand);
    const f = factorLu(analyzeLu(A), A, { pivotTolerance: 1 });
    // reference: mathjs lusolve
    expect(relativeDifference(solveLu(f, b), mathjsSolve(A, b))).toBeLessThan(1e-9);
  });

  it('keeps diagonal pivots on a diagonally dominant symmetric matrix', () => {
    const rand = seededRandom(13);
    const A = randomComplexMatrix(40, rand, { density: 0.1, symmetric: true, diagonalWeight: 3 });
    const f = factorLu(analyzeLu(A), A);
    expect(f.offDiagonalPivots).toBe(0);
    // Diagonal pivots on a symmetric pattern: the factors of the permuted matrix have mirror patterns.
    expect(f.nnzL).toBe(f.nnzU);
    expect(Array.from(f.rowOrder)).toEqual(Array.from(f.colOrder));
  });

  it('solveLuMany matches one solve per right-hand side', () => {
    const rand = seededRandom(14);
    const A = randomComplexMatrix(15, rand, { density: 0.2 });
    const f = factorLu(analyzeLu(A), A);
    const rhs = [randomComplexVector(15, rand), randomComplexVector(15, rand), randomComplexVector(15, rand)];
    const many = solveLuMany(f, rhs);
    rhs.forEach((b, k) => {
      // reference: mathjs lusolve
      expect(relativeDifference(many[k], mathjsSolve(A, b))).toBeLessThan(1e-9);
    });
  });

  it('rejects a matrix whose pattern differs from the analyzed one', () => {
    const rand = seededRandom(15);
    const A = randomComplexMatrix(10, rand, { density: 0.2 });
    const B = randomComplexMatrix(10, rand, { density: 0.4 });
    expect(() => factorLu(analyzeLu(A), B)).toThrow(/pattern/);
  });
});

describe('solveLuTransposed', () => {
  it.each([
    [21, false],
    [22, false],
    [23, true],
    [24, true],
  ])('seed %i: solves Aᵀ x = b (plain transpose) like mathjs, no diagonal: %s', (seed, noDiagonal) => {
    const rand = seededRandom(seed);
    const A = randomComplexMatrix(25, rand, { density: 0.12, noDiagonal });
    const b = randomComplexVector(25, rand);
    const f = factorLu(analyzeLu(A), A);
    if (noDiagonal) expect(f.offDiagonalPivots).toBeGreaterThan(0); // rowOrder ≠ colOrder matters here
    const x = solveLuTransposed(f, b);
    // reference: mathjs lusolve on mathjs transpose (no conjugation)
    expect(relativeDifference(x, mathjsSolve(A, b, true))).toBeLessThan(1e-9);
    // and it is not the conjugate-transpose solve. reference: mathjs ctranspose
    const M = toMathjs(A);
    const xh = vectorFromMathjs(math.lusolve(math.ctranspose(M) as math.Complex[][], vectorToMathjs(b)));
    expect(relativeDifference(x, xh)).toBeGreaterThan(1e-3);
  });
});

describe('near-singular matrices', () => {
  it('LC ladder within 1e-9 of a resonance: small residual, tiny rcond, agrees with mathjs', () => {
    const n = 12;
    const c = 10e-9;
    const l = 22e-6;
    // Resonances are ω² = eig(K)/C with K the ladder's inverse-inductance matrix. reference: mathjs eigs
    const K = Array.from({ length: n }, (_, i) =>
      Array.from({ length: n }, (_, j) => {
        if (i === j) return ((i > 0 ? 1 : 0) + (i < n - 1 ? 1 : 0) + (i === 0 ? 1 : 0)) / l;
        return Math.abs(i - j) === 1 ? -1 / l : 0;
      }),
    );
    const eig = (math.eigs(K).values as unknown as number[]).slice().sort((a, b) => a - b);
    const resonance = Math.sqrt(eig[3] / c);
    const omega = resonance * (1 + 1e-9);
    const A = ladder(n, omega, c, l);
    const rand = seededRandom(31);
    const b = randomComplexVector(n, rand);
    const f = factorLu(analyzeLu(A), A);
    const x = solveLu(f, b);
    expect(relativeResidual(A, x, b)).toBeLessThan(1e-12);
    const rcond = estimateReciprocalCondition(f, A);
    expect(rcond).toBeLessThan(1e-7);
    // Hager's estimate bounds ‖A⁻¹‖₁ from below, so rcond is over-estimated, but only by a small factor.
    // reference: mathjs inv
    const exact = exactReciprocalCondition(A);
    expect(rcond).toBeGreaterThanOrEqual(exact * (1 - 1e-6));
    expect(rcond).toBeLessThan(10 * exact);
    // With condition ~1e9 the two solvers may differ by ~1e9·eps relative. reference: mathjs lusolve
    expect(relativeDifference(x, mathjsSolve(A, b))).toBeLessThan(1e-5);
  });

  it('a tiny diagonal forces an off-diagonal pivot and the solve stays accurate', () => {
    const rand = seededRandom(32);
    const A = randomComplexMatrix(20, rand, { density: 0.2, symmetric: true });
    // Make the diagonal of a column with off-diagonal entries negligible and eliminate that column first,
    // so the pivot candidate is the raw entry.
    let first = 0;
    while (A.colPtr[first + 1] - A.colPtr[first] < 2) first++;
    const order = [first, ...Array.from(analyzeLu(A).colOrder).filter((j) => j !== first)];
    const sym = analyzeLu(A, { ordering: Int32Array.from(order) });
    for (let p = A.colPtr[first]; p < A.colPtr[first + 1]; p++) {
      if (A.rowIdx[p] === first) {
        A.re[p] = 1e-14;
        A.im[p] = 0;
      }
    }
    const f = factorLu(sym, A);
    expect(f.offDiagonalPivots).toBeGreaterThan(0);
    expect(f.rowOrder[0]).not.toBe(first);
    const b = randomComplexVector(20, rand);
    const x = solveLu(f, b);
    expect(relativeResidual(A, x, b)).toBeLessThan(1e-13);
    // reference: mathjs lusolve
    expect(relativeDifference(x, mathjsSolve(A, b))).toBeLessThan(1e-8);
  });
});

describe('refactorLu', () => {
  it('on a new frequency equals a fresh factorization', () => {
    const n = 15;
    const A1 = ladder(n, 2 * Math.PI * 150e3, 10e-9, 22e-6);
    const A2 = ladder(n, 2 * Math.PI * 170e3, 10e-9, 22e-6);
    const sym = analyzeLu(A1);
    const f1 = factorLu(sym, A1);
    const r = refactorLu(f1, A2);
    expect(r.refactored).toBe(true);
    expect(r.refactorRejectedAt).toBe(-1);
    const fresh = factorLu(sym, A2);
    const b = randomComplexVector(n, seededRandom(41));
    const xr = solveLu(r, b);
    // reference: mathjs lusolve
    expect(relativeDifference(xr, mathjsSolve(A2, b))).toBeLessThan(1e-9);
    expect(relativeDifference(xr, solveLu(fresh, b))).toBeLessThan(1e-12);
    expect(relativeDifference(solveLuTransposed(r, b), mathjsSolve(A2, b, true))).toBeLessThan(1e-9);
    // The earlier factors are untouched (a sweep may still be reading them).
    expect(relativeDifference(solveLu(f1, b), mathjsSolve(A1, b))).toBeLessThan(1e-9);
  });

  it('replays off-diagonal pivots on random nonsymmetric values with the same pattern', () => {
    const rand = seededRandom(42);
    const A1 = randomComplexMatrix(30, rand, { density: 0.1, noDiagonal: true });
    const f1 = factorLu(analyzeLu(A1), A1);
    // Perturb values a little: the old pivot order stays acceptable.
    const A2: ComplexCsc = { ...A1, re: A1.re.map((v) => v * (1 + 0.01 * (rand() - 0.5))), im: A1.im.slice() };
    const r = refactorLu(f1, A2);
    expect(r.refactored).toBe(true);
    const b = randomComplexVector(30, rand);
    // reference: mathjs lusolve
    expect(relativeDifference(solveLu(r, b), mathjsSolve(A2, b))).toBeLessThan(1e-9);
  });

  it.each([
    ['to zero', 0],
    ['to a tiny value', 1e-12],
  ])('falls back to factorLu when a reused pivot collapses %s', (_label, value) => {
    const rand = seededRandom(43);
    const A1 = randomComplexMatrix(20, rand, { density: 0.2, symmetric: true, diagonalWeight: 2 });
    const sym = analyzeLu(A1);
    const f1 = factorLu(sym, A1);
    // The first pivot is the entry itself, so zeroing it in A2 collapses the replayed pivot at step 0.
    const first = sym.colOrder[0];
    expect(f1.rowOrder[0]).toBe(first);
    const A2: ComplexCsc = { ...A1, re: A1.re.slice(), im: A1.im.slice() };
    for (let p = A2.colPtr[first]; p < A2.colPtr[first + 1]; p++) {
      if (A2.rowIdx[p] === first) {
        A2.re[p] = value;
        A2.im[p] = 0;
      }
    }
    const r = refactorLu(f1, A2);
    expect(r.refactored).toBe(false);
    expect(r.refactorRejectedAt).toBe(0);
    expect(r.rowOrder[0]).not.toBe(first);
    const b = randomComplexVector(20, rand);
    // reference: mathjs lusolve
    expect(relativeDifference(solveLu(r, b), mathjsSolve(A2, b))).toBeLessThan(1e-9);
  });

  it('detects a collapse in a later step (a Schur complement going to zero)', () => {
    // [[a, 1, 0], [1, d, 1], [0, 1, 3]] in natural order: the second pivot is d − 1/a, with 1 below it.
    // New values with d = 1/a + 1e-13 leave a replayed pivot of 1e-13 against 1: unacceptable.
    const rows = [0, 1, 0, 1, 2, 1, 2];
    const cols = [0, 0, 1, 1, 1, 2, 2];
    const build = (a: number, d: number) => complexFromTriplets(3, rows, cols, [a, 1, 1, d, 1, 1, 3], new Array(7).fill(0));
    const A1 = build(2, 3);
    const sym = analyzeLu(A1, { ordering: 'natural' });
    const f1 = factorLu(sym, A1);
    expect(f1.offDiagonalPivots).toBe(0);
    const A2 = build(4, 0.25 + 1e-13);
    const r = refactorLu(f1, A2);
    expect(r.refactorRejectedAt).toBe(1);
    expect(r.refactored).toBe(false);
    expect(r.rowOrder[1]).toBe(2); // the fresh search swaps rows 1 and 2
    const b = { re: Float64Array.of(1, 2, 3), im: Float64Array.of(0, 1, 0) };
    // reference: mathjs lusolve
    expect(relativeDifference(solveLu(r, b), mathjsSolve(A2, b))).toBeLessThan(1e-9);
  });
});

describe('SingularMatrixError', () => {
  it('names the original index of an all-zero row and column', () => {
    const rand = seededRandom(51);
    const A = randomComplexMatrix(12, rand, { density: 0.3, symmetric: true, diagonalWeight: 2 });
    const node = 7;
    for (let j = 0; j < 12; j++) {
      for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) {
        if (j === node || A.rowIdx[p] === node) {
          A.re[p] = 0;
          A.im[p] = 0;
        }
      }
    }
    const sym = analyzeLu(A);
    expect(sym.colOrder[0]).not.toBe(node); // the error index must be mapped back, not the step
    let caught: unknown;
    try {
      factorLu(sym, A);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(SingularMatrixError);
    const err = caught as SingularMatrixError;
    expect(err.index).toBe(node);
    expect(err.kind).toBe('numerical');
    expect(sym.colOrder[err.step]).toBe(node);
  });

  it('reports a structurally empty column by its original index', () => {
    const n = 6;
    const rows = [0, 1, 2, 3, 5, 1, 0];
    const cols = [0, 1, 2, 3, 5, 0, 1];
    const A = complexFromTriplets(n, rows, cols, [2, 2, 2, 2, 2, 1, 1], [0, 0, 0, 0, 0, 0, 0]);
    expect(() => factorLu(analyzeLu(A), A)).toThrow(SingularMatrixError);
    try {
      factorLu(analyzeLu(A), A);
    } catch (e) {
      expect((e as SingularMatrixError).index).toBe(4);
      expect((e as SingularMatrixError).kind).toBe('structural');
    }
  });

  it('flags a floating pair joined by one inductor (an exactly singular Laplacian block)', () => {
    // Nodes 0-1-2 grounded chain plus nodes 3, 4 joined only to each other: [[g, −g], [−g, g]].
    const g = 0.25;
    const rows = [0, 1, 2, 0, 1, 1, 2, 3, 4, 3, 4];
    const cols = [0, 1, 2, 1, 0, 2, 1, 3, 4, 4, 3];
    const re = [3, 3, 3, -1, -1, -1, -1, g, g, -g, -g];
    const A = complexFromTriplets(5, rows, cols, re, new Array(11).fill(0));
    const sym = analyzeLu(A);
    let err: SingularMatrixError | undefined;
    try {
      factorLu(sym, A);
    } catch (e) {
      err = e as SingularMatrixError;
    }
    expect(err).toBeInstanceOf(SingularMatrixError);
    expect([3, 4]).toContain(err!.index);
    expect(sym.colOrder[err!.step]).toBe(err!.index);
  });

  it('propagates from a refactorization that falls back on a singular matrix', () => {
    const A1 = complexFromTriplets(2, [0, 1, 0, 1], [0, 0, 1, 1], [2, 1, 1, 3], [0, 0, 0, 0]);
    const f1 = factorLu(analyzeLu(A1), A1);
    const A2 = complexFromTriplets(2, [0, 1, 0, 1], [0, 0, 1, 1], [1, 1, 1, 1], [0, 0, 0, 0]);
    expect(() => refactorLu(f1, A2)).toThrow(SingularMatrixError);
  });
});

describe('the matrix-vector product used for residuals', () => {
  it('matches mathjs multiply', () => {
    const rand = seededRandom(61);
    const A = randomComplexMatrix(9, rand, { density: 0.4 });
    const x = randomComplexVector(9, rand);
    const y = complexMatVec(A, x);
    // reference: mathjs multiply
    const ref = math.multiply(toMathjs(A), Array.from(x.re, (r, i) => math.complex(r, x.im[i]))) as unknown as math.Complex[];
    ref.forEach((z, i) => {
      expect(y.re[i]).toBeCloseTo(z.re, 12);
      expect(y.im[i]).toBeCloseTo(z.im, 12);
    });
  });
});
