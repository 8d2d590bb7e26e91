// Suffixes after numeric data (SCPI-99 vol. 1, 7.7.3 (from memory)): an optional multiplier and a unit,
// case-insensitive. Because case carries no meaning, "M" is milli and mega is "MA"; the standard keeps two
// exceptions people rely on, MHZ (megahertz) and MOHM (megohm). A bare multiplier without the unit
// ("163K") is accepted too, as our convenience.

export type ScpiUnit = 'HZ' | 'V' | 'A' | 'OHM' | 'S';

/** Multiplier mnemonics and their powers of ten, SCPI-99 vol. 1, 7.7.3 (from memory). */
const MULTIPLIERS: Readonly<Record<string, number>> = {
  EX: 18,
  PE: 15,
  T: 12,
  G: 9,
  MA: 6,
  K: 3,
  M: -3,
  U: -6,
  N: -9,
  P: -12,
  F: -15,
  A: -18,
};

const MEGA_EXCEPTIONS: Readonly<Partial<Record<ScpiUnit, string>>> = { HZ: 'MHZ', OHM: 'MOHM' };

/** The power of ten a suffix stands for with a parameter in `unit`, or undefined when it is not valid. */
export function suffixExponent(suffix: string, unit: ScpiUnit): number | undefined {
  const s = suffix.toUpperCase();
  if (s === unit) return 0;
  if (MEGA_EXCEPTIONS[unit] === s) return 6;
  if (s.endsWith(unit)) {
    const multiplier = MULTIPLIERS[s.slice(0, s.length - unit.length)];
    if (multiplier !== undefined) return multiplier;
  }
  return MULTIPLIERS[s];
}

/** Scales decimal text by a power of ten in one rounding step ("163" and 3 give exactly 163000). */
export function scaleDecimal(significand: string, exponent: number): number {
  return Number(`${significand}e${exponent}`);
}
