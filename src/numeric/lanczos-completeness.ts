// Did the iteration skip an eigenvalue that belongs among the k nearest σ? Lanczos cannot tell by itself:
// from one start block it sees only as many copies of a degenerate eigenvalue as the block has vectors.
// Sylvester's inertia (shift-invert-inertia.ts) counts the eigenvalues within any radius R of σ, so the
// check compares that count with the converged pairs inside R.
//
// R is put in a clear gap of the Ritz spectrum just beyond the k-th distance, never on an eigenvalue,
// so the two factorizations behind the count stay well conditioned. Everything inside R must be
// converged first, so Ritz values tied (or nearly tied) with the k-th one are converged too.
export type Verdict =
  /** The count inside R equals (or, impossibly, falls short of) the converged pairs inside R. */
  | { kind: 'complete'; counted: number; found: number }
  /** Ritz values inside the gap boundary are not all converged yet: converge the first `want`. */
  | { kind: 'converge-more'; want: number }
  /** The count shows `fresh` eigenvalues inside R that no Ritz value stands for: add start vectors. */
  | { kind: 'missing'; want: number; fresh: number }
  /** No usable gap or no reliable count. */
  | { kind: 'no-count' };

/** Two distances closer than this (relative to |σ| + d) are not a gap to put R in. */
const GAP = 1e-5;
/** Where to try R inside the gap, in turn, when a count at the previous point is refused. */
const GAP_POINTS = [0.5, 0.3, 0.7];

/**
 * pairDistances: |λ − σ| of the converged pairs (the nearest Ritz values, purified); ritzDistances: |λ − σ|
 * of every Ritz value, ascending; countInside(R) = #{λ : |λ − σ| < R} or null.
 */
export function judgeCompleteness(
  pairDistances: readonly number[],
  ritzDistances: readonly number[],
  k: number,
  sigma: number,
  countInside: (radius: number) => number | null,
): Verdict {
  const sorted = [...pairDistances].sort((a, b) => a - b);
  const d = sorted[k - 1];
  const gap = GAP * (Math.abs(sigma) + d);
  let b = k;
  while (b < ritzDistances.length && ritzDistances[b] - Math.max(ritzDistances[b - 1], d) < gap) b++;
  if (b >= ritzDistances.length) return { kind: 'no-count' };
  if (b > sorted.length) return { kind: 'converge-more', want: b };
  const inner = Math.max(ritzDistances[b - 1], sorted[b - 1], d);
  const outer = ritzDistances[b];
  for (const t of GAP_POINTS) {
    const radius = inner + t * (outer - inner);
    const counted = countInside(radius);
    if (counted === null) continue;
    const found = sorted.filter((x) => x < radius).length;
    if (counted > found) return { kind: 'missing', want: counted, fresh: counted - found };
    return { kind: 'complete', counted, found };
  }
  return { kind: 'no-count' };
}
