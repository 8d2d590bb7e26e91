// Triangular solves with the sparse LU factors. With A(rowOrder, colOrder) = L U:
//   A x = b   →  L U y = b(rowOrder),       x(colOrder) = y
//   Aᵀ x = b  →  Uᵀ Lᵀ z = b(colOrder),     x(rowOrder) = z   (plain transpose, no conjugation)
import type { ComplexVector } from './types.js';
import type { LuFactors } from './lu-numeric.js';

/** Solve A x = b. */
export function solveLu(f: LuFactors, b: ComplexVector): ComplexVector {
  return solveLuMany(f, [b])[0];
}

/** Solve Aᵀ x = b (transpose, not conjugate transpose: what adjoint sensitivities of complex J need). */
export function solveLuTransposed(f: LuFactors, b: ComplexVector): ComplexVector {
  return solveLuMany(f, [b], { transposed: true })[0];
}

/** Solve for several right-hand sides with one set of factors; the work arrays are shared between them. */
export function solveLuMany(
  f: LuFactors,
  rhs: readonly ComplexVector[],
  options: { transposed?: boolean } = {},
): ComplexVector[] {
  const n = f.n;
  const yRe = new Float64Array(n);
  const yIm = new Float64Array(n);
  const inOrder = options.transposed ? f.colOrder : f.rowOrder;
  const outOrder = options.transposed ? f.rowOrder : f.colOrder;
  return rhs.map((b) => {
    if (b.re.length !== n || b.im.length !== n) throw new RangeError(`right-hand side must have length ${n}`);
    for (let k = 0; k < n; k++) {
      yRe[k] = b.re[inOrder[k]];
      yIm[k] = b.im[inOrder[k]];
    }
    if (options.transposed) {
      upperTransposedSolve(f, yRe, yIm);
      lowerTransposedSolve(f, yRe, yIm);
    } else {
      lowerSolve(f, yRe, yIm);
      upperSolve(f, yRe, yIm);
    }
    const x: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
    for (let k = 0; k < n; k++) {
      x.re[outOrder[k]] = yRe[k];
      x.im[outOrder[k]] = yIm[k];
    }
    return x;
  });
}

/** y ← L⁻¹ y, column-oriented (unit diagonal). */
function lowerSolve(f: LuFactors, yRe: Float64Array, yIm: Float64Array): void {
  const { lColPtr: Lp, lRowIdx: Li, lRe, lIm } = f;
  for (let k = 0; k < f.n; k++) {
    const br = yRe[k];
    const bi = yIm[k];
    if (br === 0 && bi === 0) continue;
    for (let s = Lp[k]; s < Lp[k + 1]; s++) {
      const i = Li[s];
      yRe[i] -= lRe[s] * br - lIm[s] * bi;
      yIm[i] -= lRe[s] * bi + lIm[s] * br;
    }
  }
}

/** y ← U⁻¹ y, column-oriented, last column first. */
function upperSolve(f: LuFactors, yRe: Float64Array, yIm: Float64Array): void {
  const { uColPtr: Up, uRowIdx: Ui, uRe, uIm, pivotRe, pivotIm } = f;
  for (let k = f.n - 1; k >= 0; k--) {
    const dr = pivotRe[k];
    const di = pivotIm[k];
    const d2 = dr * dr + di * di;
    const br = yRe[k];
    const bi = yIm[k];
    const vr = (br * dr + bi * di) / d2;
    const vi = (bi * dr - br * di) / d2;
    yRe[k] = vr;
    yIm[k] = vi;
    if (vr === 0 && vi === 0) continue;
    for (let s = Up[k]; s < Up[k + 1]; s++) {
      const i = Ui[s];
      yRe[i] -= uRe[s] * vr - uIm[s] * vi;
      yIm[i] -= uRe[s] * vi + uIm[s] * vr;
    }
  }
}

/** y ← U⁻ᵀ y: a column of U is a row of Uᵀ, so each step is a dot product with solved entries. */
function upperTransposedSolve(f: LuFactors, yRe: Float64Array, yIm: Float64Array): void {
  const { uColPtr: Up, uRowIdx: Ui, uRe, uIm, pivotRe, pivotIm } = f;
  for (let k = 0; k < f.n; k++) {
    let sr = yRe[k];
    let si = yIm[k];
    for (let s = Up[k]; s < Up[k + 1]; s++) {
      const j = Ui[s];
      sr -= uRe[s] * yRe[j] - uIm[s] * yIm[j];
      si -= uRe[s] * yIm[j] + uIm[s] * yRe[j];
    }
    const dr = pivotRe[k];
    const di = pivotIm[k];
    const d2 = dr * dr + di * di;
    yRe[k] = (sr * dr + si * di) / d2;
    yIm[k] = (si * dr - sr * di) / d2;
  }
}

/** y ← L⁻ᵀ y, last row first (unit diagonal). */
function lowerTransposedSolve(f: LuFactors, yRe: Float64Array, yIm: Float64Array): void {
  const { lColPtr: Lp, lRowIdx: Li, lRe, lIm } = f;
  for (let k = f.n - 1; k >= 0; k--) {
    let sr = yRe[k];
    let si = yIm[k];
    for (let s = Lp[k]; s < Lp[k + 1]; s++) {
      const i = Li[s];
      sr -= lRe[s] * yRe[i] - lIm[s] * yIm[i];
      si -= lRe[s] * yIm[i] + lIm[s] * yRe[i];
    }
    yRe[k] = sr;
    yIm[k] = si;
  }
}
