// Rayleigh–Ritz on the projected operator. lanczos-band.ts keeps T with OP V[:, j] = Σᵢ T[i, j] V[:, i] for
// every expanded column j < e; the basis holds s ≥ e vectors, the s − e not yet expanded forming the
// "window" (the residual block of band Lanczos). The Ritz pairs come from the symmetric e×e leading block,
// and the window rows G give each pair's residual: OP y − θ y = V_window G s, of C-norm ‖G s‖.
import { symmetricEigen } from './dense-symmetric-eigen.js';

export interface RitzPairs {
  /** Ritz values θ of OP (θ = 1/(λ − σ)), in the order of `order`'s indices. */
  theta: Float64Array;
  /** Row-major e×e: column t holds the coordinates of Ritz vector t in the expanded basis. */
  coordinates: Float64Array;
  /** C-norm of OP y − θ y for each pair (a cheap estimate; the driver checks the true residual). */
  residual: Float64Array;
  /** Pair indices by decreasing |θ|, i.e. by increasing distance of λ from σ. */
  order: number[];
  size: number;
}

/** T is column-major with leading dimension ld; e expanded columns, s basis vectors. */
export function ritzPairs(T: Float64Array, ld: number, e: number, s: number): RitzPairs {
  const h = new Float64Array(e * e);
  for (let i = 0; i < e; i++) {
    for (let j = i; j < e; j++) h[i * e + j] = h[j * e + i] = 0.5 * (T[i + j * ld] + T[j + i * ld]);
  }
  const eig = symmetricEigen(e, h);
  const residual = new Float64Array(e);
  for (let t = 0; t < e; t++) {
    let sum = 0;
    for (let w = e; w < s; w++) {
      let g = 0;
      for (let i = 0; i < e; i++) g += T[w + i * ld] * eig.vectors[i * e + t];
      sum += g * g;
    }
    residual[t] = Math.sqrt(sum);
  }
  const order = Array.from({ length: e }, (_, t) => t).sort((a, b) => Math.abs(eig.values[b]) - Math.abs(eig.values[a]));
  return { theta: eig.values, coordinates: eig.vectors, residual, order, size: e };
}

/** Σᵢ coordinates[i, t] · vectors[i]: a Ritz vector (or its C-image) from the basis. */
export function combine(vectors: readonly Float64Array[], r: RitzPairs, t: number): Float64Array {
  const n = vectors[0].length;
  const out = new Float64Array(n);
  for (let i = 0; i < r.size; i++) {
    const c = r.coordinates[i * r.size + t];
    if (c === 0) continue;
    const v = vectors[i];
    for (let q = 0; q < n; q++) out[q] += c * v[q];
  }
  return out;
}
