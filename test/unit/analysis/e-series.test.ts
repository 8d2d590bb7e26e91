// The preferred-value helper against IEC 60063 (from memory): the E6, E12 and E24 lists, each series a
// subset of the next, and the nearest preferred value of values between the steps.
import { describe, expect, it } from 'vitest';
import { decadeOffset, describeDecades, E_SERIES, nearestPreferred, seriesForTolerance } from '../../../src/analysis/e-series.js';

// IEC 60063, the E6, E12 and E24 series (from memory).
const IEC_E6 = [1.0, 1.5, 2.2, 3.3, 4.7, 6.8];
const IEC_E12 = [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2];
const IEC_E24 = [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1];

describe('E series (IEC 60063)', () => {
  it('lists the E6, E12 and E24 values of the standard', () => {
    expect(E_SERIES.E6).toEqual(IEC_E6);
    expect(E_SERIES.E12).toEqual(IEC_E12);
    expect(E_SERIES.E24).toEqual(IEC_E24);
  });

  it('keeps every value of a coarser series in the finer one (IEC 60063: E6 ⊂ E12 ⊂ E24)', () => {
    for (const v of IEC_E6) expect(E_SERIES.E12).toContain(v);
    for (const v of IEC_E12) expect(E_SERIES.E24).toContain(v);
  });

  it('departs from the rounded geometric steps 10^(i/24) only where the standard does (from memory: 2.7 … 4.7 and 8.2)', () => {
    const departures = E_SERIES.E24.filter((v, i) => Number((10 ** (i / 24)).toFixed(1)) !== v);
    expect(departures).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });

  it('maps every listed value, in any decade, to itself', () => {
    for (const name of ['E6', 'E12', 'E24'] as const) {
      for (const exponent of [-12, -9, -6, 0, 3]) {
        for (const m of E_SERIES[name]) {
          const value = m * 10 ** exponent;
          const match = nearestPreferred(value, name);
          expect(match.mantissa).toBe(m);
          expect(match.exponent).toBe(exponent);
          expect(match.value / value).toBeCloseTo(1, 12);
        }
      }
    }
  });

  it('takes the nearest value on a log scale (IEC 60063 steps are geometric)', () => {
    // 4.0 lies between 3.9 and 4.3 of E24, nearer 3.9; in E12 between 3.9 and 4.7, nearer 3.9.
    expect(nearestPreferred(4.0e-9, 'E24').value).toBe(3.9e-9);
    expect(nearestPreferred(4.4e-9, 'E12').value).toBe(4.7e-9);
    // The geometric midpoint of 3.3 and 4.7 is √(3.3·4.7) ≈ 3.938: just below goes to 3.3 in E6.
    expect(nearestPreferred(3.93e-6, 'E6').value).toBe(3.3e-6);
    expect(nearestPreferred(3.95e-6, 'E6').value).toBe(4.7e-6);
    // Above 9.1 the next preferred value is 10 of the next decade.
    const high = nearestPreferred(9.8e-8, 'E24');
    expect(high.value).toBe(1e-7);
    expect(high.mantissa).toBe(1);
    expect(high.exponent).toBe(-7);
    expect(nearestPreferred(26.4e-6, 'E12').value).toBe(27e-6);
  });

  it('draws parts of 20 %, 10 % and 5 % from E6, E12 and E24 (common practice)', () => {
    expect(seriesForTolerance(0.2)).toBe('E6');
    expect(seriesForTolerance(0.1)).toBe('E12');
    expect(seriesForTolerance(0.05)).toBe('E24');
    expect(seriesForTolerance(0.01)).toBe('E24');
  });

  it('tells a wrong-decade part from a drifted one', () => {
    expect(decadeOffset(33e-9, 3.3e-9)).toBe(1);
    expect(decadeOffset(3.3e-9, 33e-9)).toBe(-1);
    expect(decadeOffset(0.34e-6, 3.3e-9)).toBe(2);
    expect(decadeOffset(26.4e-6, 22e-6)).toBe(0);
    // Five times off is neither the placed decade nor the next.
    expect(decadeOffset(16.5e-9, 3.3e-9)).toBe(0);
    expect(describeDecades(1)).toBe('one decade high');
    expect(describeDecades(-1)).toBe('one decade low');
    expect(describeDecades(-2)).toBe('two decades low');
    expect(describeDecades(0)).toBe('');
  });

  it('refuses a value that is not positive and finite', () => {
    expect(() => nearestPreferred(0)).toThrow(RangeError);
    expect(() => nearestPreferred(-1)).toThrow(RangeError);
    expect(() => nearestPreferred(Infinity)).toThrow(RangeError);
  });
});
