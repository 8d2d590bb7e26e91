// A sweep grid that is dense where the predicted impedance changes fast. It starts from a logarithmic
// grid over each window (with the mode frequencies added) and bisects, in log f, the interval where
// the readings change most, until every interval changes by at most `maxChange` or the grid holds
// `maxPoints`. The change over an interval is max over the swept readings of |ln(Z₂/Z₁)|, i.e.
// |d ln Z / d ln f| times the interval's width in ln f: a step of 0.05 is about 5 % in |Z| or 3° in phase.
import type { Complex } from '../circuit/admittance.js';
import type { FrequencyWindow } from '../predict/tolerance-mode-window.js';

export interface GridOptions {
  /** Points of the starting grid over all windows together, mode frequencies included (at least 3 per window). */
  initialPoints: number;
  maxPoints: number;
  /** Largest |Δ ln Z| allowed between neighbouring points. */
  maxChange: number;
}

export const DEFAULT_GRID: GridOptions = { initialPoints: 41, maxPoints: 161, maxChange: 0.05 };

/** Frequencies ascending; `evaluate` returns the swept readings' values at one frequency. */
export function adaptiveGrid(windows: readonly FrequencyWindow[], include: readonly number[], evaluate: (f: number) => Complex[], options: GridOptions = DEFAULT_GRID): number[] {
  const totalLog = windows.reduce((sum, w) => sum + Math.log(w.hi_hz / w.lo_hz), 0);
  const inside = include.filter((f) => windows.some((w) => f >= w.lo_hz && f <= w.hi_hz)).length;
  // The mode frequencies come on top of the starting grid, within the same budget.
  const budget = Math.min(options.initialPoints, options.maxPoints - inside);
  const points: { f: number; z: Complex[]; window: number }[] = [];
  windows.forEach((w, k) => {
    const share = totalLog > 0 ? Math.log(w.hi_hz / w.lo_hz) / totalLog : 1 / windows.length;
    const n = Math.max(3, Math.round(share * budget));
    const start = new Set<number>();
    for (let i = 0; i < n; i++) start.add(i === n - 1 ? w.hi_hz : w.lo_hz * Math.exp((i / (n - 1)) * Math.log(w.hi_hz / w.lo_hz)));
    for (const f of include) if (f >= w.lo_hz && f <= w.hi_hz) start.add(f);
    for (const f of start) points.push({ f, z: evaluate(f), window: k });
  });
  points.sort((a, b) => a.f - b.f);

  const change = (i: number) => (points[i].window === points[i + 1].window ? largestLogChange(points[i].z, points[i + 1].z) : 0);
  const changes = points.slice(0, -1).map((_, i) => change(i));
  while (points.length < options.maxPoints) {
    let worst = -1;
    for (let i = 0; i < changes.length; i++) if (worst < 0 || changes[i] > changes[worst]) worst = i;
    if (worst < 0 || !(changes[worst] > options.maxChange)) break;
    const a = points[worst];
    const b = points[worst + 1];
    const f = Math.sqrt(a.f * b.f);
    if (!(f > a.f && f < b.f)) {
      changes[worst] = 0; // the interval cannot be split any further in floating point
      continue;
    }
    points.splice(worst + 1, 0, { f, z: evaluate(f), window: a.window });
    changes.splice(worst, 1, change(worst), change(worst + 1));
  }
  return points.map((p) => p.f);
}

/** max_k |ln(b_k / a_k)| with the complex logarithm (ln of the magnitude ratio, and the phase turn). */
export function largestLogChange(a: readonly Complex[], b: readonly Complex[]): number {
  let worst = 0;
  for (let k = 0; k < a.length; k++) {
    const ma = Math.hypot(a[k].re, a[k].im);
    const mb = Math.hypot(b[k].re, b[k].im);
    if (!(ma > 0) || !(mb > 0)) continue;
    // b · conj(a)
    const turn = Math.atan2(b[k].im * a[k].re - b[k].re * a[k].im, b[k].re * a[k].re + b[k].im * a[k].im);
    const step = Math.hypot(Math.log(mb / ma), turn);
    if (step > worst) worst = step;
  }
  return worst;
}
