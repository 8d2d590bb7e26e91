// Selected inversion: the entries of Z = (L U)⁻¹ on the pattern of (L + U)ᵀ from the sparse LU factors,
// by the Takahashi equations in the unsymmetric form of Erisman & Tinney, at about the cost of the
// factorization instead of n solves. With U = D Ũ (Ũ unit upper):
//   Ũ Z = D⁻¹ L⁻¹  gives, for k > i:  Z(i, k) = −Σ_m U(i, m) Z(m, k) / d_i      (row i, right of the pivot)
//                                    Z(i, i) = (1 − Σ_m U(i, m) Z(m, i)) / d_i
//   Z L = Ũ⁻¹ D⁻¹  gives, for k > i:  Z(k, i) = −Σ_j Z(k, j) L(j, i)             (column i, below the pivot)
// Pivot i needs only the trailing block Z(i+1.., i+1..), so the work runs from the last pivot back.
import type { LuFactors } from './lu-numeric.js';
import { fittingInversePattern, type SelectedInversePattern } from './selected-inverse-pattern.js';

/** Z on the pattern of (L + U)ᵀ, stored as the pattern's rows (aligned with pattern.zCol). */
export interface SelectedInverse {
  pattern: SelectedInversePattern;
  re: Float64Array;
  im: Float64Array;
}

/**
 * A random error of the size of one rounding of each computed sum (u · Σ|terms|), injected after every
 * entry: running the recurrences once more with it shows how far rounding errors travel (see
 * selected-inverse-check.ts). `seed` makes the run repeatable.
 */
export interface RoundingPerturbation {
  seed: number;
}

const UNIT_ROUNDOFF = 2 ** -53;

/**
 * Z = (L U)⁻¹ on the pattern of (L + U)ᵀ. A `pattern` from earlier factors is reused when it fits
 * (same pivot sequence); otherwise a new one is built.
 */
export function selectedInverse(
  f: LuFactors,
  pattern?: SelectedInversePattern,
  perturbation?: RoundingPerturbation,
): SelectedInverse {
  const p = fittingInversePattern(pattern, f);
  const n = f.n;
  const { zRowPtr, zCol, uRowPtr, uRowCol, uRowSource, uRowTarget } = p;
  const { lColPtr, lRowIdx, lRe, lIm, uRe, uIm, pivotRe, pivotIm } = f;
  const zRe = new Float64Array(zCol.length);
  const zIm = new Float64Array(zCol.length);
  // Dense work vectors over pivot steps: column i of L, and Σ_m U(i, m) Z(m, ·) for row i.
  const lvRe = new Float64Array(n);
  const lvIm = new Float64Array(n);
  const wRe = new Float64Array(n);
  const wIm = new Float64Array(n);
  const inColumn = new Int32Array(n).fill(-1); // inColumn[j] === i ⇔ L(j, i) ≠ 0
  // Only for a perturbed run: moduli (|re| + |im|) of L's column and of the row sums' terms.
  const perturbed = perturbation !== undefined;
  const lvAbs = perturbed ? new Float64Array(n) : lvRe;
  const wAbs = perturbed ? new Float64Array(n) : wRe;
  const noise = perturbed ? xorshift(perturbation.seed) : () => 0;

  for (let i = n - 1; i >= 0; i--) {
    for (let t = lColPtr[i]; t < lColPtr[i + 1]; t++) {
      const j = lRowIdx[t];
      lvRe[j] = lRe[t];
      lvIm[j] = lIm[t];
      wRe[j] = 0;
      wIm[j] = 0;
      inColumn[j] = i;
      if (perturbed) {
        lvAbs[j] = Math.abs(lRe[t]) + Math.abs(lIm[t]);
        wAbs[j] = 0;
      }
    }
    // s accumulates Σ_m U(i, m) Z(m, i) for the diagonal; sAbs the moduli of its terms.
    let sRe = 0;
    let sIm = 0;
    let sAbs = 0;
    for (let q = uRowPtr[i]; q < uRowPtr[i + 1]; q++) {
      const m = uRowCol[q];
      const ur = uRe[uRowSource[q]];
      const ui = uIm[uRowSource[q]];
      // One pass over row m of the trailing block serves both recurrences: by the closure argument it
      // contains every j with L(j, i) ≠ 0; other columns are skipped.
      let aRe = 0;
      let aIm = 0;
      if (!perturbed) {
        for (let t = zRowPtr[m]; t < zRowPtr[m + 1]; t++) {
          const j = zCol[t];
          if (j <= i) break;
          if (inColumn[j] !== i) continue;
          const zr = zRe[t];
          const zi = zIm[t];
          wRe[j] += ur * zr - ui * zi;
          wIm[j] += ur * zi + ui * zr;
          aRe += zr * lvRe[j] - zi * lvIm[j];
          aIm += zr * lvIm[j] + zi * lvRe[j];
        }
      } else {
        const ua = Math.abs(ur) + Math.abs(ui);
        let aAbs = 0;
        for (let t = zRowPtr[m]; t < zRowPtr[m + 1]; t++) {
          const j = zCol[t];
          if (j <= i) break;
          if (inColumn[j] !== i) continue;
          const zr = zRe[t];
          const zi = zIm[t];
          const za = Math.abs(zr) + Math.abs(zi);
          wRe[j] += ur * zr - ui * zi;
          wIm[j] += ur * zi + ui * zr;
          wAbs[j] += ua * za;
          aRe += zr * lvRe[j] - zi * lvIm[j];
          aIm += zr * lvIm[j] + zi * lvRe[j];
          aAbs += za * lvAbs[j];
        }
        aRe += UNIT_ROUNDOFF * aAbs * noise();
        aIm += UNIT_ROUNDOFF * aAbs * noise();
        sAbs += ua * (Math.abs(aRe) + Math.abs(aIm));
      }
      // Z(m, i) = −a; it enters the diagonal sum as U(i, m) · Z(m, i).
      zRe[uRowTarget[q]] = -aRe;
      zIm[uRowTarget[q]] = -aIm;
      sRe -= ur * aRe - ui * aIm;
      sIm -= ur * aIm + ui * aRe;
    }
    // Divide by the pivot once, after the sums, as back substitution does: one rounding instead of one
    // per term, and the same operation order as the solve path this replaces.
    const dr = pivotRe[i];
    const di = pivotIm[i];
    const d2 = dr * dr + di * di;
    for (let t = zRowPtr[i]; t < zRowPtr[i + 1]; t++) {
      const j = zCol[t];
      if (j < i) break;
      let br = j === i ? 1 - sRe : -wRe[j];
      let bi = j === i ? -sIm : -wIm[j];
      if (perturbed) {
        const size = UNIT_ROUNDOFF * (j === i ? 1 + sAbs : wAbs[j]);
        br += size * noise();
        bi += size * noise();
      }
      zRe[t] = (br * dr + bi * di) / d2;
      zIm[t] = (bi * dr - br * di) / d2;
    }
  }
  return { pattern: p, re: zRe, im: zIm };
}

/** Uniform numbers in [−1, 1) from a seeded xorshift32: repeatable, and cheap next to the sums they scale. */
function xorshift(seed: number): () => number {
  let s = (Math.imul(seed | 0, 0x9e3779b1) ^ 0x5bd1e995) >>> 0 || 1;
  return () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 2147483648 - 1;
  };
}
