// The band Lanczos basis with thick restart (Ruhe, Math. Comp. 33, 680, 1979; Wu & Simon, SIAM J. Matrix
// Anal. Appl. 22, 602, 2000), for an operator OP symmetric in the C-inner product.
//
// State: a C-orthonormal basis V (with C·V beside it) of s vectors, the first e of them "expanded", and T
// with OP V[j] = Σ_{i<s} T[i, j] V[i] for every j < e. The s − e vectors not yet expanded form the window,
// the residual block: its width is the number of start vectors, so each degenerate eigenvalue can show up
// that many times. A fresh start vector may join the window at any time (its coupling to the expanded
// columns is zero, the relation stays exact), which is how missing copies are fetched.
import { orthogonalizeAgainst, randomVector, scalePair } from './lanczos-basis.js';
import { combine, ritzPairs, type RitzPairs } from './lanczos-ritz.js';

export interface BandLanczosSetup {
  n: number;
  /** out = OP x. */
  op: (x: Float64Array, out: Float64Array) => Float64Array;
  /** out = C x. */
  applyC: (x: Float64Array, out: Float64Array) => Float64Array;
  /** Removes what C cannot see from a new vector (see shift-invert-capacitance-null.ts), or null. */
  clean: ((v: Float64Array) => void) | null;
  /** Initial basis capacity (grows on demand, never beyond n). */
  capacity: number;
  rand: () => number;
}

/** A new vector whose C-norm fell this far below its norm before orthogonalization adds no direction. */
const DEFLATION = 1e-12;
/** A fresh start vector must keep at least this share of its C-norm after orthogonalization. */
const FRESH_SHARE = 1e-8;

export class BandLanczos {
  /** Basis size s and expanded count e; the window is e..s−1. */
  size = 0;
  expanded = 0;
  capacity: number;
  /** Operator applications so far. */
  solves = 0;
  startVectors = 0;
  private T: Float64Array;
  private V: Float64Array[] = [];
  private CV: Float64Array[] = [];

  constructor(private readonly setup: BandLanczosSetup) {
    this.capacity = Math.min(setup.n, setup.capacity);
    this.T = new Float64Array(this.capacity * this.capacity);
  }

  get window(): number {
    return this.size - this.expanded;
  }

  /** Room for at least `needed` basis vectors (capped at n). */
  grow(needed: number): void {
    const next = Math.min(this.setup.n, needed);
    if (next <= this.capacity) return;
    const bigger = new Float64Array(next * next);
    for (let j = 0; j < this.capacity; j++) bigger.set(this.T.subarray(j * this.capacity, (j + 1) * this.capacity), j * next);
    this.T = bigger;
    this.capacity = next;
  }

  /** Append OP·(random vector), orthogonalized: in OP's range, as Ericsson & Ruhe advise. False if nothing new. */
  addStartVector(): boolean {
    if (this.size >= this.capacity) return false;
    const { n, op, rand } = this.setup;
    for (let attempt = 0; attempt < 3; attempt++) {
      const x = op(randomVector(n, rand), new Float64Array(n));
      this.solves++;
      const o = this.orthogonalize(x);
      if (o.norm > FRESH_SHARE * o.normBefore) {
        this.startVectors++;
        this.append(x, o.cw, o.norm);
        return true;
      }
    }
    return false;
  }

  /** Expand window vectors while there is room (or the basis spans everything). */
  expandAll(): void {
    while (this.expanded < this.size && (this.size < this.capacity || this.capacity === this.setup.n)) this.expandOne();
  }

  /** One band Lanczos step: apply OP to the first window vector and orthogonalize. */
  private expandOne(): void {
    const j = this.expanded;
    const ld = this.capacity;
    const x = this.setup.op(this.V[j], new Float64Array(this.setup.n));
    this.solves++;
    const o = this.orthogonalize(x);
    for (let i = 0; i < this.size; i++) this.T[i + j * ld] = o.coefficients[i];
    // A dependent result means the window loses a vector (deflation); the relation stays exact to rounding.
    if (o.norm > DEFLATION * o.normBefore && this.size < ld) {
      this.T[this.size + j * ld] = o.norm;
      this.append(x, o.cw, o.norm);
    }
    this.expanded++;
  }

  ritz(): RitzPairs {
    return ritzPairs(this.T, this.capacity, this.expanded, this.size);
  }

  /** Ritz vector t of `r` (which must describe the current basis). */
  ritzVector(r: RitzPairs, t: number): Float64Array {
    return combine(this.V, r, t);
  }

  /** Thick restart: keep the `keep` Ritz vectors of `r` nearest σ and the window, T rebuilt in that basis. */
  restart(r: RitzPairs, keep: number): void {
    const e = this.expanded;
    const w = this.window;
    const ld = this.capacity;
    const chosen = r.order.slice(0, keep);
    const kept = chosen.map((t) => {
      const y = combine(this.V, r, t);
      this.setup.clean?.(y);
      return y;
    });
    const coupling = chosen.map((t) => {
      const g = new Float64Array(w);
      for (let row = 0; row < w; row++) {
        for (let i = 0; i < e; i++) g[row] += this.T[e + row + i * ld] * r.coordinates[i * e + t];
      }
      return g;
    });
    this.T.fill(0);
    chosen.forEach((t, i) => {
      this.T[i + i * ld] = r.theta[t];
      for (let row = 0; row < w; row++) this.T[keep + row + i * ld] = coupling[i][row];
    });
    const { n, applyC } = this.setup;
    this.V = [...kept, ...this.V.slice(e, this.size)];
    this.CV = [...kept.map((y) => applyC(y, new Float64Array(n))), ...this.CV.slice(e, this.size)];
    this.expanded = keep;
    this.size = keep + w;
  }

  private orthogonalize(x: Float64Array) {
    return orthogonalizeAgainst(x, this.V, this.CV, this.size, this.setup.applyC, this.setup.clean);
  }

  private append(x: Float64Array, cx: Float64Array, norm: number): void {
    scalePair(x, cx, norm);
    this.V[this.size] = x;
    this.CV[this.size] = cx;
    this.size++;
  }
}
