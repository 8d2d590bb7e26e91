// How many eigenvalues of K x = λ C x lie below s, by Sylvester's law of inertia: with K, C symmetric
// positive semidefinite and K − sC nonsingular, the number of negative eigenvalues of K − sC equals the
// number of finite λ < s (directions without capacitance see K ≥ 0 and add none). It lets the Lanczos
// driver prove that no eigenvalue near the shift was skipped (copies of a degenerate one, above all).
//
// The sign count needs a symmetric factorization P A Pᵀ = L D Lᵀ. The LU run with a tiny pivot tolerance
// keeps every pivot on the diagonal, and then U = D Lᵀ, so D is the pivots. Without pivoting for
// stability the computed D is exact only for a matrix off by about ε·growth·‖A‖, so the count is refused
// (null) when an off-diagonal pivot was still needed, when the growth is large, or when some pivot is
// not clearly larger than that error: near an eigenvalue (growth and tiny pivots go together there) a
// sign could flip. Callers place s in a gap of the spectrum and try another point on null.
import type { CscPattern } from './types.js';
import type { LuSymbolic } from './lu-symbolic.js';
import { factorLu } from './lu-numeric.js';
import { SingularMatrixError } from './singular-matrix-error.js';
import { shiftedMatrix } from './shift-invert-real-csc.js';

/** Diagonal pivots are kept unless they fall this far below their column. */
const DIAGONAL_PIVOT_TOLERANCE = 1e-12;
/** Pivot growth beyond which the signs of D are not trusted. */
const GROWTH_LIMIT = 1e8;
/** Every pivot must exceed this many times ε·growth·(largest pivot). */
const PIVOT_MARGIN = 1e3;

/** #{λ < s}, or null when it cannot be read off reliably (see above). s ≤ 0 gives 0: K is semidefinite. */
export function eigenvaluesBelow(sym: LuSymbolic, p: CscPattern, K: Float64Array, C: Float64Array, s: number): number | null {
  if (s <= 0) return 0;
  try {
    const f = factorLu(sym, shiftedMatrix(p, K, C, s), { pivotTolerance: DIAGONAL_PIVOT_TOLERANCE });
    if (f.offDiagonalPivots > 0 || !(f.pivotGrowth <= GROWTH_LIMIT)) return null;
    if (!(f.smallestPivot >= PIVOT_MARGIN * Number.EPSILON * Math.max(f.pivotGrowth, 1) * f.largestPivot)) return null;
    let negative = 0;
    for (let k = 0; k < f.n; k++) {
      if (f.pivotIm[k] !== 0 || f.pivotRe[k] === 0) return null;
      if (f.pivotRe[k] < 0) negative++;
    }
    return negative;
  } catch (err) {
    if (err instanceof SingularMatrixError) return null;
    throw err;
  }
}
