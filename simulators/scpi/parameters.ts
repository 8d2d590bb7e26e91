// Parameter types of the command tree and the checks that turn lexed data into values. Each failure is a
// ScpiError with the standard code: wrong kind of data -104, bad mnemonic -224, out of range -222, bad or
// unexpected suffix -131/-138, too many -108, too few -109.

import type { DataElement } from './lexer.js';
import { SCPI_INFINITY, SCPI_NAN, nr3 } from './response-format.js';
import { ScpiError } from './scpi-error.js';
import { scaleDecimal, suffixExponent, type ScpiUnit } from './suffix.js';

interface BaseSpec {
  /** Named in error messages. */
  name: string;
  optional?: boolean;
}

export interface NumericSpec extends BaseSpec {
  kind: 'numeric';
  min: number;
  max: number;
  /** What DEFault selects. */
  default: number;
  /** The unit suffixes may carry; without it a suffix is refused (-138). */
  unit?: ScpiUnit;
  /** Rounded to the nearest integer before the range check (IEEE 488.2 rounding rule (from memory)). */
  integer?: boolean;
}

export interface ChoiceSpec extends BaseSpec {
  kind: 'choice';
  /** Long forms; the upper-case part is the short form. */
  choices: readonly string[];
}

export interface BooleanSpec extends BaseSpec {
  kind: 'boolean';
}

export interface ChannelsSpec extends BaseSpec {
  kind: 'channels';
  min: number;
  max: number;
}

export interface StringSpec extends BaseSpec {
  kind: 'string';
}

/** MINimum, MAXimum or DEFault after a query such as `FREQ? MAX` (SCPI-99 vol. 1, 7.2.1.4 (from memory)). */
export interface LimitSpec extends BaseSpec {
  kind: 'limit';
}

export type ParamSpec = NumericSpec | ChoiceSpec | BooleanSpec | ChannelsSpec | StringSpec | LimitSpec;

export type Limit = 'MIN' | 'MAX' | 'DEF';
export type ParamValue = number | string | boolean | readonly number[] | undefined;

/** The short form of a long-form mnemonic: its leading upper-case part ("FREQuency" -> "FREQ"). */
export function shortForm(long: string): string {
  return /^[A-Z0-9_]*/.exec(long)?.[0] ?? long;
}

/** SCPI-99 vol. 1, 6.2.1 (from memory): exactly the short or the long form, in any case. */
export function mnemonicMatches(typed: string, long: string): boolean {
  const t = typed.toUpperCase();
  return t === long.toUpperCase() || t === shortForm(long).toUpperCase();
}

export function convertParameters(header: string, specs: readonly ParamSpec[], data: readonly DataElement[]): ParamValue[] {
  if (data.length > specs.length) {
    throw new ScpiError(-108, specs.length === 0 ? `${header} takes no parameter` : `${header} takes at most ${specs.length} parameter${specs.length > 1 ? 's' : ''}, got ${data.length}`);
  }
  const missing = specs.slice(data.length).find((s) => !s.optional);
  if (missing) throw new ScpiError(-109, `${header} needs ${missing.name}`);
  return specs.map((spec, i) => (i < data.length ? convertOne(header, spec, data[i]) : undefined));
}

function convertOne(header: string, spec: ParamSpec, element: DataElement): ParamValue {
  switch (spec.kind) {
    case 'numeric':
      return numeric(header, spec, element);
    case 'choice':
      return choice(header, spec, element);
    case 'boolean':
      return boolean(header, spec, element);
    case 'channels':
      return channels(header, spec, element);
    case 'string':
      if (element.type !== 'string') throw wrongType(header, spec, element, 'a quoted string');
      return element.value;
    case 'limit':
      return limit(header, spec, element);
  }
}

function wrongType(header: string, spec: ParamSpec, element: DataElement, expected: string): ScpiError {
  return new ScpiError(-104, `${header}: ${spec.name} must be ${expected}, got ${describe(element)}`);
}

function describe(element: DataElement): string {
  const kind = { number: 'a number', nondecimal: 'a number', word: 'the word', string: 'the string', channels: 'the channel list', expression: 'the expression' }[element.type];
  return `${kind} ${element.text.length > 24 ? `${element.text.slice(0, 24)}...` : element.text}`;
}

const LIMIT_WORDS: readonly [string, Limit][] = [
  ['MINimum', 'MIN'],
  ['MAXimum', 'MAX'],
  ['DEFault', 'DEF'],
];

function limitWord(word: string): Limit | undefined {
  return LIMIT_WORDS.find(([long]) => mnemonicMatches(word, long))?.[1];
}

/** SCPI-99 numeric mnemonics for infinities and not-a-number (vol. 1, 7.2.1.5 (from memory)). */
const SPECIAL_NUMBERS: readonly [string, number][] = [
  ['INFinity', SCPI_INFINITY],
  ['NINFinity', -SCPI_INFINITY],
  ['NAN', SCPI_NAN],
];

function numeric(header: string, spec: NumericSpec, element: DataElement): number {
  let value: number;
  if (element.type === 'number') {
    let exponent = 0;
    if (element.suffix !== undefined) {
      if (spec.unit === undefined) throw new ScpiError(-138, `${header}: ${spec.name} takes no unit, got "${element.suffix}"`);
      const found = suffixExponent(element.suffix, spec.unit);
      if (found === undefined) throw new ScpiError(-131, `${header}: "${element.suffix}" is not a suffix for ${spec.unit}`);
      exponent = found;
    }
    value = scaleDecimal(element.decimal.significand, element.decimal.exponent + exponent);
  } else if (element.type === 'nondecimal') {
    value = element.value;
  } else if (element.type === 'word') {
    const l = limitWord(element.text);
    if (l !== undefined) return { MIN: spec.min, MAX: spec.max, DEF: spec.default }[l];
    const special = SPECIAL_NUMBERS.find(([long]) => mnemonicMatches(element.text, long));
    if (special === undefined) throw new ScpiError(-224, `${header}: ${spec.name} must be a number, MIN, MAX or DEF, got ${element.text}`);
    value = special[1];
  } else {
    throw wrongType(header, spec, element, 'a number');
  }
  if (spec.integer) value = Math.round(value);
  if (!(value >= spec.min && value <= spec.max)) {
    const unit = spec.unit === undefined ? '' : ` ${spec.unit.toLowerCase() === 'hz' ? 'Hz' : spec.unit}`;
    throw new ScpiError(-222, `${header}: ${spec.name} ${nr3(value)}${unit} is outside ${nr3(spec.min)} to ${nr3(spec.max)}${unit}`);
  }
  return value;
}

function choice(header: string, spec: ChoiceSpec, element: DataElement): string {
  if (element.type !== 'word') throw wrongType(header, spec, element, `one of ${spec.choices.join(', ')}`);
  const found = spec.choices.find((c) => mnemonicMatches(element.text, c));
  if (found === undefined) throw new ScpiError(-224, `${header}: ${spec.name} must be one of ${spec.choices.join(', ')}, got ${element.text}`);
  return found;
}

/** SCPI-99 vol. 1, 7.3 (from memory): ON/OFF, or a number that is true when it rounds to non-zero. */
function boolean(header: string, spec: BooleanSpec, element: DataElement): boolean {
  if (element.type === 'word') {
    if (mnemonicMatches(element.text, 'ON')) return true;
    if (mnemonicMatches(element.text, 'OFF')) return false;
    throw new ScpiError(-224, `${header}: ${spec.name} must be ON, OFF, 1 or 0, got ${element.text}`);
  }
  if (element.type === 'number' && element.suffix === undefined) {
    return Math.round(scaleDecimal(element.decimal.significand, element.decimal.exponent)) !== 0;
  }
  if (element.type === 'nondecimal') return element.value !== 0;
  throw wrongType(header, spec, element, 'ON, OFF, 1 or 0');
}

function channels(header: string, spec: ChannelsSpec, element: DataElement): number[] {
  if (element.type !== 'channels') throw wrongType(header, spec, element, 'a channel list like (@101,103:105)');
  // Bounds first, so that a range such as (@1:99999999999) is refused before anything is expanded.
  for (const [from, to] of element.ranges) {
    for (const end of [from, to]) {
      if (!(end >= spec.min && end <= spec.max)) throw new ScpiError(-222, `${header}: channel ${end > 1e15 ? nr3(end) : end} is outside ${spec.min} to ${spec.max}`);
    }
  }
  const out: number[] = [];
  for (const [from, to] of element.ranges) {
    const step = to >= from ? 1 : -1;
    for (let c = from; c !== to + step; c += step) out.push(c);
  }
  return out;
}

function limit(header: string, spec: LimitSpec, element: DataElement): Limit {
  if (element.type !== 'word') throw wrongType(header, spec, element, 'MIN, MAX or DEF');
  const l = limitWord(element.text);
  if (l === undefined) throw new ScpiError(-224, `${header}: ${spec.name} must be MIN, MAX or DEF, got ${element.text}`);
  return l;
}
