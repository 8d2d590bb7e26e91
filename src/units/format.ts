// Prints a value in engineering notation with an SI prefix: 1.634e5 Hz -> "163.4 kHz".

import { prefixForExponent } from './si-prefixes.js';
import { UNITS, type UnitName } from './unit-names.js';

/** Formats `value` (SI base unit) with `digits` significant digits (trailing zeros dropped). */
export function formatQuantity(value: number, unit: UnitName, digits = 4): string {
  const symbol = UNITS[unit].symbol;
  if (!Number.isFinite(value)) return `${value} ${symbol}`;
  if (value === 0) return `0 ${symbol}`;
  const sign = value < 0 ? '-' : '';
  const size = Math.abs(value);
  let exponent = Math.floor(Math.log10(size) / 3) * 3;
  let mantissa = Number((size / 10 ** exponent).toPrecision(digits));
  // Rounding can carry into the next prefix (999.96 -> 1000) or log10 can land a hair low.
  if (mantissa >= 1000) {
    exponent += 3;
    mantissa = Number((size / 10 ** exponent).toPrecision(digits));
  } else if (mantissa < 1) {
    exponent -= 3;
    mantissa = Number((size / 10 ** exponent).toPrecision(digits));
  }
  const prefix = exponent === 0 ? '' : prefixForExponent(exponent)?.symbol;
  if (prefix === undefined) return `${sign}${Number(size.toPrecision(digits)).toExponential()} ${symbol}`;
  return `${sign}${mantissa} ${prefix}${symbol}`;
}
