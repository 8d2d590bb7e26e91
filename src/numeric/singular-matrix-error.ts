// Raised when elimination meets a column with no nonzero pivot candidate. Indices are ORIGINAL ones, so
// a caller can name the node; the step number is only for diagnostics.

export class SingularMatrixError extends Error {
  /** Original index of the column (= node, for a nodal matrix) that had no usable pivot. */
  readonly index: number;
  /** Pivot step at which it happened (position in the column order). */
  readonly step: number;
  /** 'structural' when no candidate row was even present, 'numerical' when all candidates were zero. */
  readonly kind: 'structural' | 'numerical';

  constructor(index: number, step: number, kind: 'structural' | 'numerical') {
    super(`matrix is ${kind}ly singular: no nonzero pivot for column ${index} (elimination step ${step})`);
    this.name = 'SingularMatrixError';
    this.index = index;
    this.step = step;
    this.kind = kind;
  }

  /** Same as `index`: the original column. */
  get column(): number {
    return this.index;
  }
}
