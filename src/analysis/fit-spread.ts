// The measured spread of the parts against their stated tolerance, from a fit of the parts one by one.
// Per kind, over the parts the readings determine well (a relative uncertainty below half the part's
// tolerance; the others sit near nominal because of the prior and would make the spread look small):
//   deviation d_k = fitted/nominal - 1,   spread = sample standard deviation of d_k,
//   partSpread = √(spread² - mean(σ_k²)): the spread of the parts themselves, the fit's own uncertainty
//   taken out (variances of independent errors add; common practice).
// A tolerance is a bound, not a standard deviation: parts spread evenly over ±t have a standard deviation
// of t/√3 (common practice), so `spreadToTolerance` near 0.58 or below is what a part series that keeps
// its tolerance shows, and `withinTolerance` counts the parts inside their stated bound.
import type { PartKind } from '../board/types.js';

export interface FittedPartValue {
  kind: PartKind;
  nominal: number;
  fitted: number;
  /** Relative standard uncertainty of the fitted value (σ of its logarithm). */
  relativeSigma: number;
  /** Stated tolerance as a fraction, if any. */
  tolerance?: number;
}

export interface KindSpread {
  kind: PartKind;
  /** Parts of this kind fitted on their own. */
  parts: number;
  /** Of these, the ones the readings determine well enough to count. */
  counted: number;
  meanDeviation: number;
  spread: number;
  fitUncertainty: number;
  partSpread: number;
  /** The largest tolerance stated for the counted parts; undefined if none states one. */
  tolerance?: number;
  spreadToTolerance?: number;
  withinTolerance: number;
}

export function measuredSpread(values: readonly FittedPartValue[]): KindSpread[] {
  const kinds: PartKind[] = ['C', 'L', 'R'];
  return kinds.flatMap((kind): KindSpread[] => {
    const all = values.filter((v) => v.kind === kind);
    if (all.length === 0) return [];
    const counted = all.filter((v) => Number.isFinite(v.relativeSigma) && (v.tolerance === undefined || v.relativeSigma < v.tolerance / 2));
    const deviations = counted.map((v) => v.fitted / v.nominal - 1);
    const n = deviations.length;
    const mean = n > 0 ? deviations.reduce((s, d) => s + d, 0) / n : Number.NaN;
    const spread = n > 1 ? Math.sqrt(deviations.reduce((s, d) => s + (d - mean) ** 2, 0) / (n - 1)) : Number.NaN;
    const fitUncertainty = n > 0 ? Math.sqrt(counted.reduce((s, v) => s + v.relativeSigma ** 2, 0) / n) : Number.NaN;
    const tolerances = counted.flatMap((v) => (v.tolerance === undefined ? [] : [v.tolerance]));
    const result: KindSpread = {
      kind,
      parts: all.length,
      counted: n,
      meanDeviation: mean,
      spread,
      fitUncertainty,
      partSpread: Math.sqrt(Math.max(0, spread * spread - fitUncertainty * fitUncertainty)),
      withinTolerance: counted.filter((v, i) => v.tolerance !== undefined && Math.abs(deviations[i]) <= v.tolerance).length,
    };
    if (tolerances.length > 0) {
      result.tolerance = Math.max(...tolerances);
      result.spreadToTolerance = spread / result.tolerance;
    }
    return [result];
  });
}
