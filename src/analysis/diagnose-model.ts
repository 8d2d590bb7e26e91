// What the diagnosis asks of a circuit model: the readings of the nominal board, and the readings with
// one part changed. Two models answer it: rank-one updates of the factored J (the fast one) and a fresh
// factorization per candidate (the reference it is checked and timed against).
import type { Part } from '../board/types.js';
import type { PartChange } from './diagnose-change.js';
import type { PreparedScan } from './diagnose-scan.js';

export interface ReadingModel {
  readonly scan: PreparedScan;
  /** The parts that may be changed, in the order their indices refer to. */
  readonly parts: readonly Part[];
  /** Readings of the board as the model stands (re and im interleaved, one pair per reading). */
  nominal(out: Float64Array): void;
  /** Readings with parts[part] changed; NaN where the changed circuit has no solution. */
  predict(part: number, change: PartChange, out: Float64Array): void;
  /** The model of the board with parts[part] changed (for a second change on top of it). */
  after(part: number, change: PartChange): ReadingModel;
}
