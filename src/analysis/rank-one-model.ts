// The fast reading model: Z's entries at the terminals of the readings and of the candidate parts are
// gathered once per frequency, and each candidate change then costs O(1) per reading through the
// Sherman–Morrison update (see rank-one.ts).
import type { Part } from '../board/types.js';
import { partAdmittance, type Complex } from '../circuit/admittance.js';
import type { NodeIndex } from '../circuit/node-index.js';
import { admittanceChange, changedPart, type PartChange } from './diagnose-change.js';
import type { ReadingModel } from './diagnose-model.js';
import type { PreparedScan } from './diagnose-scan.js';
import { bilinear, UpdatedEntries, type ImpedanceEntries, type NodePair } from './rank-one.js';

/**
 * A part whose removal would leave nodes floating makes 1 + dy uᵀZu vanish; a leakage conductance
 * (siemens) left across the gap, like a real board's laminate, keeps the circuit solvable and the
 * island reads open.
 */
const LEAKAGE_SIEMENS = 1e-12;

export class RankOneModel implements ReadingModel {
  /** qᵀZp per reading, interleaved. */
  private readonly base: Float64Array;
  /** (qᵀZu)(uᵀZp) per part and reading: [part * readings + reading] interleaved. */
  private readonly products: Float64Array;
  /** uᵀZu per part and frequency group, interleaved. */
  private readonly selfs: Float64Array;
  /** The placed part's admittance per part and group. */
  private readonly placed: Complex[];
  private readonly pairs: NodePair[];

  /** `entries[g]` gives Z at the frequency of scan.groups[g]. */
  constructor(
    readonly scan: PreparedScan,
    readonly parts: readonly Part[],
    private readonly entries: readonly ImpedanceEntries[],
  ) {
    const n = scan.readings.length;
    const groups = scan.groups.length;
    this.pairs = parts.map((p) => partPair(p, scan.index));
    this.base = new Float64Array(2 * n);
    this.products = new Float64Array(2 * n * parts.length);
    this.selfs = new Float64Array(2 * groups * parts.length);
    this.placed = [];
    scan.readings.forEach((r, i) => {
      const z = bilinear(entries[r.group], r.q, r.p);
      this.base[2 * i] = z.re;
      this.base[2 * i + 1] = z.im;
    });
    parts.forEach((part, k) => {
      const u = this.pairs[k];
      scan.groups.forEach((group, g) => {
        const self = bilinear(entries[g], u, u);
        this.selfs[2 * (k * groups + g)] = self.re;
        this.selfs[2 * (k * groups + g) + 1] = self.im;
        this.placed.push(partAdmittance(part, group.omega));
      });
      scan.readings.forEach((r, i) => {
        const left = bilinear(entries[r.group], r.q, u);
        const right = bilinear(entries[r.group], u, r.p);
        const at = 2 * (k * n + i);
        this.products[at] = left.re * right.re - left.im * right.im;
        this.products[at + 1] = left.re * right.im + left.im * right.re;
      });
    });
  }

  nominal(out: Float64Array): void {
    out.set(this.base);
  }

  predict(part: number, change: PartChange, out: Float64Array): void {
    const n = this.scan.readings.length;
    const groups = this.scan.groups.length;
    const gainRe = new Float64Array(groups);
    const gainIm = new Float64Array(groups);
    this.admittanceSteps(part, change).forEach((dy, g) => {
      const s = this.selfAt(part, g);
      // gain = dy / (1 + dy uᵀZu)
      const dRe = 1 + dy.re * s.re - dy.im * s.im;
      const dIm = dy.re * s.im + dy.im * s.re;
      const d2 = dRe * dRe + dIm * dIm;
      gainRe[g] = (dy.re * dRe + dy.im * dIm) / d2;
      gainIm[g] = (dy.im * dRe - dy.re * dIm) / d2;
    });
    const readings = this.scan.readings;
    const offset = 2 * part * n;
    for (let i = 0; i < n; i++) {
      const g = readings[i].group;
      const pRe = this.products[offset + 2 * i];
      const pIm = this.products[offset + 2 * i + 1];
      out[2 * i] = this.base[2 * i] - (gainRe[g] * pRe - gainIm[g] * pIm);
      out[2 * i + 1] = this.base[2 * i + 1] - (gainRe[g] * pIm + gainIm[g] * pRe);
    }
  }

  /** The model of the board with that change made, from the same entries (no new factorization). */
  after(part: number, change: PartChange): RankOneModel {
    const u = this.pairs[part];
    const steps = this.admittanceSteps(part, change);
    const entries = this.entries.map((e, g) => new UpdatedEntries(e, u, steps[g]));
    const parts = this.parts.map((p, k) => (k === part ? changedPart(p, change) : p));
    return new RankOneModel(this.scan, parts, entries);
  }

  /** The admittance change per frequency group, with the leakage kept where removal would float nodes. */
  private admittanceSteps(part: number, change: PartChange): Complex[] {
    const groups = this.scan.groups.length;
    return this.scan.groups.map((group, g) => {
      const dy = admittanceChange(this.parts[part], change, group.omega, this.placed[part * groups + g]);
      const s = this.selfAt(part, g);
      const dRe = 1 + dy.re * s.re - dy.im * s.im;
      const dIm = dy.re * s.im + dy.im * s.re;
      const floating = Math.hypot(dRe, dIm) < 1e-12 * (1 + Math.hypot(dy.re, dy.im) * Math.hypot(s.re, s.im));
      return floating ? { re: dy.re + LEAKAGE_SIEMENS, im: dy.im } : dy;
    });
  }

  private selfAt(part: number, g: number): Complex {
    const at = 2 * (part * this.scan.groups.length + g);
    return { re: this.selfs[at], im: this.selfs[at + 1] };
  }
}

/** u = e_a - e_b of a part (ground ends give -1). */
export function partPair(part: Part, index: NodeIndex): NodePair {
  return { plus: index.row(part.nodes[0]), minus: index.row(part.nodes[1]) };
}
