// The parts the shift-invert Lanczos solver stands on, each against an outside reference: eigenvalue
// counts by inertia against the dense solver generalizedModes, the real LU solve against mathjs lusolve,
// the null space of C and the projection that keeps vectors out of it against mathjs eigs.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { GROUND, type Board } from '../../../src/board/index.js';
import { analyzeLu } from '../../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../../src/numeric/lu-numeric.js';
import { generalizedModes } from '../../../src/numeric/pencil-modes.js';
import { eigenvaluesBelow } from '../../../src/numeric/shift-invert-inertia.js';
import { isRealFactorization, solveRealLu } from '../../../src/numeric/shift-invert-real-solve.js';
import { shiftedMatrix } from '../../../src/numeric/shift-invert-real-csc.js';
import { floatingCapacitorGroups, nullSpaceCleaner } from '../../../src/numeric/shift-invert-capacitance-null.js';
import { medianNodeResonance } from '../../../src/numeric/shift-invert-target.js';
import { judgeCompleteness } from '../../../src/numeric/lanczos-completeness.js';
import { makeBoard, seededRandom, type PartSpec } from '../../support/make-board.js';

function randomBoard(seed: number, nodes: number, options: { bare?: number; floating?: boolean } = {}): Board {
  const rand = seededRandom(seed);
  const name = (i: number) => (i === 0 ? GROUND : `y${i}`);
  const specs: PartSpec[] = [];
  const bare = new Set(Array.from({ length: options.bare ?? 0 }, () => 1 + Math.floor(rand() * nodes)));
  for (let i = 1; i <= nodes; i++) {
    specs.push(['L', name(i), name(Math.floor(rand() * i)), 1e-6 * (1 + 99 * rand())]);
    if (bare.has(i)) continue;
    // floating: capacitors only between nodes, never to ground
    const to = options.floating ? (i > 1 ? 1 + Math.floor(rand() * (i - 1)) : -1) : Math.floor(rand() * i);
    if (to >= 0 && !bare.has(to)) specs.push(['C', name(i), name(to), 1e-9 * (1 + 99 * rand())]);
  }
  return makeBoard(`random-${seed}`, specs);
}

function lossless(board: Board) {
  const lap = new GroundedLaplacian(board);
  const s = lap.losslessSparse();
  const d = lap.losslessMatrices();
  return { lap, pattern: s.pattern, K: s.inverseInductance, C: s.capacitance, n: d.n, Kd: d.inverseInductance, Cd: d.capacitance };
}

const rows = (n: number, a: Float64Array, scale = 1) => Array.from({ length: n }, (_, i) => Array.from(a.slice(i * n, i * n + n), (v) => v * scale));

describe('eigenvalue counts by inertia', () => {
  it.each([401, 402, 403])('random board %i: the count is exact whenever it is given', (seed) => {
    const { pattern, K, C, n, Kd, Cd } = lossless(randomBoard(seed, 90, { bare: 5 }));
    const omega2 = generalizedModes(n, Kd, Cd).omega2; // dense reference
    const sym = analyzeLu(pattern);
    let midGap = 0;
    let midGapGiven = 0;
    for (let k = 0; k + 1 < omega2.length; k += 7) {
      // mid-gap points, and points a hair off an eigenvalue (where the count may be refused, never wrong)
      const points = [0.5 * (omega2[k] + omega2[k + 1]), omega2[k] * (1 + 1e-12), omega2[k] * (1 - 1e-9)];
      points.forEach((s, which) => {
        const count = eigenvaluesBelow(sym, pattern, K, C, s);
        if (which === 0) midGap++;
        if (count === null) return;
        if (which === 0) midGapGiven++;
        expect(count).toBe(Array.from(omega2).filter((w2) => w2 < s).length);
      });
    }
    expect(midGapGiven).toBeGreaterThanOrEqual(0.8 * midGap);
  });

  it('nonpositive shifts have no eigenvalue below them (K is semidefinite)', () => {
    const { pattern, K, C } = lossless(randomBoard(404, 30));
    expect(eigenvaluesBelow(analyzeLu(pattern), pattern, K, C, 0)).toBe(0);
    expect(eigenvaluesBelow(analyzeLu(pattern), pattern, K, C, -5)).toBe(0);
  });
});

describe('real solve with the complex LU', () => {
  it('matches mathjs lusolve on K − σC of a board', () => {
    const { pattern, K, C, n, Kd, Cd } = lossless(randomBoard(411, 25));
    const sigma = 3e12;
    const f = factorLu(analyzeLu(pattern), shiftedMatrix(pattern, K, C, sigma));
    expect(isRealFactorization(f)).toBe(true);
    const rand = seededRandom(412);
    const b = Float64Array.from({ length: n }, () => rand() - 0.5);
    const x = solveRealLu(f, b, new Float64Array(n), new Float64Array(n));
    const A = rows(n, Kd).map((row, i) => row.map((v, j) => v - sigma * Cd[i * n + j]));
    const ref = (math.lusolve(A, Array.from(b, (v) => [v])) as number[][]).map((r) => r[0]); // mathjs lusolve
    const scale = Math.max(...ref.map(Math.abs));
    ref.forEach((v, i) => expect(Math.abs(x[i] - v) / scale).toBeLessThan(1e-10));
  });
});

describe('null space of C', () => {
  it.each([
    ['capacitors to ground, a few nodes without any', { bare: 4 }],
    ['a floating capacitor network', { floating: true }],
    ['floating, with nodes without capacitors', { floating: true, bare: 3 }],
  ] as const)('%s: group count = nullity of C (mathjs eigs)', (_, options) => {
    const { pattern, C, n, Cd } = lossless(randomBoard(421, 24, options));
    const groups = floatingCapacitorGroups(pattern, C);
    const values = math.eigs(rows(n, Cd, 1e9)).values as unknown as number[]; // in nF
    const top = Math.max(...values.map(Math.abs));
    expect(groups?.count).toBe(values.filter((v) => Math.abs(v) < 1e-10 * top).length);
  });

  it('the projection leaves C v unchanged and makes v K-orthogonal to null(C) (mathjs eigs)', () => {
    const { pattern, K, C, n, Kd, Cd } = lossless(randomBoard(422, 24, { floating: true, bare: 3 }));
    const clean = nullSpaceCleaner(pattern, K, C);
    expect(clean).not.toBeNull();
    const eig = math.eigs(rows(n, Cd, 1e9));
    const top = Math.max(...(eig.values as unknown as number[]).map(Math.abs));
    const nullBasis = eig.eigenvectors.filter((e) => Math.abs(e.value as number) < 1e-10 * top).map((e) => e.vector as unknown as number[]);
    expect(nullBasis.length).toBeGreaterThan(1);
    const rand = seededRandom(423);
    const v = Float64Array.from({ length: n }, () => rand() - 0.5);
    const before = math.multiply(rows(n, Cd), Array.from(v)) as number[];
    clean!(v);
    const after = math.multiply(rows(n, Cd), Array.from(v)) as number[];
    const cScale = Math.max(...before.map(Math.abs));
    after.forEach((x, i) => expect(Math.abs(x - before[i]) / cScale).toBeLessThan(1e-12));
    const kv = math.multiply(rows(n, Kd), Array.from(v)) as number[];
    const kScale = Math.hypot(...kv);
    for (const nv of nullBasis) expect(Math.abs(math.dot(nv, kv) as number) / kScale).toBeLessThan(1e-12);
  });

  it('is not built for a C that is not Laplacian-shaped', () => {
    const pattern = { n: 2, colPtr: Int32Array.from([0, 2, 4]), rowIdx: Int32Array.from([0, 1, 0, 1]) };
    expect(floatingCapacitorGroups(pattern, Float64Array.from([1, 1, 1, 1]))).toBeNull();
  });
});

describe('default target', () => {
  it('median node self-resonance from the diagonals (by hand)', () => {
    // three tanks: 1 nF with 1 mH, 3 nF with 1 mH, 1 nF with 4 mH, plus a bond of 1 nF between the first two
    const board = makeBoard('tanks', [
      ['C', 'a', GROUND, 1e-9], ['L', 'a', GROUND, 1e-3],
      ['C', 'b', GROUND, 3e-9], ['L', 'b', GROUND, 1e-3],
      ['C', 'c', GROUND, 1e-9], ['L', 'c', GROUND, 4e-3],
      ['C', 'a', 'b', 1e-9],
    ]);
    const { pattern, K, C } = lossless(board);
    // K_ii / C_ii: a 1e3 / 2e-9 = 5e11, b 1e3 / 4e-9 = 2.5e11, c 250 / 1e-9 = 2.5e11 → median 2.5e11
    expect(medianNodeResonance(pattern, K, C)).toBeCloseTo(2.5e11, 0);
  });
});

describe('completeness verdicts', () => {
  // Pure logic, with counts from a known list of eigenvalues standing in for the inertia count.
  const sigma = 100;
  const spectrum = [90, 99, 101, 101, 101, 105, 130];
  const counter = (eigenvalues: number[]) => (radius: number) => eigenvalues.filter((l) => Math.abs(l - sigma) < radius).length;
  const distances = (values: number[]) => values.map((l) => Math.abs(l - sigma)).sort((a, b) => a - b);

  it('complete when everything inside the gap after the k-th distance is found', () => {
    const found = [99, 101, 101, 101];
    const v = judgeCompleteness(distances(found), distances([...found, 105, 90]), 3, sigma, counter(spectrum));
    expect(v).toEqual({ kind: 'complete', counted: 4, found: 4 });
  });

  it('converge-more when a tie with the k-th distance is not converged yet', () => {
    const v = judgeCompleteness(distances([99, 101, 101]), distances([99, 101, 101, 101, 105]), 3, sigma, counter(spectrum));
    expect(v).toEqual({ kind: 'converge-more', want: 4 });
  });

  it('missing when the count exceeds what Lanczos saw', () => {
    const v = judgeCompleteness(distances([99, 101]), distances([99, 101, 105, 130]), 2, sigma, counter(spectrum));
    expect(v).toEqual({ kind: 'missing', want: 4, fresh: 2 });
  });

  it('no-count when every count is refused', () => {
    const v = judgeCompleteness(distances([99, 101]), distances([99, 101, 105]), 2, sigma, () => null);
    expect(v).toEqual({ kind: 'no-count' });
  });
});
