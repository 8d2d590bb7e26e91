// Phase arcs with wrap-around and magnitude intervals: the plan's band convention (src/plan/types.ts).
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { phaseArcWidth, phaseInBand, readingInBand, wrapDegrees } from '../../../src/plan/band-membership.js';

describe('phase bands run counter-clockwise from lo to hi', () => {
  it('an arc that crosses ±180° holds the phases near 180 and nothing opposite', () => {
    // Angles are the same modulo 360° (common practice).
    const band = { phase_lo_deg: 170, phase_hi_deg: -170 };
    expect(phaseArcWidth(band)).toBe(20);
    for (const phase of [170, 175, 180, -180, -175, -170, 530]) expect(phaseInBand(phase, band)).toBe(true);
    for (const phase of [169, -169, 0, 90, -90]) expect(phaseInBand(phase, band)).toBe(false);
  });

  it('an ordinary arc is the interval lo..hi, ends included', () => {
    const band = { phase_lo_deg: -30, phase_hi_deg: 45 };
    expect(phaseArcWidth(band)).toBe(75);
    for (const phase of [-30, 0, 45, 390]) expect(phaseInBand(phase, band)).toBe(true);
    for (const phase of [-31, 46, 180, -180]) expect(phaseInBand(phase, band)).toBe(false);
  });

  it('lo -180 with hi 180 is the whole circle', () => {
    const band = { phase_lo_deg: -180, phase_hi_deg: 180 };
    expect(phaseArcWidth(band)).toBe(360);
    fc.assert(fc.property(fc.double({ min: -1000, max: 1000, noNaN: true }), (phase) => phaseInBand(phase, band)));
  });

  it('a phase δ into an arc of width w starting anywhere is inside exactly when 0 ≤ δ ≤ w (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -180, max: 180, noNaN: true }), fc.double({ min: 0.5, max: 350, noNaN: true }), fc.double({ min: -170, max: 520, noNaN: true }), (lo, width, delta) => {
        const band = { phase_lo_deg: lo, phase_hi_deg: wrapDegrees(lo + width) };
        const inside = phaseInBand(lo + delta, band);
        const expected = delta >= 0 && delta <= width ? true : delta > width + 1e-6 && delta < 360 - 1e-6 ? false : inside;
        return inside === expected;
      }),
    );
  });

  it('wrapDegrees brings any angle into [-180, 180)', () => {
    expect(wrapDegrees(190)).toBe(-170);
    expect(wrapDegrees(-190)).toBe(170);
    expect(wrapDegrees(180)).toBe(-180);
    expect(wrapDegrees(720 + 45)).toBe(45);
  });
});

describe('readingInBand judges magnitude and phase together', () => {
  const band = { mag_lo_ohm: 90, mag_hi_ohm: 110, phase_lo_deg: 80, phase_hi_deg: 100 };
  it('accepts 100 Ω at +90° (a pure reactance j100 Ω) and refuses each way out', () => {
    expect(readingInBand(0, 100, band)).toBe(true);
    expect(readingInBand(0, 120, band)).toBe(false); // |Z| too large
    expect(readingInBand(100, 0, band)).toBe(false); // phase 0°
    expect(readingInBand(0, -100, band)).toBe(false); // phase −90°
  });
});
