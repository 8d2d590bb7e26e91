// Tolerances are read only when written with a percent sign ("5%", "5 %", "±5%"). A bare number is
// refused rather than guessed: 5 could mean 5 % or 500 %, 0.05 could mean 5 % or 0.05 %, and a silent
// misreading of a tolerance would go unnoticed in every result that depends on it.

import { QuantityError } from './quantity-error.js';

// `\d+(?:\.\d*)?` rather than `\d+\.?\d*`: the same numbers, but no backtracking that grows with the square
// of a long run of digits.
const PERCENT = /^(?:±|\+-|\+\/-)?\s*(\d+(?:\.\d*)?|\.\d+)\s*%$/;

/** Parses "5%" into the fraction 0.05. Accepts 0 % up to (not including) 100 %. Throws QuantityError. */
export function parsePercent(input: unknown): number {
  if (typeof input === 'number') {
    throw new QuantityError(`${input} has no percent sign; write the tolerance as "${input}%" (a bare number is ambiguous)`);
  }
  if (typeof input !== 'string') throw new QuantityError(`expected a percentage like "5%", got ${describe(input)}`);
  const text = input.trim();
  if (text.startsWith('-')) throw new QuantityError(`${JSON.stringify(input)} is negative; a tolerance is a size, like "5%"`);
  const match = PERCENT.exec(text);
  if (!match) throw new QuantityError(`${JSON.stringify(input)} is not a percentage like "5%" or "0.5%"`);
  const percent = Number(match[1]);
  if (percent >= 100) throw new QuantityError(`${JSON.stringify(input)} is 100 % or more; a tolerance must be below 100 %`);
  return percent / 100;
}

function describe(input: unknown): string {
  if (input === null || input === undefined) return 'nothing';
  return Array.isArray(input) ? 'a list' : typeof input;
}
