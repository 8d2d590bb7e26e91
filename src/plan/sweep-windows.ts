// The frequency windows the sweeps cover: each chosen mode's tolerance window (how far the tolerances
// can move it, src/predict/tolerance-mode-window.ts) widened by SWEEP_MARGIN of its width on each side,
// so the peak's flanks are in view even at the window's ends, and never narrower than
// ±SWEEP_MIN_HALF_SPAN around the mode. Overlapping windows merge into one.
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import type { Mode } from '../predict/modes.js';
import { modeToleranceWindow, type FrequencyWindow } from '../predict/tolerance-mode-window.js';

export const SWEEP_MARGIN = 0.25;
export const SWEEP_MIN_HALF_SPAN = 0.05;

export function sweepWindows(laplacian: GroundedLaplacian, modes: readonly Mode[]): FrequencyWindow[] {
  const windows = modes.map((mode) => {
    const w = modeToleranceWindow(laplacian, mode);
    const margin = SWEEP_MARGIN * Math.log(w.hi_hz / w.lo_hz);
    return {
      lo_hz: Math.min(w.lo_hz * Math.exp(-margin), mode.frequency_hz * (1 - SWEEP_MIN_HALF_SPAN)),
      hi_hz: Math.max(w.hi_hz * Math.exp(margin), mode.frequency_hz * (1 + SWEEP_MIN_HALF_SPAN)),
    };
  });
  return mergeWindows(windows);
}

export function mergeWindows(windows: readonly FrequencyWindow[]): FrequencyWindow[] {
  const sorted = [...windows].sort((a, b) => a.lo_hz - b.lo_hz);
  const out: FrequencyWindow[] = [];
  for (const w of sorted) {
    const last = out[out.length - 1];
    if (last && w.lo_hz <= last.hi_hz) last.hi_hz = Math.max(last.hi_hz, w.hi_hz);
    else out.push({ ...w });
  }
  return out;
}
