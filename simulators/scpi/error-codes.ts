// The standard error/event numbers our simulated instruments report, with their standard texts
// (SCPI-99 vol. 2, chapter 21 (from memory)). Negative numbers are the standard ones; the hundreds digit
// is the class, and the class decides which IEEE 488.2 event status bit an error sets.

export const SCPI_ERRORS = {
  0: 'No error',
  [-100]: 'Command error',
  [-102]: 'Syntax error',
  [-104]: 'Data type error',
  [-108]: 'Parameter not allowed',
  [-109]: 'Missing parameter',
  [-112]: 'Program mnemonic too long',
  [-113]: 'Undefined header',
  [-114]: 'Header suffix out of range',
  [-131]: 'Invalid suffix',
  [-138]: 'Suffix not allowed',
  [-171]: 'Invalid expression',
  [-200]: 'Execution error',
  [-213]: 'Init ignored',
  [-222]: 'Data out of range',
  [-224]: 'Illegal parameter value',
  [-300]: 'Device-specific error',
  [-350]: 'Queue overflow',
  [-410]: 'Query INTERRUPTED',
  [-420]: 'Query UNTERMINATED',
} as const;

export type ScpiErrorCode = keyof typeof SCPI_ERRORS;

/** The standard text of a code; codes outside the table (injected ones) fall back to their class. */
export function standardText(code: number): string {
  const known = (SCPI_ERRORS as Record<number, string>)[code];
  if (known !== undefined) return known;
  return (SCPI_ERRORS as Record<number, string>)[Math.trunc(code / 100) * 100] ?? 'Device-specific error';
}

/** Which error class a code belongs to (SCPI-99 vol. 2, 21.8 (from memory)). */
export type ErrorClass = 'command' | 'execution' | 'device' | 'query' | 'none';

export function errorClass(code: number): ErrorClass {
  if (code <= -100 && code > -200) return 'command';
  if (code <= -200 && code > -300) return 'execution';
  if (code <= -400 && code > -500) return 'query';
  if (code === 0) return 'none';
  // -3xx and device-defined positive codes are device-dependent errors.
  return 'device';
}
