// Shared shapes of the numeric core. Pure data on typed arrays; no knowledge of boards or files.

/** Sparsity pattern of a square matrix in compressed sparse column form (row indices sorted per column). */
export interface CscPattern {
  n: number;
  colPtr: Int32Array; // length n + 1
  rowIdx: Int32Array; // length nnz
}

/** Square complex matrix in CSC form; real and imaginary parts in separate arrays aligned with rowIdx. */
export interface ComplexCsc extends CscPattern {
  re: Float64Array;
  im: Float64Array;
}

/** A complex vector as two aligned real arrays. */
export interface ComplexVector {
  re: Float64Array;
  im: Float64Array;
}
