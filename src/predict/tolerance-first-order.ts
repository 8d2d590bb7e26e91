// First-order tolerance spreads from the adjoint sensitivities (sensitivity.ts): the fast option. With
// s_k = (dZ/d ln p_k)/Z, a part's relative change δ_k moves ln|Z| by Re(s_k)·δ_k and the phase by
// Im(s_k)·δ_k radians. Two ways to combine the parts (both documented in the plan):
//   quadrature  half-width = k·√Σ(Re s_k · σ_k)², σ_k = t_k/√3 (the uniform assumption of
//               tolerance-samples.ts), k = 2.576: two-sided 99 % of a normal distribution, which the sum
//               of many independent parts approaches (central limit theorem; common practice);
//   worst-case  half-width = Σ |Re s_k|·t_k, every part at the end of its tolerance that hurts most.
// Both are linear in ln p: near a sharp resonance, where a tolerance moves the peak by more than its
// width, they can be far from the spread the Monte Carlo band shows, in either direction.
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import { readingSensitivities, type ReadingSensitivity } from './sensitivity.js';
import { evaluateSchedule, scheduleByFrequency, type ReadingRequest } from './tolerance-evaluate.js';
import { toleranceStandardDeviation } from './tolerance-samples.js';
import type { PointSpread } from './tolerance-spread.js';

export type Combination = 'quadrature' | 'worst-case';

/** Two-sided 99 % coverage factor of a normal distribution (common practice: 2.576). */
export const QUADRATURE_COVERAGE_FACTOR = 2.576;
export const QUADRATURE_COVERAGE = 0.99;

export function firstOrderSpreads(laplacian: GroundedLaplacian, requests: readonly ReadingRequest[], combine: Combination): PointSpread[][] {
  const out = requests.map((r) => new Array<PointSpread>(r.frequencies.length));
  evaluateSchedule(laplacian, requests, scheduleByFrequency(requests), (r, p, _z, solved) => {
    out[r][p] = firstOrderSpread(readingSensitivities(laplacian, solved, requests[r].reading), combine);
  });
  return out;
}

/** Half-widths of ln|Z| and of the phase (radians) for one reading. */
export function firstOrderHalfWidths(sensitivity: ReadingSensitivity, combine: Combination): { logMag: number; phase: number } {
  const { z, parts } = sensitivity;
  const z2 = z.re * z.re + z.im * z.im;
  if (!(z2 > 0)) return { logMag: 0, phase: 0 };
  let mag = 0;
  let phase = 0;
  for (const { part, dz } of parts) {
    const t = part.tolerance ?? 0;
    if (t <= 0) continue;
    // s = dz / z
    const sRe = (dz.re * z.re + dz.im * z.im) / z2;
    const sIm = (dz.im * z.re - dz.re * z.im) / z2;
    if (combine === 'worst-case') {
      mag += Math.abs(sRe) * t;
      phase += Math.abs(sIm) * t;
    } else {
      const sigma = toleranceStandardDeviation(t);
      mag += (sRe * sigma) ** 2;
      phase += (sIm * sigma) ** 2;
    }
  }
  if (combine === 'worst-case') return { logMag: mag, phase };
  return { logMag: QUADRATURE_COVERAGE_FACTOR * Math.sqrt(mag), phase: QUADRATURE_COVERAGE_FACTOR * Math.sqrt(phase) };
}

/**
 * Widest ln|Z| half-width kept: a factor of 1000 either way. A reading near a zero of Z (a transfer reading
 * at a node where the profile changes sign) has relative sensitivities so large that exp() overflows; the
 * linear band means nothing long before that, and a plan file must hold finite numbers (JSON has no
 * Infinity).
 */
const MAX_LOG_MAGNITUDE = Math.log(1e3);

export function firstOrderSpread(sensitivity: ReadingSensitivity, combine: Combination): PointSpread {
  const halfWidths = firstOrderHalfWidths(sensitivity, combine);
  const logMag = Math.min(halfWidths.logMag, MAX_LOG_MAGNITUDE);
  const phase = halfWidths.phase;
  const mag = Math.hypot(sensitivity.z.re, sensitivity.z.im);
  const dev = Math.min(phase, Math.PI);
  return { nominal: sensitivity.z, mag_min_ohm: mag * Math.exp(-logMag), mag_max_ohm: mag * Math.exp(logMag), phase_dev_min_rad: -dev, phase_dev_max_rad: dev };
}
