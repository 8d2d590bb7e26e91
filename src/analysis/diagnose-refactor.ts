// The reference reading model: every candidate change is stamped into a fresh J and factored again
// (replaying the nominal pivot order, so only the numeric LU is repeated). Slow by design; it is what
// the rank-one updates must agree with, and what their speed is measured against.
import type { Board, Part } from '../board/types.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { analyzeLu } from '../numeric/lu-symbolic.js';
import { factorLu, refactorLu, SingularMatrixError, type LuFactors } from '../numeric/lu-numeric.js';
import { solveLuMany } from '../numeric/lu-solve.js';
import type { ComplexVector } from '../numeric/types.js';
import { changedPart, type PartChange } from './diagnose-change.js';
import type { ReadingModel } from './diagnose-model.js';
import type { PreparedScan } from './diagnose-scan.js';
import { bilinear, type ImpedanceEntries } from './rank-one.js';

export class RefactorModel implements ReadingModel {
  private readonly laplacian: GroundedLaplacian;
  private readonly nominalFactors: LuFactors[];
  /** Matrix rows whose columns of Z each group's readings need. */
  private readonly terminals: number[][];

  constructor(
    readonly scan: PreparedScan,
    readonly parts: readonly Part[],
    private readonly board: Board,
  ) {
    this.laplacian = new GroundedLaplacian(board);
    const symbolic = analyzeLu(this.laplacian.pattern);
    this.nominalFactors = scan.groups.map((g) => factorLu(symbolic, this.laplacian.assemble(g.omega)));
    this.terminals = scan.groups.map((g) => {
      const rows = new Set<number>();
      for (const i of g.members) {
        const { p } = scan.readings[i];
        // Z is symmetric, so the columns at the current terminals give every voltage.
        if (p.plus >= 0) rows.add(p.plus);
        if (p.minus >= 0) rows.add(p.minus);
      }
      return [...rows];
    });
  }

  nominal(out: Float64Array): void {
    this.scan.groups.forEach((_, g) => this.readGroup(g, this.nominalFactors[g], out));
  }

  predict(part: number, change: PartChange, out: Float64Array): void {
    const target = this.parts[part];
    const replacement = changedPart(target, change);
    const map = (p: Part) => (p.ref === target.ref ? replacement : p);
    this.scan.groups.forEach((group, g) => {
      const matrix = this.laplacian.assemble(group.omega, map);
      let factors: LuFactors;
      try {
        factors = refactorLu(this.nominalFactors[g], matrix);
      } catch (err) {
        if (!(err instanceof SingularMatrixError)) throw err;
        for (const i of group.members) out[2 * i] = out[2 * i + 1] = NaN;
        return;
      }
      this.readGroup(g, factors, out);
    });
  }

  after(part: number, change: PartChange): RefactorModel {
    const replacement = changedPart(this.parts[part], change);
    const swap = (p: Part) => (p.ref === replacement.ref ? replacement : p);
    return new RefactorModel(this.scan, this.parts.map(swap), { ...this.board, parts: this.board.parts.map(swap) });
  }

  private readGroup(g: number, factors: LuFactors, out: Float64Array): void {
    const n = factors.n;
    const rows = this.terminals[g];
    const rhs = rows.map((row) => {
      const b: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
      b.re[row] = 1;
      return b;
    });
    const solutions = solveLuMany(factors, rhs);
    const columns = new Map(rows.map((row, k) => [row, solutions[k]]));
    const entries: ImpedanceEntries = {
      entry: (i, j) => {
        if (i < 0 || j < 0) return { re: 0, im: 0 };
        // j is always a current terminal of the reading (bilinear reads Z[q, p]).
        const column = columns.get(j)!;
        return { re: column.re[i], im: column.im[i] };
      },
    };
    for (const i of this.scan.groups[g].members) {
      const r = this.scan.readings[i];
      const z = bilinear(entries, r.q, r.p);
      out[2 * i] = z.re;
      out[2 * i + 1] = z.im;
    }
  }
}
