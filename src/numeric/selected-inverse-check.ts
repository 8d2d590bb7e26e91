// How much rounding error the Takahashi recurrences carried into each entry, estimated by running them
// once more with a random error the size of one rounding injected after every sum (Monte Carlo
// arithmetic, Stott Parker 1997) and comparing the two results.
//
// Why it is needed: the recurrences form each entry from the stored trailing block times multipliers of L
// and U/d. After a small pivot those multipliers are large and the products cancel, so errors already
// stored in the block come back magnified, level after level. That is what happens on a lossless lattice
// between resonances, where the diagonal of J nearly cancels and threshold pivoting keeps small diagonal
// pivots; the solves are not hurt the same way. With any loss the real part of J keeps pivots away from
// zero and the estimates stay near machine precision. A worst-case bound (the same recurrences on
// moduli) is no help: it compounds to 1e20 and more where the actual error is 1e-12, because the actual
// errors largely cancel the way the values do, and the rerun reproduces that.
import type { LuFactors } from './lu-numeric.js';
import { selectedInverse, type SelectedInverse } from './selected-inverse-takahashi.js';

/**
 * Estimated relative error |z − z′| / |z| at the given storage positions of `z` (a Takahashi result for
 * `f`), from one perturbed rerun. Typically within a small factor of the actual rounding error, above or
 * below: callers should compare it against a tolerance with some margin.
 */
export function estimateRoundingErrors(
  f: LuFactors,
  z: SelectedInverse,
  positions: Int32Array,
  seed = 0x2545f491,
): Float64Array {
  const rerun = selectedInverse(f, z.pattern, { seed });
  const estimate = new Float64Array(positions.length);
  for (let r = 0; r < positions.length; r++) {
    const t = positions[r];
    if (t < 0) {
      estimate[r] = Infinity;
      continue;
    }
    const size = Math.hypot(z.re[t], z.im[t]);
    const change = Math.hypot(z.re[t] - rerun.re[t], z.im[t] - rerun.im[t]);
    estimate[r] = change === 0 ? 0 : change / size;
  }
  return estimate;
}
