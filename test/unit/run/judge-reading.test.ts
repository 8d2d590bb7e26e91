// The verdict on a reading, checked against values computed outside the runner: magnitudes and phases of
// complex numbers from mathjs, handbook reactances, and arcs of the circle that cross ±180°.
import { abs, arg, complex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { judgeReading } from '../../../src/run/judge-reading.js';
import type { ReadingBand } from '../../../src/plan/types.js';

const band = (mag_lo_ohm: number, mag_hi_ohm: number, phase_lo_deg: number, phase_hi_deg: number): ReadingBand => ({ mag_lo_ohm, mag_hi_ohm, phase_lo_deg, phase_hi_deg });
const DEG = 180 / Math.PI;

describe('judging one reading', () => {
  it('reads magnitude and phase as mathjs does', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: -1e6, max: 1e6, noNaN: true }), (re, im) => {
        fc.pre(Math.hypot(re, im) > 1e-9);
        const v = judgeReading({ re, im }, band(0, Infinity, -180, 180));
        const z = complex(re, im);
        expect(v.magnitude_ohm).toBeCloseTo(abs(z), 6);
        expect(v.phase_deg).toBeCloseTo((arg(z) as number) * DEG, 9);
        expect(v.flag).toBe('ok');
      }),
    );
  });

  it('a 10 nF capacitor at 100 kHz reads 159.15 ohm at -90 degrees (X_C = 1/(2 pi f C), handbook, from memory)', () => {
    const xc = 1 / (2 * Math.PI * 100e3 * 10e-9);
    expect(xc).toBeCloseTo(159.15, 2);
    expect(judgeReading({ re: 0.02, im: -xc }, band(151, 167, -95, -85)).flag).toBe('ok');
    // The same part read as an inductor (+90 degrees) is out in phase only.
    expect(judgeReading({ re: 0.02, im: xc }, band(151, 167, -95, -85))).toMatchObject({ flag: 'deviation', outside: ['phase'] });
    // A 22 nF part fitted instead: |Z| = 72.3 ohm, out in magnitude only.
    expect(judgeReading({ re: 0.02, im: -xc / 2.2 }, band(151, 167, -95, -85))).toMatchObject({ flag: 'deviation', outside: ['magnitude'] });
  });

  it('takes the phase band as the counter-clockwise arc from lo to hi, across ±180 degrees', () => {
    // lo 170, hi -170: the 20 degree arc through 180 degrees (the plan format's own example).
    const across = band(0, Infinity, 170, -170);
    const at = (deg: number) => judgeReading({ re: Math.cos(deg / DEG), im: Math.sin(deg / DEG) }, across).flag;
    expect(at(175)).toBe('ok');
    expect(at(-175)).toBe('ok');
    expect(at(180)).toBe('ok');
    expect(at(0)).toBe('deviation');
    expect(at(160)).toBe('deviation');
    expect(at(-160)).toBe('deviation');
    // lo -180, hi 180: the whole circle.
    for (const deg of [-179, -90, 0, 90, 179]) expect(judgeReading({ re: Math.cos(deg / DEG), im: Math.sin(deg / DEG) }, band(0, Infinity, -180, 180)).flag).toBe('ok');
  });

  it('an arc and its complement split every phase between them', () => {
    fc.assert(
      fc.property(fc.integer({ min: -179, max: 179 }), fc.integer({ min: -179, max: 179 }), fc.double({ min: -179.5, max: 179.5, noNaN: true }), (lo, hi, phase) => {
        fc.pre(lo !== hi && Math.abs(phase - lo) > 1e-6 && Math.abs(phase - hi) > 1e-6);
        const z = { re: Math.cos(phase / DEG), im: Math.sin(phase / DEG) };
        const inArc = judgeReading(z, band(0, Infinity, lo, hi)).flag === 'ok';
        const inComplement = judgeReading(z, band(0, Infinity, hi, lo)).flag === 'ok';
        expect(inArc).not.toBe(inComplement);
      }),
    );
  });

  it('overload and non-numbers are invalid, never ok', () => {
    const b = band(0, Infinity, -180, 180);
    expect(judgeReading('invalid', b).flag).toBe('invalid');
    expect(judgeReading({ re: Number.NaN, im: 0 }, b).flag).toBe('invalid');
    expect(judgeReading({ re: Infinity, im: 0 }, b).flag).toBe('invalid');
  });
});
