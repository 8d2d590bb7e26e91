// The RKM code of IEC 60062 (from memory): a letter stands where the decimal point would be and gives
// the multiplier, as printed on small parts where a "." could rub off: 4R7 = 4.7 Ω, R47 = 0.47 Ω,
// 2k2 = 2.2 kΩ, 4M7 = 4.7 MΩ, 4n7 = 4.7 nF, 4u7 = 4.7 µF. Only the letters below are read.

export interface RkmReading {
  /** The value in the unit the letter implies (ohms for R, else whatever unit is expected). */
  value: number;
  letter: string;
}

const RKM_EXPONENT: Record<string, number> = {
  R: 0, // ohms only (IEC 60062 uses it for resistance)
  K: 3, // the standard writes kilo as K; lower-case k is just as common on boards
  k: 3,
  M: 6,
  G: 9,
  T: 12,
  p: -12,
  n: -9,
  u: -6,
  'µ': -6,
  '\u03bc': -6,
  m: -3,
};

// A sign is read too, so that "-2k2" is reported as negative rather than as unreadable.
const RKM_PATTERN = /^([+-]?)(\d*)([RKkMGTpnuµ\u03bcm])(\d*)$/;

/** Reads a value in RKM code, or returns undefined if the text is not one. */
export function readRkm(text: string): RkmReading | undefined {
  const match = RKM_PATTERN.exec(text);
  if (!match) return undefined;
  const [, sign, whole, letter, fraction] = match;
  if (whole === '' && fraction === '') return undefined;
  const exponent = RKM_EXPONENT[letter];
  // Build the decimal text and let Number round once, so 4u7 gives exactly the double nearest 4.7e-6.
  const value = Number(`${sign}${whole || '0'}.${fraction || '0'}e${exponent}`);
  return { value, letter };
}
