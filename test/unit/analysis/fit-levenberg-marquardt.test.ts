// The least-squares machinery on problems with known answers: Rosenbrock's valley, a straight-line fit
// with its closed-form uncertainties, a Jacobian that points the wrong way, and a rank-deficient one.
import { lusolve, multiply, transpose } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { levenbergMarquardt, normalMatrix, type LeastSquaresProblem } from '../../../src/analysis/fit-levenberg-marquardt.js';
import { covarianceFromJacobian } from '../../../src/analysis/fit-covariance.js';

/** Builds a problem from a residual function and its Jacobian (row-major). */
function problem(P: number, residuals: (t: Float64Array) => number[], jacobian: (t: Float64Array) => number[]): LeastSquaresProblem {
  return {
    parameterCount: P,
    residuals: (t) => Float64Array.from(residuals(t)),
    residualsAndJacobian: (t) => ({ residuals: Float64Array.from(residuals(t)), jacobian: Float64Array.from(jacobian(t)) }),
  };
}

describe('Levenberg–Marquardt', () => {
  it("finds the minimum of Rosenbrock's function at (1, 1) from (-1.2, 1)", () => {
    // r = (10(y - x²), 1 - x): H. Rosenbrock, Comput. J. 3, 175 (1960); the standard start (-1.2, 1)
    // (Moré, Garbow, Hillstrom, ACM TOMS 7, 17 (1981), problem 1; from memory).
    const rosenbrock = problem(
      2,
      ([x, y]) => [10 * (y - x * x), 1 - x],
      ([x]) => [-20 * x, 10, -1, 0],
    );
    const result = levenbergMarquardt(rosenbrock, Float64Array.of(-1.2, 1));
    expect(result.converged, result.stop).toBe(true);
    expect(result.theta[0]).toBeCloseTo(1, 8);
    expect(result.theta[1]).toBeCloseTo(1, 8);
    expect(result.cost).toBeLessThan(1e-20);
    expect(result.iterations).toBeGreaterThan(3);
  });

  it('solves a linear least-squares problem as the normal equations do (mathjs lusolve as reference)', () => {
    const A = [
      [1, 0.5, 2],
      [1, 1.5, -1],
      [1, 2.5, 0.3],
      [1, 3.5, 1.7],
      [1, 4.5, -0.4],
    ];
    const b = [2.1, 0.4, 3.3, 5.9, 4.2];
    const linear = problem(
      3,
      (t) => A.map((row, i) => row[0] * t[0] + row[1] * t[1] + row[2] * t[2] - b[i]),
      () => A.flat(),
    );
    const result = levenbergMarquardt(linear, Float64Array.of(0, 0, 0));
    const At = transpose(A);
    const reference = lusolve(multiply(At, A), multiply(At, b)) as unknown as number[][];
    for (let m = 0; m < 3; m++) expect(result.theta[m]).toBeCloseTo(reference[m][0], 9);
    expect(result.converged).toBe(true);
  });

  it('stops without claiming convergence when no step goes downhill', () => {
    // A Jacobian of the wrong sign sends every step uphill, however strongly damped.
    const wrong = problem(
      1,
      ([t]) => [t - 3],
      () => [-1],
    );
    const result = levenbergMarquardt(wrong, Float64Array.of(0));
    expect(result.converged).toBe(false);
    expect(result.stop).toBe('no-downhill-step');
    expect(result.theta[0]).toBe(0);
  });

  it('stops at the iteration limit without claiming convergence', () => {
    const rosenbrock = problem(2, ([x, y]) => [10 * (y - x * x), 1 - x], ([x]) => [-20 * x, 10, -1, 0]);
    const result = levenbergMarquardt(rosenbrock, Float64Array.of(-1.2, 1), { maxIterations: 3 });
    expect(result.converged).toBe(false);
    expect(result.stop).toBe('iteration-limit');
    expect(result.iterations).toBe(3);
  });
});

describe('normal matrix', () => {
  it('equals JᵀJ as mathjs computes it, for row counts that do and do not divide by four', () => {
    let seed = 7;
    const next = () => ((seed = (seed * 16807) % 2147483647) / 2147483647) - 0.5; // Park–Miller (from memory)
    for (const [rows, P] of [[9, 5], [12, 3], [1, 4]]) {
      const J = Array.from({ length: rows }, () => Array.from({ length: P }, () => (next() > 0.3 ? 0 : next())));
      const ours = normalMatrix(Float64Array.from(J.flat()), rows, P);
      const reference = multiply(transpose(J), J) as number[][];
      for (let i = 0; i < P; i++) for (let j = 0; j < P; j++) expect(ours[i * P + j]).toBeCloseTo(reference[i][j], 14);
    }
  });
});

describe('uncertainties from the Jacobian', () => {
  it('match the closed form of a straight-line fit', () => {
    // y = a + b x: var(b) = s²/Σ(x - x̄)², var(a) = s² Σx²/(n Σ(x - x̄)²) (common practice, linear regression).
    const x = [0, 1, 2, 3, 4, 5, 6];
    const n = x.length;
    const mean = x.reduce((s, v) => s + v, 0) / n;
    const sxx = x.reduce((s, v) => s + (v - mean) ** 2, 0);
    const s2 = 0.37;
    const cov = covarianceFromJacobian(Float64Array.from(x.flatMap((v) => [1, v])), n, 2, s2);
    expect(cov.sigma[1] ** 2).toBeCloseTo(s2 / sxx, 12);
    expect(cov.sigma[0] ** 2).toBeCloseTo((s2 * x.reduce((s, v) => s + v * v, 0)) / (n * sxx), 12);
    // cov(a, b) = -x̄ s²/Σ(x - x̄)².
    expect(cov.matrix[1]).toBeCloseTo((-mean * s2) / sxx, 12);
    expect(cov.identifiable).toEqual([true, true]);
  });

  it('call a parameter the readings cannot tell from another not identifiable', () => {
    // Two equal columns: only their sum is fixed; a third, independent one still is.
    const rows = [
      [1, 1, 0.5],
      [2, 2, -1],
      [3, 3, 0.2],
      [4, 4, 1],
    ];
    const cov = covarianceFromJacobian(Float64Array.from(rows.flat()), 4, 3, 1);
    expect(cov.identifiable).toEqual([false, false, true]);
    expect(cov.sigma[0]).toBe(Infinity);
    expect(Number.isFinite(cov.sigma[2])).toBe(true);
  });
});
