// Readings of a board with one part changed, without factoring J again (Sherman–Morrison, J. Sherman and
// W. Morrison, Ann. Math. Stat. 21, 124 (1950)).
//
// A part between nodes a and b whose admittance changes by dy turns J into J' = J + dy u uᵀ with
// u = e_a - e_b (a ground end contributes nothing). Then
//     Z' = Z - dy (Z u)(uᵀ Z) / (1 + dy uᵀ Z u)
// and every reading is a bilinear form qᵀ Z p in two node pairs (current in at p, voltage across q), so
//     qᵀ Z' p = qᵀ Z p - dy (qᵀ Z u)(uᵀ Z p) / (1 + dy uᵀ Z u).
// J is complex symmetric (every part is reciprocal), so Z is too and all three numbers are entries of the
// columns of Z at the terminals: one factorization and a few solves per frequency, then O(1) per reading
// for any value of dy.
import type { Complex } from '../circuit/admittance.js';
import type { SolvedFrequency } from '../circuit/impedance.js';
import type { ComplexVector } from '../numeric/types.js';

/** The vector e_plus - e_minus by matrix rows; -1 stands for ground (a zero vector part). */
export interface NodePair {
  plus: number;
  minus: number;
}

/** Entries of Z = J^-1 by matrix row; any index -1 (ground) gives 0. */
export interface ImpedanceEntries {
  entry(i: number, j: number): Complex;
}

const ZERO: Complex = { re: 0, im: 0 };

/** Entries read off the columns of one factored J, solving for a column the first time it is needed. */
export class SolvedEntries implements ImpedanceEntries {
  private readonly columns = new Map<number, ComplexVector>();

  constructor(
    private readonly solved: Pick<SolvedFrequency, 'responseTo'>,
    private readonly names: readonly string[],
  ) {}

  entry(i: number, j: number): Complex {
    if (i < 0 || j < 0) return ZERO;
    // Z is symmetric: read from whichever column is already at hand.
    const have = this.columns.get(j) ?? this.columns.get(i);
    if (have) {
      const row = this.columns.has(j) ? i : j;
      return { re: have.re[row], im: have.im[row] };
    }
    const col = this.solved.responseTo(this.names[j]);
    this.columns.set(j, col);
    return { re: col.re[i], im: col.im[i] };
  }
}

/** qᵀ Z p. */
export function bilinear(z: ImpedanceEntries, q: NodePair, p: NodePair): Complex {
  const a = z.entry(q.plus, p.plus);
  const b = z.entry(q.plus, p.minus);
  const c = z.entry(q.minus, p.plus);
  const d = z.entry(q.minus, p.minus);
  return { re: a.re - b.re - c.re + d.re, im: a.im - b.im - c.im + d.im };
}

/** The four numbers a reading needs for one changed part: qᵀZp, qᵀZu, uᵀZp and uᵀZu. */
export interface RankOneCoupling {
  base: Complex;
  left: Complex;
  right: Complex;
  self: Complex;
}

export function coupling(z: ImpedanceEntries, q: NodePair, p: NodePair, u: NodePair): RankOneCoupling {
  return { base: bilinear(z, q, p), left: bilinear(z, q, u), right: bilinear(z, u, p), self: bilinear(z, u, u) };
}

/** qᵀ Z' p after the part's admittance changes by dy (Sherman–Morrison). */
export function updatedReading(c: RankOneCoupling, dy: Complex): Complex {
  const g = updateGain(dy, c.self);
  const lr = mul(c.left, c.right);
  const t = mul(g, lr);
  return { re: c.base.re - t.re, im: c.base.im - t.im };
}

/** dy / (1 + dy uᵀZu): what multiplies (qᵀZu)(uᵀZp) in the update. */
export function updateGain(dy: Complex, self: Complex): Complex {
  const d = mul(dy, self);
  return div(dy, { re: 1 + d.re, im: d.im });
}

/**
 * Z after one part changed, as entries computed from the entries before: lets a second change be tried
 * on top of a first (a greedy two-part search) without any new factorization.
 */
export class UpdatedEntries implements ImpedanceEntries {
  private readonly gain: Complex;
  private readonly zu = new Map<number, Complex>();

  constructor(
    private readonly before: ImpedanceEntries,
    private readonly u: NodePair,
    dy: Complex,
  ) {
    this.gain = updateGain(dy, bilinear(before, u, u));
  }

  entry(i: number, j: number): Complex {
    if (i < 0 || j < 0) return ZERO;
    const z = this.before.entry(i, j);
    const t = mul(this.gain, mul(this.zuAt(i), this.zuAt(j)));
    return { re: z.re - t.re, im: z.im - t.im };
  }

  /** (Z u)_i, kept since every entry of the same row needs it again. */
  private zuAt(i: number): Complex {
    let v = this.zu.get(i);
    if (!v) {
      const a = this.before.entry(i, this.u.plus);
      const b = this.before.entry(i, this.u.minus);
      v = { re: a.re - b.re, im: a.im - b.im };
      this.zu.set(i, v);
    }
    return v;
  }
}

export function mul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** a / b by Smith's method (no overflow for large |b|). */
export function div(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const t = b.im / b.re;
    const d = b.re + b.im * t;
    return { re: (a.re + a.im * t) / d, im: (a.im - a.re * t) / d };
  }
  const t = b.re / b.im;
  const d = b.re * t + b.im;
  return { re: (a.re * t + a.im) / d, im: (a.im * t - a.re) / d };
}
