// The one-dimensional minimizers behind the fitted values, on functions whose minima are known in closed
// form: cos has its minimum at π on [3, 4] (common practice), (x - √2)² at √2.
import { describe, expect, it } from 'vitest';
import { brentMinimize, scanAndRefine } from '../../../src/analysis/diagnose-search.js';

describe('Brent minimization (R. P. Brent, 1973)', () => {
  it('finds π as the minimum of cos on [3, 4]', () => {
    const m = brentMinimize(Math.cos, 3, 4, 1e-9);
    expect(m.x).toBeCloseTo(Math.PI, 7);
    expect(m.value).toBeCloseTo(-1, 12);
  });

  it('finds √2 for (x - √2)² + 1 and takes few evaluations on a parabola', () => {
    let calls = 0;
    const m = brentMinimize((x) => (calls++, (x - Math.SQRT2) ** 2 + 1), -5, 5, 1e-10);
    expect(m.x).toBeCloseTo(Math.SQRT2, 8);
    // A parabolic step lands on a parabola's vertex at once; golden sections alone would need about 50.
    expect(calls).toBeLessThan(20);
  });

  it('stays inside the bracket when the minimum lies on its edge', () => {
    const m = brentMinimize((x) => x, 2, 3, 1e-8);
    expect(m.x).toBeGreaterThanOrEqual(2);
    expect(m.x).toBeLessThan(2 + 1e-6);
  });
});

describe('scan then refine', () => {
  it('finds the deeper of two dips, where a local search from the middle would stop in the other', () => {
    // Dips at -2 (depth 0) and at +1.5 (depth 0.5); x = 0 lies on the slope towards +1.5.
    const f = (x: number) => Math.min((x + 2) ** 2, 0.5 + 4 * (x - 1.5) ** 2);
    const m = scanAndRefine(f, -3, 3, 60);
    expect(m.x).toBeCloseTo(-2, 6);
    expect(m.value).toBeCloseTo(0, 10);
  });

  it('treats NaN (a circuit with no solution) as the worst value', () => {
    const m = scanAndRefine((x) => (x > 0 ? Number.NaN : (x + 1) ** 2), -3, 3, 60);
    expect(m.x).toBeCloseTo(-1, 6);
  });
});
