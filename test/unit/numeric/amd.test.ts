// Approximate minimum degree: validity of the permutation and quality of the fill it leads to.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { approximateMinimumDegree, type MinimumDegreeStats } from '../../../src/numeric/amd.js';
import { analyzeLu } from '../../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../../src/numeric/lu-numeric.js';
import { complexFromTriplets } from '../../../src/numeric/csc.js';
import type { CscPattern } from '../../../src/numeric/types.js';
import { latticePattern, laplacianValues, mathjsSparse, randomComplexMatrix, seededRandom, shuffled } from './helpers.js';

function expectPermutation(perm: Int32Array, n: number): void {
  expect(perm.length).toBe(n);
  const sorted = Array.from(perm).sort((a, b) => a - b);
  expect(sorted).toEqual(Array.from({ length: n }, (_, i) => i));
}

/** nnz(L + U) of the LU of a diagonally dominant matrix on the pattern, under an ordering. */
function luFill(p: CscPattern, ordering: 'amd' | 'natural' | Int32Array): number {
  const f = factorLu(analyzeLu(p, { ordering }), laplacianValues(p));
  expect(f.offDiagonalPivots).toBe(0);
  return f.nnzL + f.nnzU - p.n;
}

/** Column order mathjs's sparse LU picks with its AMD on A + Aᵀ (order 1). reference: mathjs slu */
function mathjsAmdOrder(p: CscPattern): Int32Array {
  const values = Array.from(p.rowIdx, () => 1);
  for (let j = 0; j < p.n; j++) for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) if (p.rowIdx[q] === j) values[q] = 1e3;
  return Int32Array.from((math.slu(mathjsSparse(p, values), 1, 1e-12) as unknown as { q: number[] }).q);
}

function newStats(): MinimumDegreeStats {
  return { denseNodes: 0, supervariableMerges: 0, massEliminations: 0, aggressiveAbsorptions: 0, compactions: 0 };
}

/** Same count from mathjs's sparse LU with its own AMD on A + Aᵀ (order 1). reference: mathjs slu */
function mathjsAmdFill(p: CscPattern): number {
  const s = math.slu(mathjsSparse(p, laplacianValues(p).re), 1, 0.001) as unknown as { L: { _values: number[] }; U: { _values: number[] } };
  return s.L._values.length + s.U._values.length - p.n;
}

function patternFromEdges(n: number, edges: [number, number][]): CscPattern {
  const rows: number[] = [];
  const cols: number[] = [];
  for (let i = 0; i < n; i++) rows.push(i), cols.push(i);
  for (const [a, b] of edges) rows.push(a, b), cols.push(b, a);
  const zeros = new Array(rows.length).fill(0);
  return complexFromTriplets(n, rows, cols, zeros, zeros);
}

describe('approximateMinimumDegree', () => {
  it('returns a permutation for empty, single-node, random and unsymmetric patterns', () => {
    expectPermutation(approximateMinimumDegree({ n: 0, colPtr: new Int32Array(1), rowIdx: new Int32Array(0) }), 0);
    expectPermutation(approximateMinimumDegree({ n: 1, colPtr: Int32Array.of(0, 1), rowIdx: Int32Array.of(0) }), 1);
    for (let seed = 1; seed <= 20; seed++) {
      const rand = seededRandom(seed);
      const n = 5 + Math.floor(rand() * 80);
      const A = randomComplexMatrix(n, rand, { density: 0.02 + 0.3 * rand(), symmetric: seed % 2 === 0 });
      expectPermutation(approximateMinimumDegree(A), n);
    }
  });

  it('matches mathjs AMD fill on random patterns, workspace compaction included', () => {
    let compactions = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const rand = seededRandom(seed);
      const n = 20 + Math.floor(rand() * 400);
      const A = randomComplexMatrix(n, rand, { density: (1 + 8 * rand()) / n, symmetric: seed % 3 === 0 });
      const stats = newStats();
      const perm = approximateMinimumDegree(A, { stats });
      expectPermutation(perm, n);
      compactions += stats.compactions;
      // Cholesky fill of A + Aᵀ under each order. reference: mathjs slu column order (its AMD)
      const ours = analyzeLu(A, { ordering: perm }).lowerNnzEstimate;
      const theirs = analyzeLu(A, { ordering: mathjsAmdOrder(A) }).lowerNnzEstimate;
      expect(ours).toBeLessThan(1.15 * theirs);
    }
    expect(compactions).toBeGreaterThan(0);
  });

  it('merges indistinguishable nodes into supervariables', () => {
    // Every node of a 10×10 grid tripled into a clique whose members share all neighbours.
    const grid = latticePattern([10, 10]);
    const edges: [number, number][] = [];
    for (let j = 0; j < grid.n; j++) {
      for (let q = grid.colPtr[j]; q < grid.colPtr[j + 1]; q++) {
        const i = grid.rowIdx[q];
        for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) if (i > j || (i === j && a < b)) edges.push([3 * i + a, 3 * j + b]);
      }
    }
    const p = patternFromEdges(3 * grid.n, edges);
    const stats = newStats();
    const perm = approximateMinimumDegree(p, { stats });
    expectPermutation(perm, p.n);
    expect(stats.supervariableMerges).toBeGreaterThanOrEqual(grid.n);
    expect(stats.massEliminations).toBeGreaterThan(0);
    expect(stats.aggressiveAbsorptions).toBeGreaterThan(0);
    // reference: mathjs slu column order (its AMD)
    expect(analyzeLu(p, { ordering: perm }).lowerNnzEstimate).toBeLessThan(1.15 * analyzeLu(p, { ordering: mathjsAmdOrder(p) }).lowerNnzEstimate);
  });

  it('orders a hub node with many neighbours (a dense row) last', () => {
    const n = 400; // dense threshold max(16, 10·√n) = 200 neighbours
    const edges: [number, number][] = [];
    for (let i = 1; i < n; i++) edges.push([0, i]);
    for (let i = 1; i + 1 < n; i++) edges.push([i, i + 1]);
    const stats = newStats();
    const perm = approximateMinimumDegree(patternFromEdges(n, edges), { stats });
    expectPermutation(perm, n);
    expect(perm[n - 1]).toBe(0);
    expect(stats.denseNodes).toBe(1);
  });

  it('eliminates a star (arrowhead) without fill: the hub goes last', () => {
    // common practice: an arrowhead matrix factors without fill only if the hub comes after all leaves
    // but one (with a single leaf left, hub and leaf are interchangeable)
    const n = 14;
    const edges: [number, number][] = [];
    for (let i = 0; i < n; i++) if (i !== 5) edges.push([5, i]);
    const p = patternFromEdges(n, edges);
    const perm = approximateMinimumDegree(p);
    expect(Array.from(perm).indexOf(5)).toBeGreaterThanOrEqual(n - 2);
    expect(luFill(p, perm)).toBe(p.rowIdx.length); // nnz(L + U) = nnz(A): no fill at all
  });

  it('eliminates a random tree without fill', () => {
    // common practice: minimum degree on a tree peels leaves, a perfect elimination order
    const rand = seededRandom(77);
    const n = 300;
    const label = shuffled(n, rand);
    const edges: [number, number][] = [];
    for (let i = 1; i < n; i++) edges.push([label[i], label[Math.floor(rand() * i)]]);
    const p = patternFromEdges(n, edges);
    expect(luFill(p, approximateMinimumDegree(p))).toBe(p.rowIdx.length);
  });

  it('gives far less fill than the natural order on a 2D grid, on par with mathjs AMD', () => {
    const p = latticePattern([30, 30]);
    const amd = luFill(p, 'amd');
    const natural = luFill(p, 'natural');
    // Natural order on a k×k grid fills the band: nnz(L+U) ≈ 2·n·k (common practice).
    expect(natural).toBeGreaterThan(1.8 * 900 * 30);
    expect(amd).toBeLessThan(0.5 * natural);
    // reference: mathjs slu with AMD ordering of A + Aᵀ
    expect(amd).toBeLessThan(1.15 * mathjsAmdFill(p));
  });

  it('gives less fill than the natural order on a 3D grid, on par with mathjs AMD', () => {
    const p = latticePattern([10, 10, 10]);
    const amd = luFill(p, 'amd');
    expect(amd).toBeLessThan(0.5 * luFill(p, 'natural'));
    // reference: mathjs slu with AMD ordering of A + Aᵀ
    expect(amd).toBeLessThan(1.15 * mathjsAmdFill(p));
  });

  it('is not fooled by a scrambled numbering of the grid', () => {
    const rand = seededRandom(78);
    const grid = latticePattern([25, 25]);
    const label = shuffled(grid.n, rand);
    const edges: [number, number][] = [];
    for (let j = 0; j < grid.n; j++) {
      for (let q = grid.colPtr[j]; q < grid.colPtr[j + 1]; q++) {
        if (grid.rowIdx[q] > j) edges.push([label[j], label[grid.rowIdx[q]]]);
      }
    }
    const scrambled = patternFromEdges(grid.n, edges);
    expect(luFill(scrambled, 'amd')).toBeLessThan(1.2 * luFill(grid, 'amd'));
  });

  it('orders large grids (10,000-node 2D and 20×20×20 3D) into valid permutations', () => {
    for (const dims of [[100, 100], [20, 20, 20]]) {
      const p = latticePattern(dims);
      expectPermutation(approximateMinimumDegree(p), p.n);
    }
  });

  it('matches the symbolic fill estimate when pivots stay on the diagonal', () => {
    const p = latticePattern([15, 15]);
    const sym = analyzeLu(p);
    const f = factorLu(sym, laplacianValues(p));
    expect(f.nnzL).toBe(sym.lowerNnzEstimate);
    expect(f.nnzU).toBe(sym.upperNnzEstimate);
  });
});
