// How numbers and terminals are written in the report: engineering notation with SI prefixes (the
// units module), degrees with one decimal, shares as percentages.
import { GROUND } from '../board/types.js';
import type { Reading } from '../analysis/readings.js';
import { formatQuantity } from '../units/format.js';
import type { UnitName } from '../units/unit-names.js';

export const ohms = (v: number, digits = 4): string => (Number.isFinite(v) ? formatQuantity(v, 'ohm', digits) : '—');
export const hertz = (v: number, digits = 4): string => (Number.isFinite(v) ? formatQuantity(v, 'Hz', digits) : '—');
export const degrees = (v: number): string => (Number.isFinite(v) ? `${v.toFixed(1)}°` : '—');
export const percent = (fraction: number, decimals = 1): string => (Number.isFinite(fraction) ? `${(fraction * 100).toFixed(decimals)} %` : '—');

/** A value in its SI unit, or a plain number for a dimensionless one. */
export function quantity(value: number, unit: UnitName | undefined, digits = 4): string {
  if (!Number.isFinite(value)) return value === Infinity ? '∞' : '—';
  if (unit === undefined) return Number(value.toPrecision(digits)).toString();
  return formatQuantity(value, unit, digits);
}

/** "n3 to ground", "n3 – n4", "n1 → n5 (transfer)". */
export function terminals(r: Pick<Reading, 'kind' | 'hi' | 'lo' | 'sense'>): string {
  if (r.kind === 'transfer') return `${r.hi} → ${r.sense ?? '?'}${r.lo === GROUND ? '' : ` (lo ${r.lo})`}`;
  if (r.lo === GROUND) return `${r.hi} to ground`;
  return `${r.hi} – ${r.lo}`;
}

/** Plain numbers on linear axes: up to 3 significant digits. */
export const plain = (v: number): string => (v === 0 ? '0' : Number(v.toPrecision(3)).toString());
