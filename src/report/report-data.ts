// Picks out of the readings what each part of the report shows: counts by flag, the node-to-ground
// readings at a mode's frequency, the swept terminals, and the transfer readings normalized to their
// drive node. Pure selection and arithmetic on the logged numbers; no physics is computed here.
import { GROUND } from '../board/types.js';
import type { Reading, ReadingFlag } from '../analysis/readings.js';
import type { ReportBand } from './report-input.js';

const DEG = 180 / Math.PI;

export const magnitude = (r: Pick<Reading, 're' | 'im'>): number => Math.hypot(r.re, r.im);
export const predictedMagnitude = (r: Pick<Reading, 'pred_re' | 'pred_im'>): number => Math.hypot(r.pred_re, r.pred_im);
export const phaseDeg = (r: Pick<Reading, 're' | 'im'>): number => Math.atan2(r.im, r.re) * DEG;
export const predictedPhaseDeg = (r: Pick<Reading, 'pred_re' | 'pred_im'>): number => Math.atan2(r.pred_im, r.pred_re) * DEG;

/** A reading with a value to show: not flagged invalid, and finite. */
export function usable(r: Reading): boolean {
  return r.flag !== 'invalid' && Number.isFinite(r.re) && Number.isFinite(r.im);
}

export function flagCounts(readings: readonly Reading[]): Record<ReadingFlag, number> {
  const counts: Record<ReadingFlag, number> = { ok: 0, deviation: 0, invalid: 0 };
  for (const r of readings) counts[r.flag]++;
  return counts;
}

export const bandKey = (step: number, point: number): string => `${step}:${point}`;

export function indexBands(bands: readonly ReportBand[] | undefined): Map<string, ReportBand> {
  return new Map((bands ?? []).map((b) => [bandKey(b.step, b.point), b]));
}

/** Same frequency as planned values are logged: equal up to rounding in the last digits. */
const sameFrequency = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(Math.abs(a), Math.abs(b));

/** Of the frequencies of `readings`, the one nearest `target` on a log scale. */
export function nearestFrequency(readings: readonly Reading[], target: number): number | undefined {
  let best: number | undefined;
  let distance = Infinity;
  for (const r of readings) {
    const d = Math.abs(Math.log(r.frequency_hz / target));
    if (d < distance) {
      distance = d;
      best = r.frequency_hz;
    }
  }
  return best;
}

/** The latest usable reading of each group, or the latest of all when none is usable (a retake wins). */
function latestPerKey(readings: readonly Reading[], key: (r: Reading) => string): Map<string, Reading> {
  const out = new Map<string, Reading>();
  for (const r of readings) {
    const k = key(r);
    const held = out.get(k);
    if (!held || usable(r) || !usable(held)) out.set(k, r);
  }
  return out;
}

export interface NodeSnapshot {
  /** The measured frequency used (the nearest to the mode's). */
  frequency_hz: number;
  /** Node -> its node-to-ground reading there. */
  byNode: Map<string, Reading>;
}

/** The node-to-ground readings at the logged frequency nearest `frequencyHz`; undefined when there are none. */
export function toGroundNear(readings: readonly Reading[], frequencyHz: number): NodeSnapshot | undefined {
  const toGround = readings.filter((r) => r.kind === 'to-ground');
  const f = nearestFrequency(toGround, frequencyHz);
  if (f === undefined) return undefined;
  const at = toGround.filter((r) => sameFrequency(r.frequency_hz, f));
  return { frequency_hz: f, byNode: latestPerKey(at, (r) => r.hi) };
}

export interface Sweep {
  kind: Reading['kind'];
  hi: string;
  lo: string;
  sense?: string;
  /** One reading per frequency, ascending. */
  readings: Reading[];
}

const terminalsKey = (r: Reading) => `${r.kind}\u0000${r.hi}\u0000${r.lo}\u0000${r.sense ?? ''}`;

/** Terminals read at `minPoints` or more frequencies, in the order first read. */
export function sweeps(readings: readonly Reading[], minPoints = 3): Sweep[] {
  const groups = new Map<string, Reading[]>();
  for (const r of readings) {
    const k = terminalsKey(r);
    const list = groups.get(k);
    if (list) list.push(r);
    else groups.set(k, [r]);
  }
  const out: Sweep[] = [];
  for (const list of groups.values()) {
    const perFrequency = [...latestPerKey(list, (r) => String(r.frequency_hz)).values()].sort((a, b) => a.frequency_hz - b.frequency_hz);
    if (perFrequency.length < minPoints) continue;
    const first = list[0];
    out.push({ kind: first.kind, hi: first.hi, lo: first.lo, sense: first.sense, readings: perFrequency });
  }
  return out;
}

export type ReferenceSource = 'transfer' | 'to-ground' | 'largest';

export interface TransferPoint {
  node: string;
  reading: Reading;
  /** re of the reading over re of the reference; undefined when the reading has no usable value. */
  measured?: number;
  /** pred_re over pred_re of the reference. */
  predicted: number;
}

export interface TransferProfile {
  drive: string;
  frequency_hz: number;
  /** Where the normalizing value came from: the drive node's own transfer reading, its node-to-ground reading, or the largest reading. */
  source: ReferenceSource;
  points: TransferPoint[];
}

/**
 * For each drive node, its transfer readings at the logged frequency nearest `frequencyHz`, with re
 * normalized to the drive node's own response: near a mode the transfer impedance from d to s is about
 * φ_s φ_d times a common factor, so the ratio follows the mode shape φ_s / φ_d with its sign (common
 * practice for an isolated resonance).
 */
export function transferProfiles(readings: readonly Reading[], frequencyHz: number): TransferProfile[] {
  const transfers = readings.filter((r) => r.kind === 'transfer' && r.sense !== undefined && r.lo === GROUND);
  const drives = [...new Set(transfers.map((r) => r.hi))];
  return drives.flatMap((drive): TransferProfile[] => {
    const own = transfers.filter((r) => r.hi === drive);
    const f = nearestFrequency(own, frequencyHz)!;
    const at = [...latestPerKey(own.filter((r) => sameFrequency(r.frequency_hz, f)), (r) => r.sense!).values()];
    const reference = referenceFor(drive, f, at, readings);
    if (!reference) return [];
    const points = at.map((r) => ({
      node: r.sense!,
      reading: r,
      measured: usable(r) ? r.re / reference.re : undefined,
      predicted: r.pred_re / reference.pred_re,
    }));
    return [{ drive, frequency_hz: f, source: reference.source, points }];
  });
}

function referenceFor(drive: string, f: number, at: Reading[], all: readonly Reading[]): { re: number; pred_re: number; source: ReferenceSource } | undefined {
  const self = at.find((r) => r.sense === drive && usable(r) && r.re !== 0 && r.pred_re !== 0);
  if (self) return { re: self.re, pred_re: self.pred_re, source: 'transfer' };
  const ground = all.find((r) => r.kind === 'to-ground' && r.hi === drive && sameFrequency(r.frequency_hz, f) && usable(r) && r.re !== 0 && r.pred_re !== 0);
  if (ground) return { re: ground.re, pred_re: ground.pred_re, source: 'to-ground' };
  const measured = at.filter(usable);
  if (measured.length === 0) return undefined;
  const largest = measured.reduce((a, b) => (Math.abs(b.re) > Math.abs(a.re) ? b : a));
  const largestPredicted = at.reduce((a, b) => (Math.abs(b.pred_re) > Math.abs(a.pred_re) ? b : a));
  if (largest.re === 0 || largestPredicted.pred_re === 0) return undefined;
  return { re: Math.abs(largest.re), pred_re: Math.abs(largestPredicted.pred_re), source: 'largest' };
}

/**
 * A phase band as intervals inside [−180°, 180°]: the arc runs counter-clockwise from lo to hi, so one
 * that crosses ±180° becomes two pieces, and a full circle one piece.
 */
export function phaseIntervals(band: Pick<ReportBand, 'phase_lo_deg' | 'phase_hi_deg'>): [number, number][] {
  const wrap = (d: number) => ((((d + 180) % 360) + 360) % 360) - 180;
  const raw = band.phase_hi_deg - band.phase_lo_deg;
  if (raw >= 360) return [[-180, 180]];
  const lo = wrap(band.phase_lo_deg);
  const hi = wrap(band.phase_hi_deg);
  const width = hi >= lo ? hi - lo : hi - lo + 360;
  if (lo + width <= 180) return [[lo, lo + width]];
  return [
    [lo, 180],
    [-180, lo + width - 360],
  ];
}
