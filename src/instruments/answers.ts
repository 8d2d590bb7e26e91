// Strict reading of instrument answers: IEEE 488.2 numeric response data (NR1, NR2, NR3; 8.7.2 to 8.7.4
// (from memory)), comma-separated lists with an exact number of fields, and the SCPI overload marker.
// An answer that is not exactly what the command promises is an error naming the command and quoting the
// answer, never a guess: a misread number in an overnight log is worse than a stopped run.

import { AnswerError } from './instrument-errors.js';

/** A reading the instrument marked as not a number: overload, or nothing connected. */
export const INVALID = 'invalid' as const;
export type Invalid = typeof INVALID;
export type Reading = number | Invalid;

export interface Complex {
  re: number;
  im: number;
}

/** How a two-number impedance answer is laid out. */
export type ComplexForm = 'rect' | 'polar-deg' | 'polar-rad';

// NR1: integer; NR2: explicit decimal point; NR3: with exponent. The E is accepted in either case
// (IEEE 488.2's "forgiving listening"); white space, "INF", "NAN" and hex are not numbers here.
const NR1 = /^[+-]?\d+$/;
const NR2 = /^[+-]?(?:\d+\.\d*|\.\d+)$/;
// Written so that no run of digits can be split two ways: a long garbage answer is refused in linear time.
const NR3 = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)[Ee][+-]?\d+$/;

// SCPI-99 vol. 1, 7.2.1 (from memory): +9.9E37 stands for +infinity / overload, -9.9E37 for -infinity,
// 9.91E37 for not-a-number.
const MARKERS = new Set([9.9e37, 9.91e37]);

export type NumericForm = 'NR1' | 'NR2' | 'NR3';

/** Which IEEE 488.2 numeric form the text is in, or undefined when it is none of them. */
export function numericForm(text: string): NumericForm | undefined {
  if (NR1.test(text)) return 'NR1';
  if (NR2.test(text)) return 'NR2';
  if (NR3.test(text)) return 'NR3';
  return undefined;
}

export function isOverloadMarker(value: number): boolean {
  return MARKERS.has(Math.abs(value));
}

/** A list of `count` numbers (any count when omitted); overload markers become INVALID. */
export function readNumbers(answer: string, command: string, count?: number): Reading[] {
  if (answer === '') throw new AnswerError(command, answer, 'is empty');
  const fields = answer.split(',');
  if (count !== undefined && fields.length !== count) {
    throw new AnswerError(command, answer, `has ${fields.length} ${plural(fields.length, 'field')}, expected ${count}`);
  }
  return fields.map((field, i) => {
    if (numericForm(field) === undefined) {
      const where = fields.length > 1 ? `field ${i + 1} ${JSON.stringify(field)} ` : '';
      throw new AnswerError(command, answer, `${where}is not a number in NR1, NR2 or NR3 form`);
    }
    const value = Number(field);
    if (!Number.isFinite(value)) throw new AnswerError(command, answer, `field ${i + 1} is beyond the range of a double`);
    return isOverloadMarker(value) ? INVALID : value;
  });
}

/** One number; overload markers become INVALID. */
export function readNumber(answer: string, command: string): Reading {
  return readNumbers(answer, command, 1)[0];
}

/** One number that must be real: a setting read back, a count. */
export function readValue(answer: string, command: string): number {
  const value = readNumber(answer, command);
  if (value === INVALID) throw new AnswerError(command, answer, 'is the overload marker where a value was expected');
  return value;
}

/** A whole number in NR1 form (a count, a status byte, an error code). */
export function readInteger(answer: string, command: string): number {
  if (!NR1.test(answer)) throw new AnswerError(command, answer, 'is not a whole number (NR1)');
  return Number(answer);
}

/** An impedance or transfer answer of two numbers in `form`, as re/im; INVALID when either is a marker. */
export function readComplex(answer: string, command: string, form: ComplexForm): Complex | Invalid {
  const [a, b] = readNumbers(answer, command, 2);
  if (a === INVALID || b === INVALID) return INVALID;
  if (form === 'rect') return { re: a, im: b };
  if (a < 0) throw new AnswerError(command, answer, 'gives a negative magnitude in polar form');
  const angle = form === 'polar-deg' ? (b * Math.PI) / 180 : b;
  return { re: a * Math.cos(angle), im: a * Math.sin(angle) };
}

/** `count` flags "1" or "0" (NR1), as ROUTe:CLOSe? answers them. */
export function readFlags(answer: string, command: string, count: number): boolean[] {
  if (answer === '') throw new AnswerError(command, answer, 'is empty');
  const fields = answer.split(',');
  if (fields.length !== count) {
    throw new AnswerError(command, answer, `has ${fields.length} ${plural(fields.length, 'flag')}, expected ${count}`);
  }
  return fields.map((field, i) => {
    if (!/^[+]?[01]$/.test(field)) throw new AnswerError(command, answer, `flag ${i + 1} ${JSON.stringify(field)} is not 1 or 0`);
    return field.endsWith('1');
  });
}

function plural(n: number, word: string): string {
  return n === 1 ? word : `${word}s`;
}
