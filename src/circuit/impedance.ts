// Impedances read off J(w)^-1: node to ground (a diagonal entry), two-point (a quadratic form in e_a - e_b)
// and transfer (an off-diagonal entry: voltage at one node per unit current driven into another).
// One factorization per frequency; the symbolic analysis is shared by every frequency of the board.
// All node-to-ground impedances at once come from selected inversion of the same factors.
import { GROUND, type Part } from '../board/types.js';
import type { ComplexCsc, ComplexVector } from '../numeric/types.js';
import { analyzeLu, type LuSymbolic } from '../numeric/lu-symbolic.js';
import { factorLu, refactorLu, SingularMatrixError, type LuFactors } from '../numeric/lu-numeric.js';
import { solveLu } from '../numeric/lu-solve.js';
import { diagonalOfInverse } from '../numeric/selected-inverse.js';
import { fittingInversePattern, type SelectedInversePattern } from '../numeric/selected-inverse-pattern.js';
import { estimateReciprocalCondition, relativeResidual } from '../numeric/condition.js';
import { complexNormInf } from '../numeric/csc.js';
import type { Complex } from './admittance.js';
import { GroundedLaplacian } from './laplacian.js';

export class SingularBoardError extends Error {
  constructor(readonly frequencyHz: number, readonly node: string) {
    super(`J is singular at ${frequencyHz} Hz (no usable pivot at node ${node})`);
    this.name = 'SingularBoardError';
  }
}

export class ImpedanceSolver {
  readonly laplacian: GroundedLaplacian;
  private readonly symbolic: LuSymbolic;
  private last?: LuFactors;
  /** Selected-inversion pattern, shared by the frequencies that replay the same pivot sequence. */
  private readonly inversePattern: InversePatternSlot = {};

  constructor(laplacian: GroundedLaplacian, private readonly partMap?: (part: Part) => Part) {
    this.laplacian = laplacian;
    this.symbolic = analyzeLu(laplacian.pattern);
  }

  /** Factor J at one frequency (Hz). Reuses the previous pivot sequence when it is still sound. */
  at(frequencyHz: number): SolvedFrequency {
    if (!(frequencyHz > 0) || !Number.isFinite(frequencyHz)) {
      throw new RangeError(`frequency must be positive and finite, got ${frequencyHz}`);
    }
    const matrix = this.laplacian.assemble(2 * Math.PI * frequencyHz, this.partMap);
    let factors: LuFactors;
    try {
      factors = this.last ? refactorLu(this.last, matrix) : factorLu(this.symbolic, matrix);
    } catch (err) {
      if (err instanceof SingularMatrixError) {
        throw new SingularBoardError(frequencyHz, this.laplacian.index.names[err.index] ?? `#${err.index}`);
      }
      throw err;
    }
    this.last = factors;
    return new SolvedFrequency(frequencyHz, this.laplacian, matrix, factors, this.inversePattern);
  }
}

export class SolvedFrequency {
  private readonly columns = new Map<number, ComplexVector>();
  private rcondCache?: number;
  private normInf?: number;
  private diagonal?: ComplexVector;
  /** Largest relative residual of any solve made at this frequency. */
  worstResidual = 0;

  constructor(
    readonly frequencyHz: number,
    private readonly laplacian: GroundedLaplacian,
    readonly matrix: ComplexCsc,
    private readonly factors: LuFactors,
    private readonly inversePattern: InversePatternSlot = {},
  ) {}

  /** Reciprocal 1-norm condition estimate of J here; tiny near a resonance of a low-loss board. */
  get reciprocalCondition(): number {
    this.rcondCache ??= estimateReciprocalCondition(this.factors, this.matrix);
    return this.rcondCache;
  }

  /** Voltages at every node for 1 A driven into `node` (and out at ground): column `node` of J^-1. */
  responseTo(node: string): ComplexVector {
    const row = this.laplacian.index.row(node);
    if (row < 0) throw new RangeError('cannot drive current into ground');
    let col = this.columns.get(row);
    if (!col) {
      col = this.solveUnit([[row, 1]]);
      this.columns.set(row, col);
    }
    return col;
  }

  /**
   * Every node-to-ground impedance (the diagonal of J^-1), in the order of laplacian.index.names, by
   * selected inversion: about the cost of one more factorization instead of one solve per node.
   */
  allToGround(): ComplexVector {
    if (!this.diagonal) {
      const pattern = fittingInversePattern(this.inversePattern.current, this.factors);
      this.inversePattern.current = pattern;
      this.diagonal = diagonalOfInverse(this.factors, { pattern });
    }
    return { re: this.diagonal.re.slice(), im: this.diagonal.im.slice() };
  }

  /** Node-to-ground impedance; read from allToGround's result once that has been computed. */
  toGround(node: string): Complex {
    const row = this.laplacian.index.row(node);
    if (row >= 0 && this.diagonal) return { re: this.diagonal.re[row], im: this.diagonal.im[row] };
    const v = this.responseTo(node);
    return { re: v.re[row], im: v.im[row] };
  }

  /** Two-point impedance between hi and lo (lo may be ground). */
  between(hi: string, lo: string): Complex {
    if (lo === GROUND) return this.toGround(hi);
    if (hi === GROUND) return this.toGround(lo);
    const a = this.laplacian.index.row(hi);
    const b = this.laplacian.index.row(lo);
    if (a === b) return { re: 0, im: 0 };
    const v = this.solveUnit([
      [a, 1],
      [b, -1],
    ]);
    return { re: v.re[a] - v.re[b], im: v.im[a] - v.im[b] };
  }

  /** Transfer impedance: voltage at `sense` (to ground) per ampere driven into `drive`. */
  transfer(drive: string, sense: string): Complex {
    if (sense === GROUND) return { re: 0, im: 0 };
    const v = this.responseTo(drive);
    const row = this.laplacian.index.row(sense);
    return { re: v.re[row], im: v.im[row] };
  }

  private solveUnit(entries: [number, number][]): ComplexVector {
    const n = this.matrix.n;
    const b: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
    for (const [row, value] of entries) b.re[row] = value;
    const x = solveLu(this.factors, b);
    this.normInf ??= complexNormInf(this.matrix);
    const r = relativeResidual(this.matrix, x, b, this.normInf);
    if (r > this.worstResidual) this.worstResidual = r;
    return x;
  }
}

/** Holder through which the frequencies of one solver pass the selected-inversion pattern along. */
export interface InversePatternSlot {
  current?: SelectedInversePattern;
}
