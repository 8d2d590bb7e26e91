// Selected inversion (Takahashi equations, Erisman–Tinney form for an unsymmetric LU) checked against
// mathjs inv on small matrices, and against the project's solve path (one solve per node) on LC lattice
// boards, including boards within 1e-6 of a lossless resonance.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { analyzeLu } from '../../../src/numeric/lu-symbolic.js';
import { factorLu, refactorLu, type LuFactors } from '../../../src/numeric/lu-numeric.js';
import { solveLu } from '../../../src/numeric/lu-solve.js';
import { estimateReciprocalCondition } from '../../../src/numeric/condition.js';
import {
  analyzeSelectedInverse,
  fittingInversePattern,
  inversePatternFits,
} from '../../../src/numeric/selected-inverse-pattern.js';
import { selectedInverse } from '../../../src/numeric/selected-inverse-takahashi.js';
import { entryWorkspace, inverseEntryBySolves } from '../../../src/numeric/selected-inverse-entry.js';
import {
  DEFAULT_SELECTED_INVERSE_TOLERANCE,
  diagonalOfInverse,
  inverseDiagonal,
  inverseEntriesOnPattern,
} from '../../../src/numeric/selected-inverse.js';
import type { ComplexCsc, ComplexVector } from '../../../src/numeric/types.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { GROUND } from '../../../src/board/types.js';
import { makeBoard, type PartSpec } from '../../support/make-board.js';
import { randomComplexMatrix, seededRandom, toMathjs } from './helpers.js';

const EPS = 2 ** -52;
const L_GROUND = 22e-6;
const C_BOND = 10e-9;

/** Dense A⁻¹ as accessor. reference: mathjs inv */
function mathjsInverse(A: ComplexCsc): (i: number, j: number) => { re: number; im: number } {
  const inv = math.inv(toMathjs(A)) as unknown as math.Complex[][];
  return (i, j) => math.complex(inv[i][j]);
}

/** A with its diagonal scaled by `factor` (tiny factors force off-diagonal pivots). */
function scaledDiagonal(A: ComplexCsc, factor: number): ComplexCsc {
  const re = A.re.slice();
  const im = A.im.slice();
  for (let j = 0; j < A.n; j++) {
    for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) {
      if (A.rowIdx[p] === j) {
        re[p] *= factor;
        im[p] *= factor;
      }
    }
  }
  return { ...A, re, im };
}

/** side×side LC lattice: 10 nF between neighbours, 22 µH (with optional series resistance) to ground. */
function latticeBoard(side: number, esr?: number) {
  const specs: PartSpec[] = [];
  const name = (r: number, c: number) => `r${r}c${c}`;
  for (let r = 0; r < side; r++) {
    for (let c = 0; c < side; c++) {
      specs.push(['L', name(r, c), GROUND, L_GROUND, esr]);
      if (c + 1 < side) specs.push(['C', name(r, c), name(r, c + 1), C_BOND]);
      if (r + 1 < side) specs.push(['C', name(r, c), name(r + 1, c), C_BOND]);
    }
  }
  return makeBoard(`lattice-${side}`, specs);
}

/**
 * Lossless resonance (p, q) of the lattice: J = jωC·Λ + I/(jωL) with Λ the grid graph's Laplacian, whose
 * eigenvalues are (2 − 2cos(pπ/side)) + (2 − 2cos(qπ/side)) (textbook: the path graph's Laplacian with
 * free ends has eigenvalues 2 − 2cos(kπ/m)). J is singular where ω²·L·C·λ = 1.
 */
function resonanceHz(side: number, p: number, q: number): number {
  const lambda = 4 - 2 * Math.cos((p * Math.PI) / side) - 2 * Math.cos((q * Math.PI) / side);
  return 1 / (2 * Math.PI * Math.sqrt(L_GROUND * C_BOND * lambda));
}

/** Node-to-ground impedances the N-solve way: a fresh solver, one solve per node (the project's direct path). */
function groundImpedancesBySolves(lap: GroundedLaplacian, frequencyHz: number): ComplexVector {
  const solved = new ImpedanceSolver(lap).at(frequencyHz);
  const out: ComplexVector = { re: new Float64Array(lap.index.size), im: new Float64Array(lap.index.size) };
  lap.index.names.forEach((node, i) => {
    const z = solved.toGround(node);
    out.re[i] = z.re;
    out.im[i] = z.im;
  });
  return out;
}

/** Largest entrywise relative difference max_i |x_i − y_i| / |y_i|. */
function worstEntryDifference(x: ComplexVector, y: ComplexVector): number {
  let worst = 0;
  for (let i = 0; i < y.re.length; i++) {
    worst = Math.max(worst, Math.hypot(x.re[i] - y.re[i], x.im[i] - y.im[i]) / Math.hypot(y.re[i], y.im[i]));
  }
  return worst;
}

/**
 * Bound for a comparison with an independent factorization (mathjs): 1e-9, the target, unless the
 * conditioning forbids it. Two backward-stable inversions of A may differ by about ε·κ(A) relative to
 * ‖A⁻¹‖; 100 covers the growth constants. reference for κ: the project's Hager estimate (a lower bound on κ).
 */
function conditioningBound(f: LuFactors, A: ComplexCsc): number {
  return Math.max(1e-9, (100 * EPS) / estimateReciprocalCondition(f, A));
}

describe('symbolic pattern', () => {
  it('the transposed pattern of L + U is closed under the recurrences, with off-diagonal pivots', () => {
    // Erisman–Tinney: U(i, k) ≠ 0 and L(j, i) ≠ 0 (k, j > i) imply (j, k) in L + U, so Z(k, j) is stored.
    const A = scaledDiagonal(randomComplexMatrix(40, seededRandom(101), { density: 0.08 }), 1e-6);
    const f = factorLu(analyzeLu(A), A);
    expect(f.offDiagonalPivots).toBeGreaterThan(5);
    const n = f.n;
    const inLU = new Set<number>();
    for (let k = 0; k < n; k++) {
      inLU.add(k * n + k);
      for (let s = f.lColPtr[k]; s < f.lColPtr[k + 1]; s++) inLU.add(k * n + f.lRowIdx[s]);
      for (let s = f.uColPtr[k]; s < f.uColPtr[k + 1]; s++) inLU.add(k * n + f.uRowIdx[s]);
    }
    const uRows: number[][] = Array.from({ length: n }, () => []);
    for (let k = 0; k < n; k++) for (let s = f.uColPtr[k]; s < f.uColPtr[k + 1]; s++) uRows[f.uRowIdx[s]].push(k);
    let pairs = 0;
    for (let i = 0; i < n; i++) {
      for (const k of uRows[i]) {
        for (let s = f.lColPtr[i]; s < f.lColPtr[i + 1]; s++) {
          expect(inLU.has(k * n + f.lRowIdx[s])).toBe(true); // key = col * n + row: (j, k)
          pairs++;
        }
      }
    }
    expect(pairs).toBeGreaterThan(100);
  });

  it('stores every diagonal of A⁻¹ when A has its diagonal, and the pattern covers Aᵀ', () => {
    // A(v, v) ≠ 0 puts (rowStep(v), colStep(v)) in L + U, hence Z(colStep(v), rowStep(v)) = (A⁻¹)(v, v) in the
    // transposed pattern, however far off the diagonal the pivots went.
    const A = scaledDiagonal(randomComplexMatrix(30, seededRandom(102), { density: 0.1, symmetric: true }), 1e-7);
    const f = factorLu(analyzeLu(A), A);
    expect(f.offDiagonalPivots).toBeGreaterThan(5);
    expect(Array.from(analyzeSelectedInverse(f).nodeDiagonal).every((t) => t >= 0)).toBe(true);
    const E = inverseEntriesOnPattern(f);
    const stored = new Set<number>();
    for (let j = 0; j < E.n; j++) for (let p = E.colPtr[j]; p < E.colPtr[j + 1]; p++) stored.add(E.rowIdx[p] * E.n + j);
    for (let j = 0; j < A.n; j++) {
      for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) expect(stored.has(j * A.n + A.rowIdx[p])).toBe(true);
    }
  });
});

describe('against mathjs inv', () => {
  it.each([
    ['complex symmetric', 201, 30, 0.12, { symmetric: true }, 1],
    ['complex symmetric, tiny diagonal', 202, 30, 0.12, { symmetric: true }, 1e-6],
    ['nonsymmetric', 203, 35, 0.1, {}, 1],
    ['nonsymmetric, tiny diagonal', 204, 35, 0.1, {}, 1e-6],
    ['nonsymmetric, denser', 205, 20, 0.3, {}, 1e-3],
  ])('%s (seed %i, n=%i): the recurrences alone give A⁻¹ on the pattern', (_l, seed, n, density, opts, diagonal) => {
    const A = scaledDiagonal(randomComplexMatrix(n, seededRandom(seed), { density, ...opts }), diagonal);
    const f = factorLu(analyzeLu(A), A);
    if (diagonal < 1) expect(f.offDiagonalPivots).toBeGreaterThan(0);
    const inv = mathjsInverse(A);
    const bound = conditioningBound(f, A);
    // Unchecked (tolerance Infinity): nothing recomputed, so this tests the Takahashi recurrences themselves.
    const unchecked = inverseDiagonal(f, { tolerance: Infinity });
    expect(unchecked.recomputed.length).toBe(0);
    const E = inverseEntriesOnPattern(f, { tolerance: Infinity });
    let scale = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) scale = Math.max(scale, Math.hypot(inv(i, j).re, inv(i, j).im));
    }
    for (let j = 0; j < n; j++) {
      for (let p = E.colPtr[j]; p < E.colPtr[j + 1]; p++) {
        const z = inv(E.rowIdx[p], j); // reference: mathjs inv
        expect(Math.hypot(E.re[p] - z.re, E.im[p] - z.im) / scale).toBeLessThan(bound);
      }
    }
    for (let v = 0; v < n; v++) {
      const z = inv(v, v); // reference: mathjs inv
      expect(Math.hypot(unchecked.diagonal.re[v] - z.re, unchecked.diagonal.im[v] - z.im) / scale).toBeLessThan(bound);
    }
    // And the checked default agrees with the unchecked values wherever it kept them.
    const checked = inverseDiagonal(f);
    const recomputed = new Set(checked.recomputed);
    for (let v = 0; v < n; v++) {
      if (recomputed.has(v)) continue;
      expect(checked.diagonal.re[v]).toBe(unchecked.diagonal.re[v]);
      expect(checked.diagonal.im[v]).toBe(unchecked.diagonal.im[v]);
    }
  });

  it('without any diagonal in A: entries outside the pattern come from restricted solves', () => {
    const A = randomComplexMatrix(25, seededRandom(206), { density: 0.12, noDiagonal: true });
    const f = factorLu(analyzeLu(A), A);
    const inv = mathjsInverse(A);
    const d = diagonalOfInverse(f);
    const ref: ComplexVector = { re: new Float64Array(25), im: new Float64Array(25) };
    for (let v = 0; v < 25; v++) [ref.re[v], ref.im[v]] = [inv(v, v).re, inv(v, v).im]; // reference: mathjs inv
    let diff = 0;
    let scale = 0;
    for (let v = 0; v < 25; v++) {
      diff = Math.max(diff, Math.hypot(d.re[v] - ref.re[v], d.im[v] - ref.im[v]));
      scale = Math.max(scale, Math.hypot(ref.re[v], ref.im[v]));
    }
    expect(diff / scale).toBeLessThan(conditioningBound(f, A));
  });

  it('inverseEntryBySolves gives any entry Z(a, b) = A⁻¹(colOrder[a], rowOrder[b])', () => {
    const A = scaledDiagonal(randomComplexMatrix(20, seededRandom(207), { density: 0.15 }), 1e-6);
    const f = factorLu(analyzeLu(A), A);
    expect(f.offDiagonalPivots).toBeGreaterThan(0);
    const pattern = analyzeSelectedInverse(f);
    const inv = mathjsInverse(A);
    const work = entryWorkspace(20);
    const bound = conditioningBound(f, A);
    for (let a = 0; a < 20; a++) {
      for (let b = 0; b < 20; b++) {
        const z = inverseEntryBySolves(f, pattern, a, b, work);
        const ref = inv(f.colOrder[a], f.rowOrder[b]); // reference: mathjs inv
        expect(Math.hypot(z.re - ref.re, z.im - ref.im)).toBeLessThan(bound * Math.max(1, Math.hypot(ref.re, ref.im)));
      }
    }
  });

  it('10×10 lattice within 1e-6 of its top lossless resonance agrees as far as the conditioning allows', () => {
    const lap = new GroundedLaplacian(latticeBoard(10));
    const hz = resonanceHz(10, 1, 1) * (1 + 1e-6);
    const A = lap.assemble(2 * Math.PI * hz);
    const f = factorLu(analyzeLu(A), A);
    expect(estimateReciprocalCondition(f, A)).toBeLessThan(1e-6); // nearly singular, as intended
    const inv = mathjsInverse(A);
    const d = diagonalOfInverse(f);
    const ref: ComplexVector = { re: new Float64Array(A.n), im: new Float64Array(A.n) };
    for (let v = 0; v < A.n; v++) [ref.re[v], ref.im[v]] = [inv(v, v).re, inv(v, v).im]; // reference: mathjs inv
    // Relative to each entry: here the resonant mode dominates every diagonal entry, so the normwise
    // bound applies entry by entry. With κ ≈ 1e7 that bound is ~1e-8 rather than 1e-9.
    expect(worstEntryDifference(d, ref)).toBeLessThan(conditioningBound(f, A));
  });
});

describe('lattice boards against the N-solve path', () => {
  const side = 20;
  const lap = new GroundedLaplacian(latticeBoard(side));

  /** Diagonal by selected inversion; the recurrences (not the repair) must supply most of it. */
  function checkedDiagonal(hz: number, mostlyRecurrences: number): ComplexVector {
    const A = lap.assemble(2 * Math.PI * hz);
    const result = inverseDiagonal(factorLu(analyzeLu(A), A));
    expect(result.recomputed.length).toBeLessThanOrEqual(mostlyRecurrences * A.n);
    return result.diagonal;
  }

  it('20×20 lossless lattice at 150 kHz: every node within 1e-9', () => {
    const all = new ImpedanceSolver(lap).at(150e3).allToGround();
    // reference: one solve per node (ImpedanceSolver.toGround before any allToGround)
    const bySolves = groundImpedancesBySolves(lap, 150e3);
    expect(worstEntryDifference(all, bySolves)).toBeLessThan(1e-9);
    expect(worstEntryDifference(checkedDiagonal(150e3, 0.1), bySolves)).toBeLessThan(1e-9);
  });

  it.each([
    ['top of the band (1, 1)', 1, 1, 1 + 1e-6],
    ['mid band (7, 7)', 7, 7, 1 + 1e-6],
    ['bottom of the band (19, 19)', 19, 19, 1 - 1e-6],
  ])('within 1e-6 of the lossless resonance at the %s: every node within 1e-9', (_label, p, q, detune) => {
    const hz = resonanceHz(side, p, q) * detune;
    const solved = new ImpedanceSolver(lap).at(hz);
    expect(solved.reciprocalCondition).toBeLessThan(1e-5); // nearly singular, as intended
    // Both paths invert the same computed factors, so the factorization's error (magnified ~1/rcond against
    // the exact inverse) is common to both and cancels; what remains is the two inversions' own rounding,
    // which the check keeps below 1e-9 even at nodes where the resonant mode is weak.
    // reference: one solve per node
    const bySolves = groundImpedancesBySolves(lap, hz);
    expect(worstEntryDifference(solved.allToGround(), bySolves)).toBeLessThan(1e-9);
    expect(worstEntryDifference(checkedDiagonal(hz, 0.5), bySolves)).toBeLessThan(1e-9);
  });

  it('between resonances on a lossless board the check finds and repairs the entries the recurrences lose', () => {
    // At 165 kHz the diagonal of J nearly cancels, threshold pivoting keeps small pivots, and the large
    // multipliers amplify rounding in the recurrences far beyond the solves' (see selected-inverse-check.ts).
    const A = lap.assemble(2 * Math.PI * 165e3);
    const f = factorLu(analyzeLu(A), A);
    const bySolves = groundImpedancesBySolves(lap, 165e3); // reference: one solve per node
    const unchecked = inverseDiagonal(f, { tolerance: Infinity }).diagonal;
    expect(worstEntryDifference(unchecked, bySolves)).toBeGreaterThan(1e-9); // the recurrences alone fall short here
    const checked = inverseDiagonal(f);
    expect(checked.recomputed.length).toBeGreaterThan(0);
    expect(worstEntryDifference(checked.diagonal, bySolves)).toBeLessThan(1e-9);
    // Every node the recurrences got wrong by more than 1e-10 was flagged by the estimate.
    for (let v = 0; v < A.n; v++) {
      const size = Math.hypot(bySolves.re[v], bySolves.im[v]);
      const error = Math.hypot(unchecked.re[v] - bySolves.re[v], unchecked.im[v] - bySolves.im[v]) / size;
      if (error > 1e-10) expect(checked.estimatedError[v]).toBeGreaterThan(DEFAULT_SELECTED_INVERSE_TOLERANCE);
    }
  });

  it('with coil resistance (0.2 Ω) the recurrences are accurate and nothing is recomputed', () => {
    const lossy = new GroundedLaplacian(latticeBoard(side, 0.2));
    for (const hz of [150e3, 165e3, 175e3]) {
      const A = lossy.assemble(2 * Math.PI * hz);
      const result = inverseDiagonal(factorLu(analyzeLu(A), A));
      expect(result.recomputed.length).toBe(0);
      // reference: one solve per node
      expect(worstEntryDifference(result.diagonal, groundImpedancesBySolves(lossy, hz))).toBeLessThan(1e-9);
    }
  });
});

describe('reuse across frequencies', () => {
  const lap = new GroundedLaplacian(latticeBoard(12));

  it('after refactorLu at another frequency the pattern is shared and the values are right', () => {
    const sym = analyzeLu(lap.pattern);
    const f1 = factorLu(sym, lap.assemble(2 * Math.PI * 150e3));
    const first = inverseDiagonal(f1);
    const f2 = refactorLu(f1, lap.assemble(2 * Math.PI * 190e3));
    expect(f2.refactored).toBe(true);
    expect(inversePatternFits(first.pattern, f2)).toBe(true);
    const second = inverseDiagonal(f2, { pattern: first.pattern });
    expect(second.pattern).toBe(first.pattern);
    // reference: one solve per node with the refactored factors
    const n = f2.n;
    const ref: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
    for (let v = 0; v < n; v++) {
      const e: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
      e.re[v] = 1;
      const x = solveLu(f2, e);
      ref.re[v] = x.re[v];
      ref.im[v] = x.im[v];
    }
    expect(worstEntryDifference(second.diagonal, ref)).toBeLessThan(1e-9);
    // reference: the ImpedanceSolver's N-solve path at 190 kHz
    expect(worstEntryDifference(second.diagonal, groundImpedancesBySolves(lap, 190e3))).toBeLessThan(1e-9);
  });

  it('a refactorization that falls back to a fresh factorization gets a new pattern', () => {
    const rand = seededRandom(301);
    const A1 = randomComplexMatrix(25, rand, { density: 0.15, symmetric: true, diagonalWeight: 2 });
    const sym = analyzeLu(A1);
    const f1 = factorLu(sym, A1);
    const p1 = analyzeSelectedInverse(f1);
    // Zero the first pivot's entry: the replayed pivot collapses at step 0 and factorLu starts over.
    const first = sym.colOrder[0];
    const A2: ComplexCsc = { ...A1, re: A1.re.slice(), im: A1.im.slice() };
    for (let p = A2.colPtr[first]; p < A2.colPtr[first + 1]; p++) {
      if (A2.rowIdx[p] === first) A2.re[p] = A2.im[p] = 0;
    }
    const f2 = refactorLu(f1, A2);
    expect(f2.refactorRejectedAt).toBe(0);
    expect(inversePatternFits(p1, f2)).toBe(false);
    expect(fittingInversePattern(p1, f2)).not.toBe(p1);
    const result = inverseDiagonal(f2, { pattern: p1 }); // the stale pattern is not used
    expect(result.pattern).not.toBe(p1);
    const inv = mathjsInverse(A2);
    let diff = 0;
    let scale = 0;
    for (let v = 0; v < 25; v++) {
      const z = inv(v, v); // reference: mathjs inv
      diff = Math.max(diff, Math.hypot(result.diagonal.re[v] - z.re, result.diagonal.im[v] - z.im));
      scale = Math.max(scale, Math.hypot(z.re, z.im));
    }
    expect(diff / scale).toBeLessThan(conditioningBound(f2, A2));
  });

  it('a perturbed rerun differs from the plain one only at rounding level on a benign matrix', () => {
    const A = randomComplexMatrix(30, seededRandom(302), { density: 0.1, symmetric: true, diagonalWeight: 3 });
    const f = factorLu(analyzeLu(A), A);
    const plain = selectedInverse(f);
    const rerun = selectedInverse(f, plain.pattern, { seed: 7 });
    let change = 0;
    let scale = 0;
    for (let t = 0; t < plain.re.length; t++) {
      change = Math.max(change, Math.hypot(plain.re[t] - rerun.re[t], plain.im[t] - rerun.im[t]));
      scale = Math.max(scale, Math.hypot(plain.re[t], plain.im[t]));
    }
    expect(change).toBeGreaterThan(0); // it did perturb
    expect(change / scale).toBeLessThan(1e-13);
  });
});

describe('SolvedFrequency.allToGround', () => {
  const lap = new GroundedLaplacian(latticeBoard(8, 0.2));

  it('is in the order of index.names, and toGround then reads it without solving', () => {
    const solved = new ImpedanceSolver(lap).at(150e3);
    const all = solved.allToGround();
    expect(all.re.length).toBe(lap.index.names.length);
    const bySolves = groundImpedancesBySolves(lap, 150e3); // reference: one solve per node
    expect(worstEntryDifference(all, bySolves)).toBeLessThan(1e-9);
    lap.index.names.forEach((node, i) => {
      const z = solved.toGround(node);
      expect([z.re, z.im]).toEqual([all.re[i], all.im[i]]);
    });
    expect(solved.worstResidual).toBe(0); // no solve was made
    const kept = all.re[0];
    all.re[0] = 0; // the caller's copy: the cached diagonal is untouched
    expect(solved.toGround(lap.index.names[0]).re).toBe(kept);
    expect(kept).not.toBe(0);
    expect(() => solved.toGround(GROUND)).toThrow(RangeError);
  });
});
