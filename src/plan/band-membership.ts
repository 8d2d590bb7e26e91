// Whether a reading lies in its band. Pure geometry on the plan's numbers, no physics: the runner and
// the analysis use these so that every stage reads the phase arc the same way (see ReadingBand).
import type { ReadingBand } from './types.js';

/** An angle in degrees brought to [−180, 180). */
export function wrapDegrees(deg: number): number {
  const w = (((deg + 180) % 360) + 360) % 360 - 180;
  return w;
}

/** Width in degrees of the counter-clockwise arc from lo to hi: 0..360 (lo −180, hi 180 is 360). */
export function phaseArcWidth(band: Pick<ReadingBand, 'phase_lo_deg' | 'phase_hi_deg'>): number {
  const { phase_lo_deg: lo, phase_hi_deg: hi } = band;
  return hi >= lo ? hi - lo : hi - lo + 360;
}

/** True when `phaseDeg` lies on the arc running counter-clockwise from phase_lo_deg to phase_hi_deg. */
export function phaseInBand(phaseDeg: number, band: Pick<ReadingBand, 'phase_lo_deg' | 'phase_hi_deg'>): boolean {
  const offset = (((phaseDeg - band.phase_lo_deg) % 360) + 360) % 360;
  return offset <= phaseArcWidth(band);
}

export function magnitudeInBand(magOhm: number, band: Pick<ReadingBand, 'mag_lo_ohm' | 'mag_hi_ohm'>): boolean {
  return magOhm >= band.mag_lo_ohm && magOhm <= band.mag_hi_ohm;
}

/** A complex reading (re, im) against its band: magnitude and phase both inside. */
export function readingInBand(re: number, im: number, band: ReadingBand): boolean {
  return magnitudeInBand(Math.hypot(re, im), band) && phaseInBand((Math.atan2(im, re) * 180) / Math.PI, band);
}
