// Reads a physical value written by a person ("10n", "10 nF", "2k2", 1e-8) into SI base units.
// Strings that carry a unit go to mathjs, which knows the units and prefixes; only the forms mathjs does
// not read (a bare prefix without unit, and the RKM code) are handled here, and the everyday form of a number,
// an SI prefix and the expected unit's symbol ("10nF", "2.2 uH"), which mathjs would read the same way.
// mathjs is loaded on first need: it costs about 90 MB resident, too much for a runner that reads only
// such everyday values.

import { createRequire } from 'node:module';
import type { Unit } from 'mathjs';
import { QuantityError } from './quantity-error.js';
import { readRkm } from './rkm.js';
import { prefixExponent } from './si-prefixes.js';
import { UNITS, UNIT_NAMES, type UnitName } from './unit-names.js';

export { QuantityError } from './quantity-error.js';
export { formatQuantity } from './format.js';
export { parsePercent } from './percent.js';
export type { UnitName } from './unit-names.js';

export interface QuantityOptions {
  /** Accept exactly zero (for an ideal, lossless series resistance). Negative values stay rejected. */
  allowZero?: boolean;
}

// `\d+(?:\.\d*)?` rather than `\d+\.?\d*`: the same numbers, but a long run of digits that is no value is
// refused in linear time instead of backtracking with the square of its length.
const NUMBER = String.raw`[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?`;
const PLAIN_NUMBER = new RegExp(`^${NUMBER}$`);
const BARE_PREFIX = new RegExp(`^(${NUMBER})\\s*([yzafpnumkMGTPEZY])$`);
const NUMBER_WITH_UNIT = new RegExp(`^${NUMBER}\\s*[A-Za-z]`);

const PREFIX_AND_SYMBOL = new RegExp(`^(${NUMBER})\\s*([yzafpnumkMGTPEZY]?)(F|H|ohm|Hz|V|A|s)$`);

const require = createRequire(import.meta.url);
let mathjs: typeof import('mathjs') | undefined;
function mathUnit(...args: [string] | [number, string]): Unit {
  mathjs ??= require('mathjs') as typeof import('mathjs');
  return (mathjs.unit as (...a: unknown[]) => Unit)(...args);
}

const EXAMPLES = 'like 10n, 10nF, "10 nF", 2k2, 4R7 or 1e-8';

/** Parses a value into the SI base unit `unit` (farads, henries, ohms, ...). Throws QuantityError. */
export function parseQuantity(input: unknown, unit: UnitName, options: QuantityOptions = {}): number {
  const value = readValue(input, unit);
  const shown = typeof input === 'string' ? JSON.stringify(input) : String(input);
  if (Number.isNaN(value)) throw new QuantityError(`${shown} is not a number`);
  if (!Number.isFinite(value)) throw new QuantityError(`${shown} is not finite`);
  if (value < 0) throw new QuantityError(`${shown} is negative; it must be greater than zero`);
  if (value === 0 && !options.allowZero) throw new QuantityError(`${shown} is zero; it must be greater than zero`);
  return value;
}

function readValue(input: unknown, unit: UnitName): number {
  if (typeof input === 'number') return input;
  if (typeof input !== 'string') {
    const what = input === null || input === undefined ? 'nothing' : Array.isArray(input) ? 'a list' : typeof input;
    throw new QuantityError(`expected a value ${EXAMPLES}, got ${what}`);
  }
  const text = normalise(input.trim());
  const shown = JSON.stringify(input);
  if (text === '') throw new QuantityError('the value is empty');
  if (PLAIN_NUMBER.test(text)) return Number(text);

  const bare = BARE_PREFIX.exec(text);
  if (bare) {
    const exponent = prefixExponent(bare[2]) as number;
    return scaleDecimal(bare[1], exponent);
  }

  const rkm = readRkm(text);
  if (rkm) {
    if (rkm.letter === 'R' && unit !== 'ohm') {
      throw new QuantityError(`${shown} uses the RKM letter R, which marks ohms; expected ${UNITS[unit].plural}`);
    }
    return rkm.value;
  }

  const everyday = PREFIX_AND_SYMBOL.exec(text);
  if (everyday && everyday[3] === UNITS[unit].mathjs) return scaleDecimal(everyday[1], everyday[2] === '' ? 0 : (prefixExponent(everyday[2]) as number));
  if (NUMBER_WITH_UNIT.test(text)) return convertWithUnit(text, shown, unit);
  if (text.includes(',')) throw new QuantityError(`${shown} is not a value: write the decimal point as "." ${EXAMPLES}`);
  throw new QuantityError(`${shown} is not a value: expected a number with an optional SI prefix and unit, ${EXAMPLES}`);
}

/** Puts the spellings people type into the ones mathjs knows: µ/μ -> u, Ω/Ohm/ohms -> ohm. */
function normalise(text: string): string {
  return text
    .replace(/[\u00b5\u03bc]/g, 'u')
    .replace(/[\u03a9\u2126]/g, 'ohm')
    .replace(/ohms?$/i, 'ohm');
}

/** One rounding step from decimal text: "4.7u" gives the double nearest 4.7e-6, not 4.7 * 1e-6. */
function scaleDecimal(mantissa: string, exponent: number): number {
  const [digits, ownExponent] = mantissa.toLowerCase().split('e');
  return Number(`${digits}e${exponent + Number(ownExponent ?? 0)}`);
}

function convertWithUnit(text: string, shown: string, unit: UnitName): number {
  let parsed: Unit;
  try {
    parsed = mathUnit(text);
  } catch {
    throw new QuantityError(`${shown} has a unit that is not known: expected ${UNITS[unit].plural}, ${EXAMPLES}`);
  }
  const expected = mathUnit(UNITS[unit].mathjs);
  if (!parsed.equalBase(expected)) {
    const actual = UNIT_NAMES.find((name) => parsed.equalBase(mathUnit(UNITS[name].mathjs)));
    if (actual) throw new QuantityError(`${shown} is in ${UNITS[actual].plural}, expected ${UNITS[unit].plural}`);
    throw new QuantityError(`${shown} is not in ${UNITS[unit].plural}`);
  }
  return roundOnce(text, parsed.toNumber(UNITS[unit].mathjs), unit);
}

/**
 * mathjs scales by multiplying (33 * 1e-9 = 3.3000000000000004e-8). When the unit is a plain power of
 * ten of the base unit (an SI prefix), rebuild the value from its decimal text instead, so that "33nF"
 * and "33n" give the same double, the one nearest 33e-9.
 */
function roundOnce(text: string, converted: number, unit: UnitName): number {
  const match = new RegExp(`^(${NUMBER})\\s*(.+)$`).exec(text);
  if (!match) return converted;
  let factor: number;
  try {
    factor = mathUnit(1, match[2]).toNumber(UNITS[unit].mathjs);
  } catch {
    return converted;
  }
  const exponent = Math.round(Math.log10(factor));
  return Number(`1e${exponent}`) === factor ? scaleDecimal(match[1], exponent) : converted;
}
