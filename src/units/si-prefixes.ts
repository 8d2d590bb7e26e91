// The SI prefixes that step by powers of 1000 (BIPM SI Brochure, 9th ed. 2019, Table 7). Deca, hecto,
// deci and centi are left out on purpose: nobody writes "10d" for a capacitor, and leaving them out keeps
// single letters such as "h" or "d" from being read as values by accident.

export interface SiPrefix {
  symbol: string;
  name: string;
  exponent: number;
}

export const SI_PREFIXES: readonly SiPrefix[] = [
  { symbol: 'y', name: 'yocto', exponent: -24 },
  { symbol: 'z', name: 'zepto', exponent: -21 },
  { symbol: 'a', name: 'atto', exponent: -18 },
  { symbol: 'f', name: 'femto', exponent: -15 },
  { symbol: 'p', name: 'pico', exponent: -12 },
  { symbol: 'n', name: 'nano', exponent: -9 },
  // The brochure's symbol is the Greek mu; "u" is the usual ASCII stand-in (common practice).
  { symbol: 'µ', name: 'micro', exponent: -6 },
  { symbol: 'm', name: 'milli', exponent: -3 },
  { symbol: 'k', name: 'kilo', exponent: 3 },
  { symbol: 'M', name: 'mega', exponent: 6 },
  { symbol: 'G', name: 'giga', exponent: 9 },
  { symbol: 'T', name: 'tera', exponent: 12 },
  { symbol: 'P', name: 'peta', exponent: 15 },
  { symbol: 'E', name: 'exa', exponent: 18 },
  { symbol: 'Z', name: 'zetta', exponent: 21 },
  { symbol: 'Y', name: 'yotta', exponent: 24 },
];

const BY_SYMBOL = new Map(SI_PREFIXES.map((p) => [p.symbol, p]));

/** Power of ten of a prefix symbol; accepts "u", U+00B5 (micro sign) and U+03BC (Greek mu) for micro. */
export function prefixExponent(symbol: string): number | undefined {
  return BY_SYMBOL.get(symbol === 'u' || symbol === '\u03bc' ? 'µ' : symbol)?.exponent;
}

/** Prefix for an exponent that is a multiple of 3, for engineering notation. */
export function prefixForExponent(exponent: number): SiPrefix | undefined {
  return SI_PREFIXES.find((p) => p.exponent === exponent);
}
