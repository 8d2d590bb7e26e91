// Condition estimate and residual, against exact values computed with mathjs.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { complexFromTriplets } from '../../../src/numeric/csc.js';
import { analyzeLu } from '../../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../../src/numeric/lu-numeric.js';
import { solveLu } from '../../../src/numeric/lu-solve.js';
import { estimateInverseNorm1, estimateReciprocalCondition, relativeResidual } from '../../../src/numeric/condition.js';
import { randomComplexMatrix, randomComplexVector, seededRandom, toMathjs } from './helpers.js';

describe('estimateReciprocalCondition', () => {
  it('brackets the exact 1-norm value from mathjs inv and is usually spot on', () => {
    const ratios: number[] = [];
    for (let seed = 1; seed <= 12; seed++) {
      const rand = seededRandom(300 + seed);
      const A = randomComplexMatrix(8 + 4 * seed, rand, { density: 0.2, symmetric: seed % 2 === 0 });
      const f = factorLu(analyzeLu(A), A);
      const M = toMathjs(A);
      // reference: mathjs norm(·, 1) and inv
      const inverseNorm = math.norm(math.inv(M), 1) as number;
      const exact = 1 / ((math.norm(M, 1) as number) * inverseNorm);
      const est = estimateReciprocalCondition(f, A);
      // Hager's estimate is a lower bound on ‖A⁻¹‖₁, so rcond is never under-estimated.
      expect(estimateInverseNorm1(f)).toBeLessThanOrEqual(inverseNorm * (1 + 1e-12));
      expect(est).toBeGreaterThanOrEqual(exact * (1 - 1e-12));
      expect(est).toBeLessThan(3 * exact);
      ratios.push(estimateInverseNorm1(f) / inverseNorm);
    }
    // Higham (1988) reports the estimate exact or within a few percent on random matrices (from memory);
    // a wrong ascent direction (Aᵀ instead of Aᴴ in the complex case) loses that.
    expect(Math.min(...ratios)).toBeGreaterThan(0.9);
    expect(ratios.reduce((a, b) => a + b, 0) / ratios.length).toBeGreaterThan(0.97);
  });

  it('is exact for a diagonal matrix: min|d| / max|d|', () => {
    // common practice: κ₁(D) = max|d| / min|d| for diagonal D
    const d = [
      [3, 4],
      [0.5, 0],
      [-2, 1],
      [0, 10],
    ];
    const A = complexFromTriplets(4, [0, 1, 2, 3], [0, 1, 2, 3], d.map((z) => z[0]), d.map((z) => z[1]));
    const f = factorLu(analyzeLu(A), A);
    expect(estimateReciprocalCondition(f, A)).toBeCloseTo(0.5 / 10, 14);
  });
});

describe('relativeResidual', () => {
  it('is at rounding level for a computed solution and matches mathjs for a perturbed one', () => {
    const rand = seededRandom(310);
    const n = 16;
    const A = randomComplexMatrix(n, rand, { density: 0.25 });
    const b = randomComplexVector(n, rand);
    const x = solveLu(factorLu(analyzeLu(A), A), b);
    expect(relativeResidual(A, x, b)).toBeLessThan(4 * Number.EPSILON * n);
    x.re[3] += 1e-3;
    const M = toMathjs(A);
    const xm = Array.from(x.re, (r, i) => math.complex(r, x.im[i]));
    const bm = Array.from(b.re, (r, i) => math.complex(r, b.im[i]));
    // reference: mathjs multiply, subtract, norm(·, 'inf')
    const r = math.norm(math.subtract(math.multiply(M, xm), bm) as math.Complex[], 'inf') as number;
    const scale =
      (math.norm(M, 'inf') as number) * (math.norm(xm, 'inf') as number) + (math.norm(bm, 'inf') as number);
    expect(relativeResidual(A, x, b)).toBeCloseTo(r / scale, 14);
  });
});
