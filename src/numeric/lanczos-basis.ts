// The Lanczos basis is C-orthonormal (vᵢᵀ C vⱼ = δᵢⱼ), C being the capacitance matrix: the inner product in
// which the shift-invert operator is symmetric. Full reorthogonalization by classical Gram–Schmidt run
// twice ("twice is enough"; Giraud, Langou, Rozložník & van den Eshof, Numer. Math. 101, 2005) keeps it so
// to working precision, which rules out the spurious copies of converged modes that plain three-term
// Lanczos produces.
// C·vᵢ is kept beside each vᵢ, so an inner product against the basis is a plain dot product.
import { dot } from './shift-invert-real-csc.js';

export interface Orthogonalized {
  /** hᵢ = vᵢᵀ C w of the input w against each basis vector. */
  coefficients: Float64Array;
  /** C-norm of what is left, √(wᵀ C w). */
  norm: number;
  /** C-norm of the input, from Pythagoras: √(‖h‖² + norm²). */
  normBefore: number;
  /** C w of what is left. */
  cw: Float64Array;
}

/**
 * w ← w − V Vᵀ C w over the first `count` basis vectors, in place; then `clean` (if given) may change w in
 * ways C cannot see (see shift-invert-capacitance-null.ts) before C w is formed.
 */
export function orthogonalizeAgainst(
  w: Float64Array,
  basis: readonly Float64Array[],
  cBasis: readonly Float64Array[],
  count: number,
  applyC: (x: Float64Array, out: Float64Array) => Float64Array,
  clean?: ((v: Float64Array) => void) | null,
): Orthogonalized {
  const coefficients = new Float64Array(count);
  const g = new Float64Array(count);
  for (let pass = 0; pass < 2; pass++) {
    for (let i = 0; i < count; i++) g[i] = dot(cBasis[i], w);
    for (let i = 0; i < count; i++) {
      const gi = g[i];
      const v = basis[i];
      for (let t = 0; t < w.length; t++) w[t] -= gi * v[t];
      coefficients[i] += gi;
    }
  }
  if (clean) clean(w);
  const cw = applyC(w, new Float64Array(w.length));
  const norm = Math.sqrt(Math.max(dot(w, cw), 0));
  return { coefficients, norm, normBefore: Math.sqrt(dot(coefficients, coefficients) + norm * norm), cw };
}

/** Scale v and C v together by 1/s. */
export function scalePair(v: Float64Array, cv: Float64Array, s: number): void {
  const inv = 1 / s;
  for (let t = 0; t < v.length; t++) {
    v[t] *= inv;
    cv[t] *= inv;
  }
}

/** Deterministic uniform numbers in [0, 1) (mulberry32), so start vectors and results repeat run to run. */
export function seededUniform(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A vector with entries uniform in [−1, 1). */
export function randomVector(n: number, rand: () => number): Float64Array {
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) v[i] = 2 * rand() - 1;
  return v;
}
