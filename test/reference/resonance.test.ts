// Resonance and loss checks against handbook formulas.
import { describe, expect, it } from 'vitest';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { predictModes } from '../../src/predict/modes.js';
import { GROUND } from '../../src/board/types.js';
import { makeBoard } from '../support/make-board.js';

describe('series RLC', () => {
  // Any circuit-theory handbook (common practice): f0 = 1 / (2 pi sqrt(L C)); there Z = R, a minimum.
  const R = 4.7;
  const L = 22e-6;
  const C = 33e-9;
  const board = makeBoard('series-rlc', [
    ['R', 'in', 'm1', R],
    ['L', 'm1', 'm2', L],
    ['C', 'm2', GROUND, C],
  ]);
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const f0 = 1 / (2 * Math.PI * Math.sqrt(L * C));

  it('reads exactly R at f0', () => {
    const z = solver.at(f0).toGround('in');
    expect(z.re).toBeCloseTo(R, 9);
    expect(Math.abs(z.im)).toBeLessThan(1e-7);
  });
  it('|Z| is smallest at f0', () => {
    const mag = (f: number) => {
      const z = solver.at(f).toGround('in');
      return Math.hypot(z.re, z.im);
    };
    for (const factor of [0.99, 0.999, 1.001, 1.01]) expect(mag(f0 * factor)).toBeGreaterThan(mag(f0));
  });
});

describe('parallel LC tank with coil resistance', () => {
  // Common practice (from memory): at w0 = 1/sqrt(LC) the tank reads about L / (r C) = Q^2 r, Q = w0 L / r.
  // Exactly: Z(w0) = L/(rC) - j/(w0 C), so the real part is L/(rC) and |Z| differs from it by ~1/(2 Q^2).
  const L = 22e-6;
  const C = 43e-9;
  const r = 0.276;
  const board = makeBoard('tank', [
    ['L', 'top', GROUND, L, r],
    ['C', 'top', GROUND, C],
  ]);
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const w0 = 1 / Math.sqrt(L * C);
  const Q = (w0 * L) / r;

  it('reads L/(rC) = Q^2 r at resonance', () => {
    const z = solver.at(w0 / (2 * Math.PI)).toGround('top');
    expect(z.re / (L / (r * C))).toBeCloseTo(1, 9);
    expect(z.re / (Q * Q * r)).toBeCloseTo(1, 9);
    expect(Math.hypot(z.re, z.im) / (Q * Q * r)).toBeCloseTo(1, 3);
  });

  it('the lossless mode sits at 1/(2 pi sqrt(LC))', () => {
    const { modes } = predictModes(new GroundedLaplacian(board), { count: 1 });
    expect(modes[0].frequency_hz / (w0 / (2 * Math.PI))).toBeCloseTo(1, 10);
  });

  it('a higher-Q coil gives a proportionally higher peak', () => {
    // Q^2 r scaling: halving r doubles the peak's real part (common practice).
    const half = makeBoard('tank2', [
      ['L', 'top', GROUND, L, r / 2],
      ['C', 'top', GROUND, C],
    ]);
    const z1 = solver.at(w0 / (2 * Math.PI)).toGround('top');
    const z2 = new ImpedanceSolver(new GroundedLaplacian(half)).at(w0 / (2 * Math.PI)).toGround('top');
    expect(z2.re / z1.re).toBeCloseTo(2, 9);
  });
});
