// The frequency window a mode can move through when every part takes any value within its tolerance,
// to first order in ln p (see sensitivity-modes.ts). Each part contributes the larger (and the smaller)
// of S·ln(1 + t) and S·ln(1 − t) to ln f, so the window is exact for a common scale of all capacitors
// or all inductors (f ∝ 1/√(LC); common practice), the worst case for the board's own spread.
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import { modeFrequencySensitivities } from './sensitivity-modes.js';

export interface FrequencyWindow {
  lo_hz: number;
  hi_hz: number;
}

export function modeToleranceWindow(laplacian: GroundedLaplacian, mode: { frequency_hz: number; profile: Readonly<Record<string, number>> }): FrequencyWindow {
  let up = 0;
  let down = 0;
  for (const { part, value } of modeFrequencySensitivities(laplacian, mode.profile)) {
    const t = Math.min(part.tolerance ?? 0, 0.999);
    if (t <= 0 || value === 0) continue;
    const a = value * Math.log1p(t);
    const b = value * Math.log1p(-t);
    up += Math.max(a, b);
    down += Math.min(a, b);
  }
  return { lo_hz: mode.frequency_hz * Math.exp(down), hi_hz: mode.frequency_hz * Math.exp(up) };
}
