// The simulated analyzer's noise: Gaussian on re and im with standard deviation relative·|Z| + floor,
// divided by sqrt(averages) (averaging N independent readings, common practice), repeatable per seed.
// The bounds are sample statistics (common practice): the mean of N draws has standard error σ/sqrt(N),
// a sample standard deviation about σ/sqrt(2N).
import { describe, expect, it } from 'vitest';
import { GROUND } from '../../../src/board/types.js';
import { BenchOptionError, NO_PARASITICS } from '../../../simulators/bench-physics.js';
import { makeBoard } from '../../support/make-board.js';
import { testBench, closeOnly } from '../../support/physics-bench.js';


const resistor = makeBoard('r', [['R', 'x', GROUND, 1000]]);
const map = { nodes: { x: { hi: 1 } }, gnd: { lo: 2 } };
const TRUE_RE = 1000 + 2 * 0.15;
const N = 4000;

function readings(seed: number, averages = 1, relative = 1e-3, floor = 0.5) {
  const bench = testBench(resistor, map, { ...NO_PARASITICS, noise: { relative, floor, seed } });
  closeOnly(bench, 1, 2);
  const re: number[] = [];
  const im: number[] = [];
  for (let i = 0; i < N; i++) {
    const z = bench.value(10e3, 'impedance', averages);
    re.push(z.re - TRUE_RE);
    im.push(z.im);
  }
  return { re, im };
}

const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
const std = (xs: number[]) => {
  const m = mean(xs);
  return Math.sqrt(xs.reduce((s, x) => s + (x - m) ** 2, 0) / (xs.length - 1));
};

describe('noise', () => {
  // σ = 1e-3 · |Z| + 0.5 Ω ≈ 1.5003 Ω
  const sigma = 1e-3 * TRUE_RE + 0.5;

  it('has mean ≈ 0 and the configured standard deviation on re and im', () => {
    const { re, im } = readings(7);
    for (const xs of [re, im]) {
      expect(Math.abs(mean(xs))).toBeLessThan((4.5 * sigma) / Math.sqrt(N));
      expect(Math.abs(std(xs) / sigma - 1)).toBeLessThan(4.5 / Math.sqrt(2 * N));
    }
    // re and im are drawn independently: their correlation is within a few 1/sqrt(N).
    const r = mean(re.map((x, i) => x * im[i])) / (std(re) * std(im));
    expect(Math.abs(r)).toBeLessThan(4.5 / Math.sqrt(N));
  });

  it('shrinks by sqrt(averages)', () => {
    const { re } = readings(7, 16);
    expect(Math.abs(std(re) / (sigma / 4) - 1)).toBeLessThan(4.5 / Math.sqrt(2 * N));
  });

  it('is the same sequence for the same seed and another for another seed', () => {
    const a = readings(11);
    const b = readings(11);
    const c = readings(12);
    expect(b.re).toEqual(a.re);
    expect(b.im).toEqual(a.im);
    expect(c.re.filter((x, i) => x === a.re[i]).length).toBe(0);
  });

  it('is off when relative and floor are zero', () => {
    const { re, im } = readings(3, 1, 0, 0);
    expect(Math.max(...re.map(Math.abs))).toBeLessThan(1e-9);
    expect(Math.max(...im.map(Math.abs))).toBeLessThan(1e-9);
  });

  it('refuses options that make no physical sense, one line naming the option', () => {
    const bad: [object, RegExp][] = [
      [{ contactResistance: 0 }, /^contact resistance must be greater than zero and finite, got 0; /],
      [{ strayCapacitance: -1e-12 }, /^stray capacitance must be zero or more and finite, got -1e-12$/],
      [{ noise: { relative: -1 } }, /^relative noise must be zero or more/],
      [{ noise: { seed: 1.5 } }, /^noise seed must be a whole number, got 1.5$/],
      [{ range: { minOhms: 10, maxOhms: 1 } }, /^range maximum \(1 Ω\) must be above the minimum \(10 Ω\)$/],
      [{ cacheSize: 0 }, /^relay state cache size must be a whole number of at least 1, got 0$/],
    ];
    for (const [options, message] of bad) {
      let caught: unknown;
      try {
        testBench(resistor, map, options);
      } catch (error) {
        caught = error;
      }
      expect(caught).toBeInstanceOf(BenchOptionError);
      expect((caught as Error).message).toMatch(message);
      expect((caught as Error).message).not.toContain('\n');
      expect((caught as BenchOptionError).exitCode).toBe(2);
    }
  });
});
