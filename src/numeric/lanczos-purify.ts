// Turning a converged Ritz vector into a mode of K x = λ C x, and judging it by the TRUE residual.
//
// Rounding leaves the Lanczos vectors a small part in the null space of C, which the C-inner product cannot
// see. One more application of OP = (K − σC)⁻¹ C removes it, since OP maps every vector into its range
// (Ericsson & Ruhe 1980, the "purification" of the eigenvectors). λ is then the Rayleigh quotient of the
// purified vector, accurate to the square of its error.
import type { CscPattern } from './types.js';
import type { ShiftInvertOperator } from './shift-invert-operator.js';
import { dot, norm2, realMatVec } from './shift-invert-real-csc.js';

export interface PurifiedPair {
  lambda: number;
  x: Float64Array;
  /** ‖Kx − λCx‖₂ / ((‖K‖₁ + |λ|·‖C‖₁)·‖x‖₂); NaN when x has no capacitive part at all. */
  residual: number;
}

/** Below this, xᵀKx relative to ‖K‖·‖x‖² is rounding on a zero-frequency mode. */
const ZERO_STIFFNESS = 1e-13;

export function purifiedPair(
  y: Float64Array,
  op: ShiftInvertOperator,
  p: CscPattern,
  K: Float64Array,
  C: Float64Array,
  kNorm: number,
  cNorm: number,
): PurifiedPair {
  const x = op(y, new Float64Array(p.n));
  const kx = realMatVec(p, K, x, new Float64Array(p.n));
  const cx = realMatVec(p, C, x, new Float64Array(p.n));
  const xKx = dot(x, kx);
  const xCx = dot(x, cx);
  const xNorm = norm2(x);
  let lambda = xKx / xCx;
  // K is semidefinite, so a negative or vanishing quotient can only be rounding around λ = 0.
  if (xCx > 0 && (lambda < 0 || Math.abs(xKx) <= ZERO_STIFFNESS * kNorm * xNorm * xNorm)) lambda = 0;
  if (!(xCx > 0) || !Number.isFinite(lambda)) return { lambda: NaN, x, residual: NaN };
  for (let i = 0; i < kx.length; i++) kx[i] -= lambda * cx[i];
  return { lambda, x, residual: norm2(kx) / ((kNorm + Math.abs(lambda) * cNorm) * xNorm) };
}
