// The spectral transformation of Ericsson & Ruhe (Math. Comp. 35, 1251, 1980): for K x = λ C x and a shift
// σ, the operator OP = (K − σC)⁻¹ C has the same eigenvectors with θ = 1/(λ − σ), so the eigenvalues
// nearest σ become the largest |θ| and Lanczos finds them first. OP is self-adjoint in the (semi-)inner
// product of C; directions with C x = 0 (infinite λ) map to θ = 0 and never come up.
//
// One LU of K − σC serves every application. If σ lands on an eigenvalue closely enough that the
// factorization is singular, σ is moved by a small relative step and the result says so.
import type { CscPattern } from './types.js';
import type { LuSymbolic } from './lu-symbolic.js';
import { factorLu, type LuFactors } from './lu-numeric.js';
import { SingularMatrixError } from './singular-matrix-error.js';
import { SingularPencilError } from './lanczos-errors.js';
import { realMatVec, shiftedMatrix } from './shift-invert-real-csc.js';
import { isRealFactorization, solveRealLu } from './shift-invert-real-solve.js';

export interface ShiftedFactorization {
  /** The shift actually factored (rad²/s²). */
  sigma: number;
  requestedSigma: number;
  factors: LuFactors;
  /** Set when σ had to be moved off a singular factorization. */
  note?: string;
  /** Factorizations it took (more than 1 when σ was moved). */
  attempts: number;
}

/** Pivots this far below the largest mean the factorization is singular to working precision. */
const SINGULAR_PIVOT_RATIO = 64 * Number.EPSILON;
/** Relative steps tried in turn when K − σC is singular. */
const NUDGES = [1e-8, 1e-6, 1e-4];

/**
 * LU of K − σC. `scale` is a typical eigenvalue of the pencil, used to size the step when σ = 0 (where a
 * singular K, i.e. zero-frequency modes, makes K − σC singular).
 */
export function factorShifted(
  sym: LuSymbolic,
  p: CscPattern,
  K: Float64Array,
  C: Float64Array,
  sigma: number,
  scale: number,
): ShiftedFactorization {
  const tried: number[] = [];
  let lastColumn = -1;
  for (let attempt = 0; attempt <= NUDGES.length; attempt++) {
    const step = attempt === 0 ? 0 : NUDGES[attempt - 1] * (sigma !== 0 ? Math.abs(sigma) : scale);
    const s = sigma + step;
    tried.push(s);
    try {
      const factors = factorLu(sym, shiftedMatrix(p, K, C, s));
      if (!isRealFactorization(factors)) throw new Error('internal: the LU of a real matrix came out complex');
      if (factors.n > 0 && !(factors.smallestPivot > SINGULAR_PIVOT_RATIO * factors.largestPivot)) {
        lastColumn = factors.colOrder[smallestPivotStep(factors)];
        continue;
      }
      const note =
        attempt === 0
          ? undefined
          : `K − σC is singular at the requested shift (it sits on an eigenvalue); shifted σ by ` +
            `${(step / (sigma !== 0 ? Math.abs(sigma) : scale)).toExponential(0)} relative, to ${s.toExponential(6)} rad²/s²`;
      return { sigma: s, requestedSigma: sigma, factors, note, attempts: attempt + 1 };
    } catch (err) {
      if (!(err instanceof SingularMatrixError)) throw err;
      lastColumn = err.index;
    }
  }
  throw new SingularPencilError(lastColumn, tried);
}

function smallestPivotStep(f: LuFactors): number {
  let best = 0;
  for (let k = 1; k < f.n; k++) if (Math.abs(f.pivotRe[k]) < Math.abs(f.pivotRe[best])) best = k;
  return best;
}

/** out = (K − σC)⁻¹ C x. */
export type ShiftInvertOperator = (x: Float64Array, out: Float64Array) => Float64Array;

export function shiftInvertOperator(f: ShiftedFactorization, p: CscPattern, C: Float64Array): ShiftInvertOperator {
  const cx = new Float64Array(p.n);
  const work = new Float64Array(p.n);
  return (x, out) => solveRealLu(f.factors, realMatVec(p, C, x, cx), out, work);
}
