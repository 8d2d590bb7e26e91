// Two-point resistances of classic resistor networks, against published closed forms.
// Resistors are frequency independent, so any frequency gives the DC answer.
import { describe, expect, it } from 'vitest';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { GROUND } from '../../src/board/types.js';
import { makeBoard, seededRandom, type PartSpec } from '../support/make-board.js';

const F = 1000; // Hz; irrelevant for resistors

function solve(specs: PartSpec[]) {
  const lap = new GroundedLaplacian(makeBoard('net', specs));
  return new ImpedanceSolver(lap).at(F);
}

describe('ring of N equal resistors', () => {
  // Source: F. Y. Wu, "Theory of resistor networks: the two-point resistance", J. Phys. A 37, 6653 (2004):
  // nodes k apart on a ring of N resistors R read R k (N - k) / N (from memory).
  it.each([
    [8, 1],
    [8, 3],
    [8, 4],
    [13, 5],
    [40, 17],
  ])('N=%i, k=%i', (N, k) => {
    const R = 470;
    const name = (i: number) => (i % N === 0 ? GROUND : `n${i % N}`);
    const specs: PartSpec[] = Array.from({ length: N }, (_, i) => ['R', name(i), name(i + 1), R]);
    const point = solve(specs);
    const expected = (R * k * (N - k)) / N;
    // node k against the grounded node 0, and two ungrounded nodes k apart
    expect(point.between(`n${k}`, GROUND).re).toBeCloseTo(expected, 9);
    if (k + 2 < N) expect(point.between('n2', `n${2 + k}`).re).toBeCloseTo(expected, 9);
    expect(Math.abs(point.between('n2', `n${2 + k}`).im)).toBeLessThan(1e-9);
  });
});

describe('cube of 12 equal resistors', () => {
  // Classic textbook result (from memory): adjacent corners 7R/12, face diagonal 3R/4, body diagonal 5R/6.
  const R = 1000;
  const corner = (x: number, y: number, z: number) => (x + y + z === 0 ? GROUND : `c${x}${y}${z}`);
  const specs: PartSpec[] = [];
  for (let x = 0; x < 2; x++)
    for (let y = 0; y < 2; y++)
      for (let z = 0; z < 2; z++) {
        if (x === 0) specs.push(['R', corner(x, y, z), corner(1, y, z), R]);
        if (y === 0) specs.push(['R', corner(x, y, z), corner(x, 1, z), R]);
        if (z === 0) specs.push(['R', corner(x, y, z), corner(x, y, 1), R]);
      }
  it('has 12 edges', () => expect(specs).toHaveLength(12));
  const point = solve(specs);
  it('adjacent corners: 7R/12', () => {
    expect(point.between('c100', GROUND).re).toBeCloseTo((7 * R) / 12, 8);
    expect(point.between('c110', 'c111').re).toBeCloseTo((7 * R) / 12, 8);
  });
  it('face diagonal: 3R/4', () => {
    expect(point.between('c110', GROUND).re).toBeCloseTo((3 * R) / 4, 8);
    expect(point.between('c100', 'c111').re).toBeCloseTo((3 * R) / 4, 8);
  });
  it('body diagonal: 5R/6', () => {
    expect(point.between('c111', GROUND).re).toBeCloseTo((5 * R) / 6, 8);
    expect(point.between('c100', 'c011').re).toBeCloseTo((5 * R) / 6, 8);
  });
});

describe('centre of a large square grid approaches the infinite lattice', () => {
  // Sources: D. Atkinson and F. J. van Steenwijk, Am. J. Phys. 67, 486 (1999); J. Cserti, Am. J. Phys. 68,
  // 896 (2000) (from memory): adjacent R/2, diagonal 2R/pi, two steps straight (2 - 4/pi) R.
  const R = 100;
  const size = 61;
  const name = (x: number, y: number) => (x === 0 && y === 0 ? GROUND : `g${x}_${y}`);
  const specs: PartSpec[] = [];
  for (let x = 0; x < size; x++)
    for (let y = 0; y < size; y++) {
      if (x + 1 < size) specs.push(['R', name(x, y), name(x + 1, y), R]);
      if (y + 1 < size) specs.push(['R', name(x, y), name(x, y + 1), R]);
    }
  const point = solve(specs);
  const c = (size - 1) / 2;
  // A finite grid differs from the infinite one by boundary corrections of order 1/size^2; 0.5% is ample.
  it('adjacent nodes: R/2', () => {
    expect(point.between(name(c, c), name(c + 1, c)).re / R).toBeCloseTo(0.5, 2);
  });
  it('diagonal nodes: 2R/pi', () => {
    expect(point.between(name(c, c), name(c + 1, c + 1)).re / R).toBeCloseTo(2 / Math.PI, 2);
  });
  it('two steps straight: (2 - 4/pi) R', () => {
    expect(point.between(name(c, c), name(c + 2, c)).re / R).toBeCloseTo(2 - 4 / Math.PI, 2);
  });
});

describe("Foster's theorem on random connected networks", () => {
  // Source: R. M. Foster, "The average impedance of an electrical network" (1949) (from memory):
  // for any connected network of N nodes, the sum over edges of R_eff(edge) / R_edge is N - 1.
  it.each([1, 2, 3, 4, 5])('random network, seed %i', (seed) => {
    const rand = seededRandom(seed);
    const N = 12 + Math.floor(rand() * 20); // nodes including ground
    const name = (i: number) => (i === 0 ? GROUND : `r${i}`);
    const specs: PartSpec[] = [];
    // a random spanning tree keeps it connected, then random extra edges
    for (let i = 1; i < N; i++) specs.push(['R', name(i), name(Math.floor(rand() * i)), 10 + rand() * 1000]);
    const extra = N + Math.floor(rand() * 2 * N);
    for (let e = 0; e < extra; e++) {
      const a = Math.floor(rand() * N);
      const b = Math.floor(rand() * N);
      if (a !== b) specs.push(['R', name(a), name(b), 10 + rand() * 1000]);
    }
    const point = solve(specs);
    const sum = specs.reduce((acc, [, a, b, r]) => acc + point.between(a, b).re / r, 0);
    expect(sum).toBeCloseTo(N - 1, 9);
  });
});
