// The profile's limits, checked before anything is sent: a request outside them is refused with one line
// naming the value, the limit and the profile file, and the instrument never hears of it.

import { formatQuantity, type UnitName } from '../units/quantity.js';
import { LimitError } from './instrument-errors.js';
import type { InstrumentProfile, Range } from './profile-types.js';

export function requireFinite(profile: InstrumentProfile, what: string, value: number): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new LimitError(`${profile.name}: ${what} ${String(value)} is not a finite number; nothing was sent`, what);
  }
}

/** Refuses `value` outside `range` (profile field `field`, e.g. "limits.frequency"). */
export function requireWithin(profile: InstrumentProfile, what: string, value: number, range: Range, field: string, unit?: UnitName): void {
  requireFinite(profile, what, value);
  const show = (v: number) => (unit ? formatQuantity(v, unit) : String(v));
  if (value < range.min) {
    throw new LimitError(`${profile.name}: ${what} ${show(value)} is below ${field}.min = ${show(range.min)} of ${profile.file}; nothing was sent`, `${field}.min`);
  }
  if (value > range.max) {
    throw new LimitError(`${profile.name}: ${what} ${show(value)} is above ${field}.max = ${show(range.max)} of ${profile.file}; nothing was sent`, `${field}.max`);
  }
}

export function requireWholeNumber(profile: InstrumentProfile, what: string, value: number): void {
  if (!Number.isInteger(value)) throw new LimitError(`${profile.name}: ${what} ${String(value)} is not a whole number; nothing was sent`, what);
}
