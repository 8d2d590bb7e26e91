// Shift-invert Lanczos (the k lossless modes nearest a target) against two outside references: the
// project's dense pencil solver generalizedModes (every mode of the board, by condensation and a dense
// symmetric eigen-solve) and mathjs eigs. Boards are our own values.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { loadBoard, GROUND, type Board } from '../../../src/board/index.js';
import { generalizedModes, type GeneralizedModes } from '../../../src/numeric/pencil-modes.js';
import { shiftInvertModes, type ShiftInvertOptions, type ShiftInvertModes } from '../../../src/numeric/lanczos-shift-invert.js';
import { ModesNotConvergedError } from '../../../src/numeric/lanczos-errors.js';
import { makeBoard, seededRandom, type PartSpec } from '../../support/make-board.js';

const TWO_PI = 2 * Math.PI;

function sparseOf(board: Board) {
  const lap = new GroundedLaplacian(board);
  const s = lap.losslessSparse();
  return { lap, pattern: s.pattern, K: s.inverseInductance, C: s.capacitance };
}

function denseOf(lap: GroundedLaplacian): GeneralizedModes {
  const d = lap.losslessMatrices();
  return generalizedModes(d.n, d.inverseInductance, d.capacitance);
}

function denseColumn(g: GeneralizedModes, n: number, k: number): Float64Array {
  const m = g.omega2.length;
  return Float64Array.from({ length: n }, (_, i) => g.vectors[i * m + k]);
}

/** Distance of unit x from the span of the given vectors (2-norm, after Gram–Schmidt). */
function distanceFromSpan(x: Float64Array, span: Float64Array[]): number {
  const q: Float64Array[] = [];
  for (const v of span) {
    const w = Float64Array.from(v);
    for (let pass = 0; pass < 2; pass++) {
      for (const u of q) {
        const d = u.reduce((s, ui, i) => s + ui * w[i], 0);
        for (let i = 0; i < w.length; i++) w[i] -= d * u[i];
      }
    }
    const norm = Math.hypot(...w);
    if (norm > 1e-8) q.push(w.map((wi) => wi / norm));
  }
  const r = Float64Array.from(x);
  for (const u of q) {
    const d = u.reduce((s, ui, i) => s + ui * r[i], 0);
    for (let i = 0; i < r.length; i++) r[i] -= d * u[i];
  }
  return Math.hypot(...r);
}

/**
 * The k modes nearest σ must be the dense solver's k nearest: frequencies to 1e-9 relative (absolute
 * against `fScale` for ω = 0), each vector inside the dense eigenspace of its value (clusters closer than
 * 1e-6 relative count as one space, so degenerate and near-degenerate modes may come rotated).
 */
function expectDenseAgreement(board: Board, sigma: number, k: number, options: Partial<ShiftInvertOptions> = {}): ShiftInvertModes {
  const { lap, pattern, K, C } = sparseOf(board);
  const ours = shiftInvertModes(pattern, K, C, { count: k, shift: sigma, ...options });
  const ref = denseOf(lap);
  const n = pattern.n;
  const order = Array.from(ref.omega2.keys()).sort((a, b) => Math.abs(ref.omega2[a] - sigma) - Math.abs(ref.omega2[b] - sigma));
  const refNearest = order.slice(0, k).map((i) => ref.omega2[i]).sort((a, b) => a - b);
  const oursSorted = Array.from(ours.values).sort((a, b) => a - b);
  expect(oursSorted).toHaveLength(refNearest.length);
  const fScale = Math.sqrt(Math.max(...ref.omega2)) / TWO_PI;
  oursSorted.forEach((w2, i) => {
    const f = Math.sqrt(w2) / TWO_PI;
    const fRef = Math.sqrt(refNearest[i]) / TWO_PI;
    if (fRef === 0) expect(f / fScale).toBeLessThan(1e-9); // dense: ω² = 0 exactly for zero-frequency modes
    else expect(Math.abs(f / fRef - 1)).toBeLessThan(1e-9); // dense generalizedModes
  });
  ours.vectors.forEach((x, t) => {
    const lambda = ours.values[t];
    const space = Array.from(ref.omega2.keys())
      .filter((i) => Math.abs(ref.omega2[i] - lambda) <= 1e-6 * (Math.abs(lambda) + Math.abs(sigma)))
      .map((i) => denseColumn(ref, n, i));
    expect(space.length).toBeGreaterThan(0);
    expect(distanceFromSpan(x, space)).toBeLessThan(1e-6); // dense generalizedModes eigenspace
    expect(Math.hypot(...x)).toBeCloseTo(1, 12);
    expect(x.reduce((best, v) => (Math.abs(v) > Math.abs(best) ? v : best), 0)).toBeGreaterThan(0);
  });
  ours.residuals.forEach((r) => expect(r).toBeLessThanOrEqual(1e-9));
  return ours;
}

function expectInertiaComplete(r: ShiftInvertModes): void {
  expect(r.completeness.method).toBe('inertia');
  if (r.completeness.method === 'inertia') expect(r.completeness.found).toBe(r.completeness.counted);
}

/** A connected random LC board: every node gets L and C to an earlier node or ground, plus extra parts. */
function randomBoard(seed: number, nodes: number): Board {
  const rand = seededRandom(seed);
  const name = (i: number) => (i === 0 ? GROUND : `x${i}`);
  const earlier = (i: number) => Math.floor(rand() * i);
  const specs: PartSpec[] = [];
  for (let i = 1; i <= nodes; i++) {
    specs.push(['L', name(i), name(earlier(i)), 1e-6 * (1 + 99 * rand())]);
    specs.push(['C', name(i), name(earlier(i)), 1e-9 * (1 + 99 * rand())]);
  }
  for (let e = 0; e < nodes; e++) {
    const a = 1 + Math.floor(rand() * nodes);
    const b = Math.floor(rand() * (nodes + 1));
    if (a === b) continue;
    specs.push(rand() < 0.5 ? ['C', name(a), name(b), 1e-9 * (1 + 99 * rand())] : ['L', name(a), name(b), 1e-6 * (1 + 99 * rand())]);
  }
  return makeBoard(`random-${seed}`, specs);
}

/** nx×ny square LC lattice: bonds of C between neighbours, L to ground, optional C to ground. */
function squareLattice(nx: number, ny: number, bond: (x: number, y: number, axis: 0 | 1) => number, toGround = 0): Board {
  const id = (x: number, y: number) => `q${x}_${y}`;
  const specs: PartSpec[] = [];
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      specs.push(['L', id(x, y), GROUND, 22e-6]);
      if (toGround > 0) specs.push(['C', id(x, y), GROUND, toGround]);
      if (x + 1 < nx) specs.push(['C', id(x, y), id(x + 1, y), bond(x, y, 0)]);
      if (y + 1 < ny) specs.push(['C', id(x, y), id(x, y + 1), bond(x, y, 1)]);
    }
  }
  return makeBoard(`square-${nx}x${ny}`, specs);
}

/** Frequency of the median mode of a board by the dense solver, so targets land inside each spectrum. */
function quantileOmega2(board: Board, q: number): number {
  const w2 = denseOf(new GroundedLaplacian(board)).omega2;
  return w2[Math.floor(q * (w2.length - 1))] * (1 + 1e-4);
}

describe('shift-invert Lanczos against the dense solver', () => {
  it.each([
    [301, 160],
    [302, 220],
    [303, 280],
  ])('random board seed %i with %i nodes, three targets', (seed, nodes) => {
    const board = randomBoard(seed, nodes);
    for (const q of [0.05, 0.5, 0.9]) expectInertiaComplete(expectDenseAgreement(board, quantileOmega2(board, q), 8));
  });

  it('2D dimerized lattice of 256 nodes (near-degenerate pairs from the mirror symmetry)', () => {
    const board = squareLattice(16, 16, (x, y, axis) => (axis === 0 ? (x % 2 ? 22e-9 : 10e-9) : y % 2 ? 47e-9 : 4.7e-9), 1e-9);
    for (const f of [90e3, 117.3e3, 250e3]) expectInertiaComplete(expectDenseAgreement(board, (TWO_PI * f) ** 2, 10));
  });

  it('3D cubic lattice of 216 nodes: highly degenerate, floating C (an infinite-frequency mode)', () => {
    // 6×6×6 nodes, 10 nF bonds, 22 µH to ground: cubic symmetry gives eigenvalues of multiplicity 3 and 6.
    const id = (x: number, y: number, z: number) => `c${x}_${y}_${z}`;
    const specs: PartSpec[] = [];
    for (let x = 0; x < 6; x++)
      for (let y = 0; y < 6; y++)
        for (let z = 0; z < 6; z++) {
          specs.push(['L', id(x, y, z), GROUND, 22e-6]);
          if (x < 5) specs.push(['C', id(x, y, z), id(x + 1, y, z), 10e-9]);
          if (y < 5) specs.push(['C', id(x, y, z), id(x, y + 1, z), 10e-9]);
          if (z < 5) specs.push(['C', id(x, y, z), id(x, y, z + 1), 10e-9]);
        }
    const board = makeBoard('cube-6', specs);
    for (const q of [0.02, 0.5, 0.97]) {
      const r = expectDenseAgreement(board, quantileOmega2(board, q), 10, { blockSize: 1 });
      expectInertiaComplete(r);
    }
  });

  it('corner-8x8 demo board: all four corner modes near 117 kHz', () => {
    const board = loadBoard('shared/boards/corner-8x8.yaml');
    const r = expectDenseAgreement(board, (TWO_PI * 117.3e3) ** 2, 4);
    // Each corner node carries most of a corner mode (SSH-type corner state, decaying by the bond ratio
    // into the bulk; common practice), so the four returned modes together cover all four corners.
    const names = new GroundedLaplacian(board).index.names;
    for (const corner of ['a0_0', 'b3_0', 'c0_3', 'd3_3']) {
      const i = names.indexOf(corner);
      expect(r.vectors.reduce((s, x) => s + x[i] * x[i], 0)).toBeGreaterThan(0.5);
    }
    // In the gap: within 1 % of f0 = 117.3 kHz (the board file's design value), the next mode (dense
    // generalizedModes) more than 5 % away.
    r.values.forEach((w2) => expect(Math.abs(Math.sqrt(w2) / TWO_PI / 117.3e3 - 1)).toBeLessThan(0.01));
    const dense = Array.from(denseOf(new GroundedLaplacian(board)).omega2, (w2) => Math.sqrt(w2) / TWO_PI);
    const fifth = dense.sort((a, b) => Math.abs(a - 117.3e3) - Math.abs(b - 117.3e3))[4];
    expect(Math.abs(fifth / 117.3e3 - 1)).toBeGreaterThan(0.05);
  });

  it('six identical separate sub-boards (every eigenvalue six-fold): the count fetches missing copies', () => {
    // One start vector spans only one copy of each eigenvalue in exact arithmetic; the inertia count must
    // make up the rest by adding start vectors whenever rounding has not supplied them.
    const specs: PartSpec[] = [];
    for (let copy = 0; copy < 6; copy++) {
      const rand = seededRandom(305); // the same values in every copy
      for (let i = 0; i < 30; i++) {
        specs.push(['L', `k${copy}_${i}`, GROUND, 1e-6 * (5 + 20 * rand())], ['C', `k${copy}_${i}`, GROUND, 1e-9 * (1 + 5 * rand())]);
        if (i > 0) specs.push(['C', `k${copy}_${i - 1}`, `k${copy}_${i}`, 1e-9 * (1 + 5 * rand())]);
      }
    }
    const board = makeBoard('six-copies', specs);
    const extra: number[] = [];
    for (const q of [0.02, 0.55]) {
      for (const k of [4, 9]) {
        const r = expectDenseAgreement(board, quantileOmega2(board, q), k, { blockSize: 1 });
        expectInertiaComplete(r);
        if (r.completeness.method === 'inertia') expect(r.completeness.counted % 6).toBe(0); // whole groups of copies
        extra.push(r.startVectors - 1);
      }
    }
    expect(Math.max(...extra)).toBeGreaterThan(0);
  });

  it('repeats exactly with the same seed', () => {
    const { pattern, K, C } = sparseOf(randomBoard(304, 120));
    const sigma = (TWO_PI * 300e3) ** 2;
    const a = shiftInvertModes(pattern, K, C, { count: 5, shift: sigma, seed: 7 });
    const b = shiftInvertModes(pattern, K, C, { count: 5, shift: sigma, seed: 7 });
    expect(Array.from(b.values)).toEqual(Array.from(a.values));
  });
});

describe('singular pencils', () => {
  it('singular C: nodes without any capacitor and capacitor islands with no path to ground', () => {
    const rand = seededRandom(311);
    const bare = new Set(Array.from({ length: 12 }, () => Math.floor(rand() * 180)));
    // 12 × 15 lattice, C only along x (each row floats as a whole), L to ground and along y
    const id = (x: number, y: number) => `r${x}_${y}`;
    const specs: PartSpec[] = [];
    for (let y = 0; y < 15; y++)
      for (let x = 0; x < 12; x++) {
        specs.push(['L', id(x, y), GROUND, 1e-6 * (5 + 40 * rand())]);
        if (y + 1 < 15) specs.push(['L', id(x, y), id(x, y + 1), 1e-6 * (20 + 80 * rand())]);
        if (x + 1 < 12 && !bare.has(y * 12 + x) && !bare.has(y * 12 + x + 1)) specs.push(['C', id(x, y), id(x + 1, y), 1e-9 * (1 + 20 * rand())]);
      }
    const board = makeBoard('floating-rows', specs);
    const dense = denseOf(new GroundedLaplacian(board));
    expect(dense.infiniteCount).toBeGreaterThan(15); // dense: many directions without capacitance
    for (const q of [0.1, 0.6]) expectInertiaComplete(expectDenseAgreement(board, quantileOmega2(board, q), 8));
  });

  it('singular K: an LC ladder with no inductor to ground has a zero-frequency mode; σ = 0 is moved', () => {
    // 200 nodes, C to ground at each, L between neighbours: ω = 0 (all nodes equal) is a mode.
    const rand = seededRandom(312);
    const specs: PartSpec[] = [];
    for (let i = 0; i < 200; i++) {
      specs.push(['C', `l${i}`, GROUND, 1e-9 * (5 + rand())]);
      if (i > 0) specs.push(['L', `l${i - 1}`, `l${i}`, 22e-6 * (1 + 0.2 * rand())]);
    }
    const board = makeBoard('free-ladder', specs);
    const r = expectDenseAgreement(board, 0, 4);
    expect(r.shift.used).not.toBe(0);
    expect(r.shift.note).toMatch(/singular/);
    expect(r.values[0]).toBe(0);
    // the ω = 0 mode is uniform (K·1 = 0; by hand)
    const x = r.vectors[0];
    x.forEach((v) => expect(v).toBeCloseTo(1 / Math.sqrt(200), 10));
    expectDenseAgreement(board, quantileOmega2(board, 0.3), 6);
  });

  it('a target exactly on an eigenvalue: the factorization is singular, σ is nudged and it says so', () => {
    // One tank of 2 F and 0.5 H decoupled from the rest: K − σC has an exactly zero row at σ = 1 (by hand).
    const specs: PartSpec[] = [['C', 'tank', GROUND, 2], ['L', 'tank', GROUND, 0.5]];
    const rand = seededRandom(313);
    for (let i = 0; i < 40; i++) {
      specs.push(['C', `m${i}`, GROUND, 1 + rand()], ['L', `m${i}`, GROUND, 0.2 + rand()]);
      if (i > 0) specs.push(['C', `m${i - 1}`, `m${i}`, 0.5 * rand()]);
    }
    const r = expectDenseAgreement(makeBoard('exact-hit', specs), 1, 3);
    expect(r.shift.requested).toBe(1);
    expect(r.shift.used).not.toBe(1);
    expect(r.shift.note).toMatch(/singular/);
    expect(r.values[0]).toBeCloseTo(1, 12);
  });

  it('nodes touched only by resistors take no part (zero in every mode shape), as in the dense solver', () => {
    const base = randomBoard(314, 80);
    const specs: PartSpec[] = base.parts.map((p) => [p.kind, p.nodes[0], p.nodes[1], p.value]);
    specs.push(['R', 'iso1', 'x3', 100], ['R', 'iso1', 'iso2', 47], ['R', 'iso2', GROUND, 1e3]);
    const board = makeBoard('with-resistor-nodes', specs);
    const r = expectDenseAgreement(board, quantileOmega2(board, 0.4), 6);
    const names = new GroundedLaplacian(board).index.names;
    for (const node of ['iso1', 'iso2']) r.vectors.forEach((x) => expect(Math.abs(x[names.indexOf(node)])).toBe(0));
  });
});

describe('against mathjs eigs', () => {
  it('a 10-node board: the 3 modes nearest 200 kHz', () => {
    const board = randomBoard(321, 10);
    const { lap, pattern, K, C } = sparseOf(board);
    const { n, capacitance, inverseInductance } = lap.losslessMatrices();
    // mathjs eigs on C^-1/2 K C^-1/2, in nF and 1/µH so its absolute precision suits: ω² = μ · 1e15
    const rows = (a: Float64Array, s: number) => Array.from({ length: n }, (_, i) => Array.from(a.slice(i * n, i * n + n), (v) => v * s));
    const ce = math.eigs(rows(capacitance, 1e9));
    const q = ce.eigenvectors.map((e) => e.vector as unknown as number[]);
    const invSqrt = Array.from({ length: n }, (_, i) =>
      Array.from({ length: n }, (_, j) => q.reduce((s, vec, t) => s + (vec[i] * vec[j]) / Math.sqrt(ce.eigenvectors[t].value as number), 0)),
    );
    const M = math.multiply(math.multiply(invSqrt, rows(inverseInductance, 1e-6)), invSqrt) as number[][];
    const sym = M.map((row, i) => row.map((x, j) => (x + M[j][i]) / 2));
    const sigma = (TWO_PI * 200e3) ** 2;
    const ref = (math.eigs(sym).values as unknown as number[])
      .map((mu) => mu * 1e15)
      .sort((a, b) => Math.abs(a - sigma) - Math.abs(b - sigma))
      .slice(0, 3)
      .sort((a, b) => a - b);
    const ours = Array.from(shiftInvertModes(pattern, K, C, { count: 3, shift: sigma }).values).sort((a, b) => a - b);
    ours.forEach((w2, i) => expect(Math.abs(Math.sqrt(w2 / ref[i]) - 1)).toBeLessThan(1e-9)); // mathjs eigs
  });
});

describe('budget', () => {
  it('throws ModesNotConvergedError, telling how many converged after how many restarts', () => {
    // 400-node lattice, 10 modes, the smallest subspace and no restart allowed: one Krylov pass cannot do it.
    const board = squareLattice(20, 20, (x, y) => 1e-9 * (5 + ((x * 7 + y * 3) % 5)), 2e-9);
    const { pattern, K, C } = sparseOf(board);
    const sigma = quantileOmega2(board, 0.5);
    let caught: unknown;
    try {
      shiftInvertModes(pattern, K, C, { count: 10, shift: sigma, subspace: 1, maxRestarts: 0 });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(ModesNotConvergedError);
    const e = caught as ModesNotConvergedError;
    expect(e.wanted).toBe(10);
    expect(e.restarts).toBe(0);
    expect(e.converged).toBeLessThan(10);
    expect(e.message).toMatch(/of 10 modes converged .* after 0 restarts/);
    // With the default budget the same problem converges (and agrees with the dense solver).
    expectInertiaComplete(expectDenseAgreement(board, sigma, 10));
  });
});
