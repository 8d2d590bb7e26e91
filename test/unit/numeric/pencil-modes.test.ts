// Lossless modes K x = ω² C x: hand-solved circuits, a textbook ladder spectrum, and mathjs references.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { generalizedModes, inverseParticipationRatio, modeShape, type GeneralizedModes } from '../../../src/numeric/pencil-modes.js';
import { seededRandom } from './helpers.js';

/** Dense Laplacian stamps: a two-terminal element of value g between a and b (b = -1 for ground). */
function stamp(n: number, m: Float64Array, a: number, b: number, g: number): void {
  m[a * n + a] += g;
  if (b >= 0) {
    m[b * n + b] += g;
    m[a * n + b] -= g;
    m[b * n + a] -= g;
  }
}

/** max over modes of ‖K x − ω² C x‖∞ relative to (‖K‖ + ω²‖C‖)‖x‖. */
function pencilResidual(n: number, K: Float64Array, C: Float64Array, modes: GeneralizedModes): number {
  const m = modes.omega2.length;
  const kNorm = Math.max(...K.map(Math.abs));
  const cNorm = Math.max(...C.map(Math.abs));
  let worst = 0;
  for (let col = 0; col < m; col++) {
    const x = modeShape(modes, col);
    const w2 = modes.omega2[col];
    for (let i = 0; i < n; i++) {
      let kx = 0;
      let cx = 0;
      for (let j = 0; j < n; j++) {
        kx += K[i * n + j] * x[j];
        cx += C[i * n + j] * x[j];
      }
      worst = Math.max(worst, Math.abs(kx - w2 * cx) / (n * (kNorm + w2 * cNorm)));
    }
  }
  return worst;
}

function toRows(n: number, a: Float64Array): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
}

/** Real parts of mathjs eigenvalues of a (possibly nonsymmetric) real matrix, ascending. */
function mathjsEigenvalues(rows: number[][]): number[] {
  const values = math.eigs(rows).values as unknown as (number | math.Complex)[];
  return values.map((v) => (typeof v === 'number' ? v : v.re)).sort((a, b) => a - b);
}

describe('generalizedModes', () => {
  it('hand-built board with singular C and singular K', () => {
    // Nodes 0 and 1 have C0 to ground; node 2 has no capacitor and sits between inductors L (0–2, 2–1);
    // node 3 hangs off node 1 by a resistor only, so it has neither C nor L. Nothing inductive goes to
    // ground, so K is singular too.
    // Hand solution: node 2 follows statically (x2 = (x0 + x1)/2), leaving 2L in series between two C0:
    // ω² = 1/(L·C0) for the antisymmetric mode (handbook LC resonance with 2L and C0/2 in series) and
    // ω² = 0 for the uniform drift that no inductor resists.
    const n = 4;
    const L = 22e-6;
    const C0 = 10e-9;
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    stamp(n, C, 0, -1, C0);
    stamp(n, C, 1, -1, C0);
    stamp(n, K, 0, 2, 1 / L);
    stamp(n, K, 2, 1, 1 / L);
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(2);
    expect(modes.indeterminateCount).toBe(1);
    expect(modes.omega2.length).toBe(2);
    expect(modes.omega2[0]).toBe(0);
    expect(modes.omega[0]).toBe(0);
    expect(modes.omega2[1] * L * C0).toBeCloseTo(1, 12);
    const drift = modeShape(modes, 0);
    [1, 1, 1, 0].forEach((v, i) => expect(drift[i]).toBeCloseTo(v / Math.sqrt(3), 12));
    const swing = modeShape(modes, 1);
    expect(Math.abs(swing[0])).toBeCloseTo(1 / Math.sqrt(2), 12);
    expect(swing[1]).toBeCloseTo(-swing[0], 12);
    expect(swing[2]).toBeCloseTo(0, 12);
    expect(swing[3]).toBe(0);
    expect(pencilResidual(n, K, C, modes)).toBeLessThan(1e-13);
  });

  it('capacitor network floating as a whole (C singular without zero rows)', () => {
    // Two nodes joined by C, each with L to ground: the common mode sees no capacitance (infinite
    // frequency); the differential mode is 2L in series with C: ω² = 1/(2LC) (handbook LC resonance).
    const n = 2;
    const L = 10e-6;
    const Cv = 4.7e-9;
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    stamp(n, C, 0, 1, Cv);
    stamp(n, K, 0, -1, 1 / L);
    stamp(n, K, 1, -1, 1 / L);
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(1);
    expect(modes.indeterminateCount).toBe(0);
    expect(modes.omega2[0] * 2 * L * Cv).toBeCloseTo(1, 12);
    const x = modeShape(modes, 0);
    expect(Math.abs(x[0])).toBeCloseTo(Math.SQRT1_2, 12);
    expect(x[1]).toBeCloseTo(-x[0], 12);
  });

  it('floating capacitor network plus a node without capacitance', () => {
    // As above, with node 2 tied to node 0 by L2 only. Condensing it gives 1/L + 1/L2 − (1/L2)²·L2 = 1/L
    // on node 0, so the mode is unchanged (ω² = 1/(2LC), by hand) and node 2 simply follows node 0.
    const n = 3;
    const L = 10e-6;
    const L2 = 33e-6;
    const Cv = 4.7e-9;
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    stamp(n, C, 0, 1, Cv);
    stamp(n, K, 0, -1, 1 / L);
    stamp(n, K, 1, -1, 1 / L);
    stamp(n, K, 0, 2, 1 / L2);
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(2);
    expect(modes.indeterminateCount).toBe(0);
    expect(modes.omega2.length).toBe(1);
    expect(modes.omega2[0] * 2 * L * Cv).toBeCloseTo(1, 12);
    const x = modeShape(modes, 0);
    expect(Math.abs(x[0])).toBeCloseTo(1 / Math.sqrt(3), 12);
    expect(x[1]).toBeCloseTo(-x[0], 12);
    expect(x[2]).toBeCloseTo(x[0], 12);
    expect(pencilResidual(n, K, C, modes)).toBeLessThan(1e-13);
  });

  it('LC ladder with free ends follows the path-graph spectrum, including ω = 0', () => {
    // handbook: the path-graph Laplacian on N nodes has eigenvalues 2 − 2cos(kπ/N), k = 0..N−1, so a
    // ladder of C to ground and L between neighbours resonates at ω_k² = (2 − 2cos(kπ/N)) / (LC).
    const n = 24;
    const L = 22e-6;
    const Cv = 10e-9;
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    for (let i = 0; i < n; i++) stamp(n, C, i, -1, Cv);
    for (let i = 0; i + 1 < n; i++) stamp(n, K, i, i + 1, 1 / L);
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(0);
    expect(modes.omega2[0]).toBe(0);
    for (let k = 0; k < n; k++) {
      const expected = (2 - 2 * Math.cos((k * Math.PI) / n)) / (L * Cv);
      expect(Math.abs(modes.omega2[k] - expected)).toBeLessThan(1e-11 * (4 / (L * Cv)));
    }
    // The uniform ω = 0 mode: every node equal, IPR = 1/N.
    expect(inverseParticipationRatio(modeShape(modes, 0))).toBeCloseTo(1 / n, 12);
    expect(pencilResidual(n, K, C, modes)).toBeLessThan(1e-13);
  });

  it('positive definite pencil agrees with mathjs eigs of C⁻¹K', () => {
    const n = 12;
    const rand = seededRandom(201);
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      stamp(n, C, i, -1, 1e-9 * (1 + rand()));
      stamp(n, K, i, -1, 1e4 * (0.5 + rand()));
      for (let j = i + 1; j < n; j++) {
        if (rand() < 0.3) stamp(n, C, i, j, 1e-9 * rand());
        if (rand() < 0.3) stamp(n, K, i, j, 1e5 * rand());
      }
    }
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(0);
    // reference: mathjs inv, multiply, eigs
    const ref = mathjsEigenvalues(math.multiply(math.inv(toRows(n, C)), toRows(n, K)) as number[][]);
    ref.forEach((v, k) => expect(Math.abs(modes.omega2[k] - v) / v).toBeLessThan(1e-10));
    expect(pencilResidual(n, K, C, modes)).toBeLessThan(1e-13);
    for (let k = 0; k < modes.omega2.length; k++) {
      const x = modeShape(modes, k);
      expect(Math.hypot(...x)).toBeCloseTo(1, 13);
    }
  });

  it('condenses nodes without capacitance like a mathjs Schur complement', () => {
    const n = 14;
    const rand = seededRandom(202);
    const inert = new Set([2, 5, 6, 11]);
    const K = new Float64Array(n * n);
    const C = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      if (!inert.has(i)) stamp(n, C, i, -1, 1e-9 * (1 + rand()));
      stamp(n, K, i, -1, 1e4 * (0.5 + rand()));
      for (let j = i + 1; j < n; j++) {
        if (!inert.has(i) && !inert.has(j) && rand() < 0.3) stamp(n, C, i, j, 1e-9 * rand());
        if (rand() < 0.4) stamp(n, K, i, j, 1e5 * rand());
      }
    }
    const modes = generalizedModes(n, K, C);
    expect(modes.infiniteCount).toBe(inert.size);
    expect(modes.indeterminateCount).toBe(0);
    // reference: mathjs — S = Kcc − Kcz Kzz⁻¹ Kzc, then eigs(Ccc⁻¹ S)
    const c = [...Array(n).keys()].filter((i) => !inert.has(i));
    const z = [...inert];
    const pick = (m: Float64Array, rows: number[], cols: number[]) => rows.map((i) => cols.map((j) => m[i * n + j]));
    const S = math.subtract(
      pick(K, c, c),
      math.multiply(pick(K, c, z), math.multiply(math.inv(pick(K, z, z)), pick(K, z, c))),
    ) as number[][];
    const ref = mathjsEigenvalues(math.multiply(math.inv(pick(C, c, c)), S) as number[][]);
    ref.forEach((v, k) => expect(Math.abs(modes.omega2[k] - v) / v).toBeLessThan(1e-10));
    // Whole-node shapes satisfy every row, including the condensed ones (K x = 0 there).
    expect(pencilResidual(n, K, C, modes)).toBeLessThan(1e-13);
  });

  it('a board with no capacitance at all has only infinite modes', () => {
    const n = 3;
    const K = new Float64Array(n * n);
    stamp(n, K, 0, 1, 1);
    stamp(n, K, 1, 2, 1);
    const modes = generalizedModes(n, K, new Float64Array(n * n));
    expect(modes.omega2.length).toBe(0);
    expect(modes.infiniteCount).toBe(3);
    const empty = generalizedModes(0, new Float64Array(0), new Float64Array(0));
    expect(empty.omega2.length).toBe(0);
    expect(empty.infiniteCount).toBe(0);
  });
});

describe('inverseParticipationRatio', () => {
  it('is 1/N for a uniform vector and 1 for a single node', () => {
    // common practice: IPR = Σ|x|⁴ / (Σ|x|²)² ranges from 1/N (extended) to 1 (one site)
    expect(inverseParticipationRatio(new Float64Array(50).fill(0.3))).toBeCloseTo(1 / 50, 15);
    const oneHot = new Float64Array(50);
    oneHot[17] = -2;
    expect(inverseParticipationRatio(oneHot)).toBe(1);
    expect(inverseParticipationRatio([1, -1, 0, 0])).toBeCloseTo(0.5, 15);
  });

  it('uses moduli for complex vectors and is NaN for the zero vector', () => {
    // |1| = |i| = |−1| = 1 on three of four nodes → 1/3
    const v = { re: Float64Array.of(1, 0, -1, 0), im: Float64Array.of(0, 1, 0, 0) };
    expect(inverseParticipationRatio(v)).toBeCloseTo(1 / 3, 15);
    expect(inverseParticipationRatio(new Float64Array(4))).toBeNaN();
  });
});
