// Random small complex boards, checked against mathjs (an independent reference library): the admittance
// matrix is stamped here with mathjs complex arithmetic, solved with mathjs lusolve, and the lossless modes
// come from mathjs eigs on the symmetric form C^-1/2 K C^-1/2.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { predictModes } from '../../src/predict/modes.js';
import { GROUND, type Board } from '../../src/board/types.js';
import { makeBoard, seededRandom, type PartSpec } from '../support/make-board.js';
import { mathjsAdmittanceMatrix } from '../support/mathjs-admittance.js';

function randomBoard(seed: number): Board {
  const rand = seededRandom(seed);
  const N = 4 + Math.floor(rand() * 9);
  const name = (i: number) => (i === 0 ? GROUND : `x${i}`);
  const kinds = ['C', 'L', 'R'] as const;
  const value = (k: string) => (k === 'C' ? 1e-9 * (1 + 99 * rand()) : k === 'L' ? 1e-6 * (1 + 99 * rand()) : 10 + 1000 * rand());
  const specs: PartSpec[] = [];
  for (let i = 1; i <= N; i++) {
    // every node gets an inductor and a capacitor to something already placed, so C and K are both nonsingular
    specs.push(['L', name(i), name(Math.floor(rand() * i)), value('L'), rand() < 0.5 ? rand() : undefined]);
    specs.push(['C', name(i), name(Math.floor(rand() * i)), value('C'), rand() < 0.5 ? 0.05 * rand() : undefined]);
  }
  for (let e = 0; e < N; e++) {
    const a = Math.floor(rand() * (N + 1));
    const b = Math.floor(rand() * (N + 1));
    const k = kinds[Math.floor(rand() * 3)];
    if (a !== b) specs.push([k, name(a), name(b), value(k), k !== 'R' && rand() < 0.5 ? rand() : undefined]);
  }
  return makeBoard(`random-${seed}`, specs);
}

/** J(w) built independently with mathjs complex numbers. */
function referenceJ(board: Board, omega: number): math.Matrix {
  return mathjsAdmittanceMatrix(board.parts, board.nodes.map((n) => n.name), omega);
}

describe('impedances against mathjs lusolve', () => {
  it.each([11, 12, 13, 14, 15, 16, 17, 18])('random board seed %i', (seed) => {
    const board = randomBoard(seed);
    const f = 50e3 + 200e3 * seededRandom(seed + 100)();
    const omega = 2 * Math.PI * f;
    const point = new ImpedanceSolver(new GroundedLaplacian(board)).at(f);
    const J = referenceJ(board, omega);
    const n = board.nodes.length;
    for (let col = 0; col < n; col++) {
      const e = Array.from({ length: n }, (_, i) => [i === col ? 1 : 0]);
      const x = math.lusolve(J, e) as math.Matrix;
      for (let row = 0; row < n; row++) {
        const ref = math.complex(x.get([row, 0]));
        const ours = point.transfer(board.nodes[col].name, board.nodes[row].name);
        const scale = Math.max(1e-30, math.abs(ref) as unknown as number);
        expect(Math.hypot(ours.re - ref.re, ours.im - ref.im) / scale).toBeLessThan(1e-9);
      }
    }
  });
});

describe('lossless modes against mathjs eigs', () => {
  it.each([21, 22, 23, 24, 25])('random board seed %i', (seed) => {
    const board = randomBoard(seed);
    const lap = new GroundedLaplacian(board);
    const { n, capacitance, inverseInductance } = lap.losslessMatrices();
    const dense = (a: Float64Array) => Array.from({ length: n }, (_, i) => Array.from(a.slice(i * n, i * n + n)));
    // mathjs eigs works to an absolute precision, so scale to nF and 1/uH first: omega^2 = lambda * 1e15.
    const Cm = dense(capacitance.map((x) => x * 1e9));
    const Km = dense(inverseInductance.map((x) => x * 1e-6));
    // C^-1/2 from the eigen-decomposition of C (mathjs), then the symmetric standard problem.
    const ce = math.eigs(Cm);
    const q = ce.eigenvectors.map((e) => e.vector as unknown as number[]);
    const invSqrt = Array.from({ length: n }, (_, i) =>
      Array.from({ length: n }, (_, j) => q.reduce((s, vec, k) => s + (vec[i] * vec[j]) / Math.sqrt(ce.eigenvectors[k].value as number), 0)),
    );
    const M = math.multiply(math.multiply(invSqrt, Km), invSqrt) as number[][];
    const sym = M.map((row, i) => row.map((x, j) => (x + M[j][i]) / 2));
    const ref = (math.eigs(sym).values as unknown as number[]).map((w2) => Math.sqrt(w2 * 1e15) / (2 * Math.PI)).sort((a, b) => a - b);
    const ours = predictModes(lap, { count: n }).spectrum;
    expect(ours).toHaveLength(ref.length);
    ours.forEach((f, i) => expect(f / ref[i]).toBeCloseTo(1, 9));
  });
});
