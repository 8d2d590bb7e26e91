// The adaptive sweep grid, on the impedance of a parallel RLC tank: Z = R / (1 + jQ(f/f0 − f0/f)) with
// Q = R·√(C/L) (common practice), whose log changes fastest within a linewidth f0/Q of the resonance.
import { describe, expect, it } from 'vitest';
import { adaptiveGrid, largestLogChange } from '../../../src/plan/adaptive-grid.js';

const f0 = 160e3;
const q = 80;
const tank = (f: number) => {
  const x = q * (f / f0 - f0 / f);
  const d = 1 + x * x;
  return [{ re: 1000 / d, im: (-1000 * x) / d }];
};

describe('adaptiveGrid', () => {
  const window = { lo_hz: 120e3, hi_hz: 200e3 };

  it('is denser within a linewidth of the resonance than in the wings', () => {
    const grid = adaptiveGrid([window], [f0], tank, { initialPoints: 21, maxPoints: 400, maxChange: 0.05 });
    const near = grid.filter((f) => Math.abs(f - f0) < f0 / q).length;
    const wing = grid.filter((f) => f > 180e3 && f < 180e3 + 2 * (f0 / q)).length;
    expect(near).toBeGreaterThan(10 * Math.max(wing, 1));
  });

  it('holds every step of ln Z to the limit when the point budget allows, and keeps the ends and the mode', () => {
    const grid = adaptiveGrid([window], [f0], tank, { initialPoints: 21, maxPoints: 2000, maxChange: 0.05 });
    expect(grid[0]).toBe(window.lo_hz);
    expect(grid[grid.length - 1]).toBe(window.hi_hz);
    expect(grid).toContain(f0);
    for (let i = 1; i < grid.length; i++) {
      expect(grid[i]).toBeGreaterThan(grid[i - 1]);
      expect(largestLogChange(tank(grid[i - 1]), tank(grid[i]))).toBeLessThanOrEqual(0.05);
    }
  });

  it('stops at the point budget', () => {
    const grid = adaptiveGrid([window], [f0], tank, { initialPoints: 21, maxPoints: 60, maxChange: 1e-6 });
    expect(grid).toHaveLength(60);
  });

  it('does not fill the gap between two separate windows', () => {
    const grid = adaptiveGrid([{ lo_hz: 100e3, hi_hz: 110e3 }, { lo_hz: 150e3, hi_hz: 170e3 }], [], tank, { initialPoints: 20, maxPoints: 200, maxChange: 0.05 });
    expect(grid.some((f) => f > 110e3 && f < 150e3)).toBe(false);
    expect(grid.filter((f) => f >= 150e3).length).toBeGreaterThan(grid.filter((f) => f <= 110e3).length);
  });
});

describe('largestLogChange', () => {
  it('is |ln(b/a)| with the complex logarithm: ln 2 for doubling, π/2 for a quarter turn', () => {
    expect(largestLogChange([{ re: 1, im: 0 }], [{ re: 2, im: 0 }])).toBeCloseTo(Math.LN2, 12);
    expect(largestLogChange([{ re: 1, im: 0 }], [{ re: 0, im: 1 }])).toBeCloseTo(Math.PI / 2, 12);
  });
});
