// Plot geometry. A logarithmic axis gives each decade the same length and a linear one is affine;
// tick values follow the 1-2-5 sequence (both common practice for engineering plots).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { linearScale, linearTicks, logScale, logTicks, niceStep, paddedDomain } from '../../../src/report/svg-axes.js';
import { pathData } from '../../../src/report/svg-line-plot.js';

describe('log scale', () => {
  const s = logScale([1, 1e6], [0, 600]);

  it('maps each decade to the same length', () => {
    const lengths = [1, 10, 100, 1e3, 1e4, 1e5].map((v) => s.map(v * 10) - s.map(v));
    for (const l of lengths) expect(l).toBeCloseTo(100, 9);
  });

  it('maps the ends of the domain to the ends of the range, also reversed (a y axis)', () => {
    expect(s.map(1)).toBeCloseTo(0, 12);
    expect(s.map(1e6)).toBeCloseTo(600, 9);
    const y = logScale([10, 1000], [200, 0]);
    expect(y.map(10)).toBeCloseTo(200, 9);
    expect(y.map(100)).toBeCloseTo(100, 9);
  });

  it('places equal ratios at equal distances anywhere (log(a·k) − log(a) does not depend on a)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1.5, max: 5e5, noNaN: true }), fc.double({ min: 1.01, max: 1.9, noNaN: true }), (a, k) => {
        expect(s.map(a * k) - s.map(a)).toBeCloseTo(s.map(2 * k) - s.map(2), 6);
      }),
    );
  });

  it('cannot place zero or negative values', () => {
    expect(s.map(0)).toBeNaN();
    expect(s.map(-3)).toBeNaN();
    expect(() => logScale([0, 10], [0, 1])).toThrow(/positive/);
  });
});

describe('linear scale', () => {
  it('is affine: ends to ends, midpoint to midpoint', () => {
    const s = linearScale([-180, 180], [300, 0]);
    expect(s.map(-180)).toBe(300);
    expect(s.map(180)).toBe(0);
    expect(s.map(0)).toBe(150);
  });
});

describe('ticks', () => {
  it('niceStep is 1, 2 or 5 times a power of ten, giving about the target number of intervals', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-6, max: 1e9, noNaN: true }), (span) => {
        const step = niceStep(span, 5);
        const mantissa = Number((step / 10 ** Math.floor(Math.log10(step) + 1e-12)).toPrecision(6));
        expect([1, 2, 5, 10]).toContain(mantissa);
        expect(span / step).toBeGreaterThan(5 / 2.5);
        expect(span / step).toBeLessThan(5 * 2.5);
      }),
    );
  });

  it('linear ticks lie in the domain, evenly spaced, and include 0 when the domain crosses it', () => {
    const t = linearTicks(-3.2, 7.9);
    expect(t).toEqual([-2, 0, 2, 4, 6]);
    const u = linearTicks(0.013, 0.061);
    for (const v of u) expect(v >= 0.013 && v <= 0.061).toBe(true);
    const gaps = u.slice(1).map((v, i) => v - u[i]);
    for (const g of gaps) expect(g).toBeCloseTo(gaps[0], 12);
  });

  it('log ticks: whole decades over a wide range, 1-2-5 over a couple of decades', () => {
    expect(logTicks(0.5, 2e5)).toEqual([1, 10, 100, 1000, 10000, 100000]);
    expect(logTicks(3, 400)).toEqual([5, 10, 20, 50, 100, 200]);
    expect(logTicks(120, 480)).toEqual([200, 300, 400]);
  });

  it('log ticks thin whole decades over very wide ranges', () => {
    const t = logTicks(1e-6, 1e12);
    expect(t.length).toBeLessThanOrEqual(10);
    expect(t[0]).toBe(1e-6);
  });
});

describe('padded domains', () => {
  it('hold every value and, for a log axis, only positive ones', () => {
    const d = paddedDomain([0, -1, 3, 400, Number.NaN], { positive: true })!;
    expect(d[0]).toBeGreaterThan(0);
    expect(d[0]).toBeLessThan(3);
    expect(d[1]).toBeGreaterThan(400);
  });

  it('widen a single value to a readable span', () => {
    const d = paddedDomain([50], { positive: true })!;
    expect(Math.log10(d[1] / d[0])).toBeGreaterThanOrEqual(0.2);
    expect(Math.sqrt(d[0] * d[1])).toBeCloseTo(50, 9);
    expect(paddedDomain([Number.NaN])).toBeUndefined();
  });
});

describe('line paths', () => {
  it('break where a point cannot be placed (log of zero) instead of drawing to the edge', () => {
    const s = logScale([1, 100], [0, 100]);
    const d = pathData([[0, 1], [1, 10], [2, 0], [3, 100]], (x) => x * 10, (y) => s.map(y));
    expect(d).toBe('M0.0 0.0L10.0 50.0M30.0 100.0');
  });
});
