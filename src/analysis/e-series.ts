// Preferred values of IEC 60063 (the E series) and the decade arithmetic that tells a wrong-decade part
// ("33 nF fitted where 3.3 nF placed") from a merely drifted one.

export type ESeriesName = 'E6' | 'E12' | 'E24';

/** Mantissas of one decade, ascending (IEC 60063). */
export const E_SERIES: Readonly<Record<ESeriesName, readonly number[]>> = {
  E6: [1.0, 1.5, 2.2, 3.3, 4.7, 6.8],
  E12: [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2],
  E24: [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1],
};

export interface ESeriesMatch {
  series: ESeriesName;
  /** The preferred value nearest on a log scale, in the same unit as the value asked about. */
  value: number;
  /** Its mantissa in [1, 10), as the series lists it. */
  mantissa: number;
  /** Power of ten: value = mantissa * 10^exponent. */
  exponent: number;
  /** asked / value: how far the asked value sits from the preferred one. */
  ratio: number;
}

/** The preferred value of `series` nearest to `value` (> 0) on a log scale. */
export function nearestPreferred(value: number, series: ESeriesName = 'E24'): ESeriesMatch {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`E-series value must be positive and finite, got ${value}`);
  let exponent = Math.floor(Math.log10(value));
  // log10 can land a hair off for exact powers of ten; keep the mantissa in [1, 10).
  if (value / 10 ** exponent >= 10) exponent += 1;
  if (value / 10 ** exponent < 1) exponent -= 1;
  const mantissas = [...E_SERIES[series], 10];
  let best = mantissas[0];
  let bestDistance = Infinity;
  for (const m of mantissas) {
    const distance = Math.abs(Math.log(value / (m * 10 ** exponent)));
    if (distance < bestDistance) {
      best = m;
      bestDistance = distance;
    }
  }
  if (best === 10) {
    best = 1;
    exponent += 1;
  }
  // toPrecision drops the binary noise of m * 10^e (3.3 * 1e-9 -> 3.3e-9 exactly as written).
  const preferred = Number((best * 10 ** exponent).toPrecision(3));
  return { series, value: preferred, mantissa: best, exponent, ratio: value / preferred };
}

/**
 * The E series a part of this tolerance is normally drawn from (common practice: E6 for 20 %, E12 for
 * 10 %, E24 for 5 % and tighter). Without a stated tolerance, E24, the finest of the three.
 */
export function seriesForTolerance(tolerance?: number): ESeriesName {
  if (tolerance === undefined || tolerance <= 0.05) return 'E24';
  if (tolerance <= 0.1) return 'E12';
  return 'E6';
}

/**
 * Whole decades between a fitted and a placed value when the fit is a power of ten away from the
 * placed part (within `slack` as a ratio, default 25 %), else 0: 33 nF against 3.3 nF gives 1.
 */
export function decadeOffset(fitted: number, placed: number, slack = 0.25): number {
  if (!(fitted > 0) || !(placed > 0)) return 0;
  const decades = Math.log10(fitted / placed);
  const whole = Math.round(decades);
  if (whole === 0) return 0;
  return Math.abs(decades - whole) <= Math.log10(1 + slack) ? whole : 0;
}

const COUNT_WORDS = ['zero', 'one', 'two', 'three', 'four', 'five', 'six'];

/** "one decade high", "two decades low"; "" for 0. */
export function describeDecades(offset: number): string {
  if (offset === 0) return '';
  const size = Math.abs(offset);
  const count = COUNT_WORDS[size] ?? String(size);
  return `${count} decade${size === 1 ? '' : 's'} ${offset > 0 ? 'high' : 'low'}`;
}
