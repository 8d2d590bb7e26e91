// The measurement floor around a tolerance spread.
import { describe, expect, it } from 'vitest';
import { bandFromSpread } from '../../../src/plan/reading-band.js';
import { phaseInBand, readingInBand } from '../../../src/plan/band-membership.js';

const spread = (re: number, im: number, lo: number, hi: number, devLoDeg: number, devHiDeg: number) => ({
  nominal: { re, im },
  mag_min_ohm: lo,
  mag_max_ohm: hi,
  phase_dev_min_rad: (devLoDeg * Math.PI) / 180,
  phase_dev_max_rad: (devHiDeg * Math.PI) / 180,
});

describe('bandFromSpread', () => {
  it('adds the relative and absolute floors to the magnitude and the phase floor to the phase', () => {
    const band = bandFromSpread(spread(0, 100, 90, 110, -5, 5), { relative: 0.01, absolute_ohm: 0, phase_deg: 2 });
    expect(band.mag_lo_ohm).toBeCloseTo(89.1, 12);
    expect(band.mag_hi_ohm).toBeCloseTo(111.1, 12);
    expect(band.phase_lo_deg).toBeCloseTo(83, 10);
    expect(band.phase_hi_deg).toBeCloseTo(97, 10);
  });

  it('widens the phase by asin(absolute / |Z|min): an error disc of radius e turns a phasor of length r by up to asin(e/r) (common practice)', () => {
    const band = bandFromSpread(spread(100, 0, 100, 100, 0, 0), { relative: 0, absolute_ohm: 50, phase_deg: 0 });
    expect(band.phase_hi_deg).toBeCloseTo(30, 10); // asin(1/2) = 30°
    expect(band.phase_lo_deg).toBeCloseTo(-30, 10);
    // Every point of the disc |Z − 100| ≤ 50 lies in the band.
    for (let k = 0; k < 360; k += 5) {
      const t = (k * Math.PI) / 180;
      expect(readingInBand(100 + 50 * Math.cos(t), 50 * Math.sin(t), band)).toBe(true);
    }
  });

  it('gives up the phase once the floor can reach the origin', () => {
    const band = bandFromSpread(spread(0.3, 0, 0.3, 0.3, 0, 0), { relative: 0.02, absolute_ohm: 0.5, phase_deg: 2 });
    expect(band).toMatchObject({ mag_lo_ohm: 0, phase_lo_deg: -180, phase_hi_deg: 180 });
  });

  it('wraps a band around ±180° and keeps the nominal inside', () => {
    const band = bandFromSpread(spread(-100, 1, 90, 110, -10, 10), { relative: 0, absolute_ohm: 0, phase_deg: 0 });
    expect(band.phase_lo_deg).toBeGreaterThan(band.phase_hi_deg); // the arc crosses 180°
    expect(phaseInBand(180, band)).toBe(true);
    expect(phaseInBand(0, band)).toBe(false);
    expect(readingInBand(-100, 1, band)).toBe(true);
  });
});
