// The fit against networks known in closed form. The readings come from the handbook formulas evaluated
// with mathjs complex arithmetic (an outside reference library), never from the project's engine; the fit
// must give back the values the readings were made with.
import { add, complex, divide, multiply, type Complex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { fitBoard, type FitResult } from '../../../src/analysis/fit.js';
import type { Reading } from '../../../src/analysis/readings.js';
import { GROUND } from '../../../src/board/types.js';
import { GaussianNoise } from '../../../simulators/bench-physics-noise.js';
import { makeBoard } from '../../support/make-board.js';

const NOISE = 1e-5;

function readingsFrom(formula: (omega: number) => Complex, node: string, frequencies: number[], seed: number): Reading[] {
  const noise = new GaussianNoise(seed);
  return frequencies.map((f, i) => {
    const z = formula(2 * Math.PI * f);
    const sigma = NOISE * Math.hypot(z.re, z.im);
    return {
      step: 1, point: i, kind: 'to-ground', hi: node, lo: 'gnd', frequency_hz: f,
      re: z.re + sigma * noise.next(), im: z.im + sigma * noise.next(), pred_re: 0, pred_im: 0, flag: 'ok',
    };
  });
}

function spaced(from: number, to: number, count: number): number[] {
  return Array.from({ length: count }, (_, i) => from * (to / from) ** (i / (count - 1)));
}

function valueOf(fit: FitResult, label: string) {
  const p = fit.parameters.find((q) => q.label === label);
  expect(p, label).toBeDefined();
  return p!;
}

/** |fitted - true| within 4σ and within `relative` of the true value. */
function expectRecovered(fit: FitResult, label: string, truth: number, relative = 1e-4) {
  const p = valueOf(fit, label);
  expect(Math.abs(p.value - truth), label).toBeLessThan(4 * p.sigma);
  expect(Math.abs(p.value / truth - 1), label).toBeLessThan(relative);
}

describe('parallel LC tank with coil resistance', () => {
  // Z = (r + jωL) / (1 + jωC(r + jωL)): a coil L with winding resistance r in parallel with C (common
  // practice; any circuit-theory handbook).
  const L = 22e-6;
  const C = 43e-9;
  const r = 0.276;
  const tank = (omega: number) => {
    const coil = complex(r, omega * L);
    return divide(coil, add(complex(1, 0), multiply(complex(0, omega * C), coil))) as Complex;
  };
  const f0 = 1 / (2 * Math.PI * Math.sqrt(L * C));
  // The board as designed is off by 9 % in L, 7 % in C and 80 % in r.
  const board = makeBoard('tank', [
    ['L', 'top', GROUND, 20e-6, 0.5],
    ['C', 'top', GROUND, 40e-9],
  ]);
  const readings = readingsFrom(tank, 'top', [...spaced(0.6 * f0, 1.6 * f0, 60), ...spaced(0.98 * f0, 1.02 * f0, 21)], 21);

  it('returns L, C and r', () => {
    const fit = fitBoard(board, readings, { parts: ['L1', 'C2'], inductorResistance: { form: 'ohms' } });
    expect(fit.converged, fit.message).toBe(true);
    expectRecovered(fit, 'L1', L);
    expectRecovered(fit, 'C2', C);
    expectRecovered(fit, 'inductor series resistance', r, 1e-3);
    expect(fit.noise.relative / NOISE).toBeGreaterThan(0.8);
    expect(fit.noise.relative / NOISE).toBeLessThan(1.2);
  });

  it('returns the coil Q at resonance as ω0L/r (common practice)', () => {
    const fit = fitBoard(board, readings, { parts: ['L1', 'C2'], inductorResistance: { form: 'q', atHz: f0 } });
    expect(fit.converged, fit.message).toBe(true);
    expectRecovered(fit, `inductor Q at ${(f0 / 1e3).toPrecision(4)} kHz`, (2 * Math.PI * f0 * L) / r, 1e-3);
  });
});

describe('series RLC', () => {
  // Z = R + jωL + 1/(jωC); f0 = 1/(2π√(LC)), where Z(f0) = R (any circuit-theory handbook).
  const R = 4.7;
  const L = 22e-6;
  const C = 33e-9;
  const series = (omega: number) => add(complex(R, omega * L), divide(complex(1, 0), complex(0, omega * C))) as Complex;
  const f0 = 1 / (2 * Math.PI * Math.sqrt(L * C));
  const board = makeBoard('series-rlc', [
    ['R', 'in', 'm1', 3.9],
    ['L', 'm1', 'm2', 20e-6],
    ['C', 'm2', GROUND, 36e-9],
  ]);
  const readings = readingsFrom(series, 'in', spaced(0.5 * f0, 2 * f0, 50), 22);

  it('returns R, L and C, so f0 and Z(f0) = R come out as the handbook says', () => {
    const fit = fitBoard(board, readings, { parts: ['R1', 'L2', 'C3'] });
    expect(fit.converged, fit.message).toBe(true);
    expectRecovered(fit, 'R1', R);
    expectRecovered(fit, 'L2', L);
    expectRecovered(fit, 'C3', C);
    const [r, l, c] = ['R1', 'L2', 'C3'].map((ref) => fit.board.parts.find((p) => p.ref === ref)!.value);
    const fittedF0 = 1 / (2 * Math.PI * Math.sqrt(l * c));
    expect(fittedF0 / f0).toBeCloseTo(1, 5);
    const omega = 2 * Math.PI * fittedF0;
    const atF0 = add(complex(r, omega * l), divide(complex(1, 0), complex(0, omega * c))) as Complex;
    expect(atF0.re / R).toBeCloseTo(1, 4);
    expect(Math.abs(atF0.im)).toBeLessThan(1e-6);
  });

  it('scales the covariance by the residual variance, whatever noise is given', () => {
    const quiet = fitBoard(board, readings, { parts: ['R1', 'L2', 'C3'] });
    const loud = fitBoard(board, readings, { parts: ['R1', 'L2', 'C3'] }, { noise: { relative: 10 * NOISE } });
    // Same readings, one noise estimated and one given 10 times too large: cov = (JᵀJ)⁻¹ s² takes the
    // scale from the residuals, so the two uncertainties agree (the weights are uniform in both).
    expect(valueOf(loud, 'R1').sigma / valueOf(quiet, 'R1').sigma).toBeCloseTo(1, 3);
    // s² compares the noise the residuals show with the noise given (common practice: χ²/dof).
    expect(quiet.residualVariance).toBeCloseTo(1, 9);
    expect(loud.residualVariance / (quiet.noise.relative / (10 * NOISE)) ** 2).toBeCloseTo(1, 3);
  });
});
