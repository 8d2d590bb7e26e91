// The grounded Laplacian J(w): the nodal admittance matrix of the board with the ground row and column
// removed. Its sparsity pattern depends only on the board, so it is built once; each frequency only
// rescatters the part admittances into the same value arrays (what lets the LU reuse its symbolic step).
import type { Board, Part } from '../board/types.js';
import type { ComplexCsc, CscPattern } from '../numeric/types.js';
import { partAdmittance } from './admittance.js';
import { NodeIndex } from './node-index.js';

/** Where one part's admittance lands in the CSC value arrays (-1 where an end is ground). */
interface Stamp {
  part: Part;
  aa: number;
  bb: number;
  ab: number;
  ba: number;
}

export class GroundedLaplacian {
  readonly index: NodeIndex;
  readonly pattern: CscPattern;
  private readonly stamps: Stamp[];

  constructor(readonly board: Board) {
    this.index = new NodeIndex(board);
    const n = this.index.size;
    const ends = board.parts.map((p) => [this.index.row(p.nodes[0]), this.index.row(p.nodes[1])] as const);

    // Every diagonal is present (even an isolated node gets an explicit entry), plus both off-diagonals
    // of every part between two non-ground nodes.
    const pairs: number[] = [];
    for (let i = 0; i < n; i++) pairs.push(i * n + i);
    for (const [a, b] of ends) {
      if (a >= 0 && b >= 0) pairs.push(a * n + b, b * n + a);
    }
    // Key = col * n + row, so a numeric sort gives column-major order with sorted rows.
    const keys = Float64Array.from(new Set(pairs)).sort();
    const colPtr = new Int32Array(n + 1);
    const rowIdx = new Int32Array(keys.length);
    const position = new Map<number, number>();
    keys.forEach((key, k) => {
      const col = Math.floor(key / n);
      rowIdx[k] = key - col * n;
      colPtr[col + 1]++;
      position.set(key, k);
    });
    for (let c = 0; c < n; c++) colPtr[c + 1] += colPtr[c];
    this.pattern = { n, colPtr, rowIdx };

    const at = (row: number, col: number) => (row >= 0 && col >= 0 ? position.get(col * n + row)! : -1);
    this.stamps = board.parts.map((part, i) => {
      const [a, b] = ends[i];
      return { part, aa: at(a, a), bb: at(b, b), ab: at(a, b), ba: at(b, a) };
    });
  }

  /** J at angular frequency omega (rad/s), in fresh value arrays over the shared pattern. */
  assemble(omega: number, parts?: (part: Part) => Part): ComplexCsc {
    const nnz = this.pattern.rowIdx.length;
    const re = new Float64Array(nnz);
    const im = new Float64Array(nnz);
    for (const s of this.stamps) {
      const y = partAdmittance(parts ? parts(s.part) : s.part, omega);
      if (s.aa >= 0) {
        re[s.aa] += y.re;
        im[s.aa] += y.im;
      }
      if (s.bb >= 0) {
        re[s.bb] += y.re;
        im[s.bb] += y.im;
      }
      if (s.ab >= 0) {
        re[s.ab] -= y.re;
        im[s.ab] -= y.im;
        re[s.ba] -= y.re;
        im[s.ba] -= y.im;
      }
    }
    return { ...this.pattern, re, im };
  }

  /**
   * The lossless board's capacitance (F) and inverse-inductance (1/H) Laplacians as real values over the
   * same sparse pattern as J, so a shifted K - sigma C can reuse J's symbolic analysis.
   */
  losslessSparse(): { pattern: CscPattern; capacitance: Float64Array; inverseInductance: Float64Array } {
    const nnz = this.pattern.rowIdx.length;
    const capacitance = new Float64Array(nnz);
    const inverseInductance = new Float64Array(nnz);
    for (const s of this.stamps) {
      if (s.part.kind === 'R') continue;
      const m = s.part.kind === 'C' ? capacitance : inverseInductance;
      const g = s.part.kind === 'C' ? s.part.value : 1 / s.part.value;
      if (s.aa >= 0) m[s.aa] += g;
      if (s.bb >= 0) m[s.bb] += g;
      if (s.ab >= 0) {
        m[s.ab] -= g;
        m[s.ba] -= g;
      }
    }
    return { pattern: this.pattern, capacitance, inverseInductance };
  }

  /**
   * The lossless board's two real Laplacians, dense row-major: capacitance C (farads) and inverse
   * inductance K (1/henries), so that J(w) = jwC + K/(jw) when series resistances are dropped.
   * Resistors take no part in the lossless modes.
   */
  losslessMatrices(): { n: number; capacitance: Float64Array; inverseInductance: Float64Array } {
    const n = this.index.size;
    const capacitance = new Float64Array(n * n);
    const inverseInductance = new Float64Array(n * n);
    for (const part of this.board.parts) {
      if (part.kind === 'R') continue;
      const m = part.kind === 'C' ? capacitance : inverseInductance;
      const g = part.kind === 'C' ? part.value : 1 / part.value;
      const a = this.index.row(part.nodes[0]);
      const b = this.index.row(part.nodes[1]);
      if (a >= 0) m[a * n + a] += g;
      if (b >= 0) m[b * n + b] += g;
      if (a >= 0 && b >= 0) {
        m[a * n + b] -= g;
        m[b * n + a] -= g;
      }
    }
    return { n, capacitance, inverseInductance };
  }
}
