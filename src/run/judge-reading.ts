// The verdict on one reading, from the band the plan carries: inside it, outside it (in magnitude, in
// phase or both), or not a reading at all. Pure: no physics, only the comparison the plan asks for, with
// the plan's own band geometry (the phase band is an arc that may cross ±180°), so every stage agrees.
import type { Complex, Invalid } from '../instruments/index.js';
import { magnitudeInBand, phaseInBand } from '../plan/band-membership.js';
import type { ReadingBand } from '../plan/types.js';
import type { ReadingFlag } from './run-events.js';

export interface Verdict {
  flag: ReadingFlag;
  magnitude_ohm: number;
  phase_deg: number;
  outside: ('magnitude' | 'phase')[];
}

const INVALID_VERDICT: Verdict = { flag: 'invalid', magnitude_ohm: Number.NaN, phase_deg: Number.NaN, outside: [] };

export function judgeReading(reading: Complex | Invalid, band: ReadingBand): Verdict {
  if (reading === 'invalid' || !Number.isFinite(reading.re) || !Number.isFinite(reading.im)) return INVALID_VERDICT;
  const magnitude = Math.hypot(reading.re, reading.im);
  const phase = (Math.atan2(reading.im, reading.re) * 180) / Math.PI;
  const outside: Verdict['outside'] = [];
  if (!magnitudeInBand(magnitude, band)) outside.push('magnitude');
  if (!phaseInBand(phase, band)) outside.push('phase');
  return { flag: outside.length > 0 ? 'deviation' : 'ok', magnitude_ohm: magnitude, phase_deg: phase, outside };
}
