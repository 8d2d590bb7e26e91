// Turns a tolerance spread into the band a reading is judged by, adding the measurement floor:
//   magnitude  [min·(1 − relative) − absolute, max·(1 + relative) + absolute], never below 0;
//   phase      the spread's arc widened by phase_deg on both sides and by asin(absolute / |Z|min):
//              an error of up to `absolute` ohms on a phasor of length |Z| turns it by up to that angle
//              (common practice). Once the error can reach the origin the phase says nothing: full circle.
import type { PointSpread } from '../predict/tolerance-spread.js';
import { phaseArcWidth, wrapDegrees } from './band-membership.js';
import type { BandFloor, ReadingBand } from './types.js';

const DEG = 180 / Math.PI;

export function bandFromSpread(spread: PointSpread, floor: BandFloor): ReadingBand {
  const magLo = Math.max(0, spread.mag_min_ohm * (1 - floor.relative) - floor.absolute_ohm);
  const magHi = spread.mag_max_ohm * (1 + floor.relative) + floor.absolute_ohm;
  const smallest = spread.mag_min_ohm * (1 - floor.relative);
  const full = { mag_lo_ohm: magLo, mag_hi_ohm: magHi, phase_lo_deg: -180, phase_hi_deg: 180 };
  if (!(smallest > floor.absolute_ohm)) return full;
  const widen = floor.phase_deg + Math.asin(floor.absolute_ohm / smallest) * DEG;
  const nominalDeg = Math.atan2(spread.nominal.im, spread.nominal.re) * DEG;
  const lo = spread.phase_dev_min_rad * DEG - widen;
  const hi = spread.phase_dev_max_rad * DEG + widen;
  if (hi - lo >= 360) return full;
  const band = { mag_lo_ohm: magLo, mag_hi_ohm: magHi, phase_lo_deg: wrapDegrees(nominalDeg + lo), phase_hi_deg: wrapDegrees(nominalDeg + hi) };
  // An arc just short of the full circle can round to one whose ends meet (width 0): keep it whole.
  return Math.abs(phaseArcWidth(band) - (hi - lo)) > 1e-6 ? full : band;
}
