// Every node's impedance to ground at one frequency: selected inversion of the LU factors (with its
// rounding check) against the project's N-solve path (SolvedFrequency.toGround for every node) and, at
// 400 nodes, mathjs dense inv. Square LC lattices of 400, 2,500 and 10,000 nodes and a 20×20×20 cubic one:
// 10 nF bonds, 22 µH + 0.2 Ω from every node to ground, at 150 kHz. Everything runs in this process.
import { pathToFileURL } from 'node:url';
import * as math from 'mathjs';
import { GROUND, type Board } from '../../src/board/types.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { analyzeLu } from '../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../src/numeric/lu-numeric.js';
import { analyzeSelectedInverse } from '../../src/numeric/selected-inverse-pattern.js';
import { selectedInverse } from '../../src/numeric/selected-inverse-takahashi.js';
import { inverseDiagonal } from '../../src/numeric/selected-inverse.js';
import type { ComplexVector } from '../../src/numeric/types.js';
import { makeBoard, type PartSpec } from '../support/make-board.js';
import { medianMs, printTable } from './timing.util.js';

const BOND = 10e-9;
const TANK = 22e-6;
const TANK_ESR = 0.2;
const FREQUENCY = 150e3;
/** Above this many nodes the N-solve reference is timed on a sample of nodes and extrapolated. */
const FULL_REFERENCE_LIMIT = 2500;
const REFERENCE_SAMPLE = 300;

/** Lattice of the given extents (2 or 3 of them): bonds between neighbours, a lossy tank to ground. */
export function lcLatticeBoard(dims: number[], bond = BOND, tank = TANK, esr: number | undefined = TANK_ESR): Board {
  const n = dims.reduce((a, b) => a * b, 1);
  const strides = dims.map((_, d) => dims.slice(0, d).reduce((a, b) => a * b, 1));
  const specs: PartSpec[] = [];
  for (let i = 0; i < n; i++) {
    specs.push(['L', `n${i}`, GROUND, tank, esr]);
    dims.forEach((size, d) => {
      if ((Math.floor(i / strides[d]) % size) + 1 < size) specs.push(['C', `n${i}`, `n${i + strides[d]}`, bond]);
    });
  }
  return makeBoard(`lc-${dims.join('x')}`, specs);
}

/** max over the listed nodes of |x_v − y_v| / |y_v|. */
function worstDifference(x: ComplexVector, y: Map<number, { re: number; im: number }>): number {
  let worst = 0;
  for (const [v, z] of y) worst = Math.max(worst, Math.hypot(x.re[v] - z.re, x.im[v] - z.im) / Math.hypot(z.re, z.im));
  return worst;
}

interface Measured {
  label: string;
  n: number;
  twoD: boolean;
  nnzLU: number;
  analyze: number;
  factor: number;
  pattern: number;
  recurrences: number;
  checked: number;
  total: number;
  recomputed: number;
  reference: number;
  referenceNote: string;
  mathjs?: number;
  diffSolve: number;
  diffMathjs?: number;
}

function measure(label: string, dims: number[]): Measured {
  const lap = new GroundedLaplacian(lcLatticeBoard(dims));
  const n = lap.index.size;
  const A = lap.assemble(2 * Math.PI * FREQUENCY);
  const big = n > FULL_REFERENCE_LIMIT;
  const repeats = n >= 8000 ? 1 : n >= 2500 ? 3 : 7;

  // Selected inversion, phase by phase (each phase timed on its own, inputs from the untimed warm-up).
  const sym = analyzeLu(lap.pattern);
  const f = factorLu(sym, A);
  const pattern = analyzeSelectedInverse(f);
  const result = inverseDiagonal(f, { pattern });
  const analyze = medianMs(() => analyzeLu(lap.pattern), repeats);
  const factor = medianMs(() => factorLu(sym, A), repeats);
  const patternMs = medianMs(() => analyzeSelectedInverse(f), repeats);
  const recurrences = medianMs(() => selectedInverse(f, pattern), repeats);
  const checked = medianMs(() => inverseDiagonal(f, { pattern }), repeats);

  // Reference: the N-solve path as the project has it (analysis and factorization in the solver, then one
  // solve per node with its residual check). Large boards: a sample of nodes, extrapolated to all n.
  const nodes = big
    ? Array.from({ length: REFERENCE_SAMPLE }, (_, s) => Math.floor((s * n) / REFERENCE_SAMPLE))
    : Array.from({ length: n }, (_, v) => v);
  const bySolves = new Map<number, { re: number; im: number }>();
  const t0 = performance.now();
  const solved = new ImpedanceSolver(lap).at(FREQUENCY);
  const setup = performance.now() - t0;
  const t1 = performance.now();
  for (const v of nodes) bySolves.set(v, solved.toGround(lap.index.names[v]));
  const perSolve = (performance.now() - t1) / nodes.length;
  const reference = setup + perSolve * n;

  let mathjs: number | undefined;
  let diffMathjs: number | undefined;
  if (n === 400) {
    const M = Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(0, 0)));
    for (let j = 0; j < n; j++) {
      for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) M[A.rowIdx[p]][j] = math.complex(A.re[p], A.im[p]);
    }
    const t2 = performance.now();
    const inv = math.inv(M) as unknown as math.Complex[][];
    mathjs = performance.now() - t2;
    const diagonal = new Map(Array.from({ length: n }, (_, v) => [v, math.complex(inv[v][v])]));
    diffMathjs = worstDifference(result.diagonal, diagonal);
  }

  return {
    label,
    n,
    twoD: dims.length === 2,
    nnzLU: f.nnzL + f.nnzU - n,
    analyze,
    factor,
    pattern: patternMs,
    recurrences,
    checked,
    total: analyze + factor + patternMs + checked,
    recomputed: result.recomputed.length,
    reference,
    referenceNote: big ? `${REFERENCE_SAMPLE} solves ×${(n / REFERENCE_SAMPLE).toFixed(1)}` : `all ${n} solves`,
    mathjs,
    diffSolve: worstDifference(result.diagonal, bySolves),
    diffMathjs,
  };
}

const ms = (t: number) => (t >= 1000 ? `${(t / 1000).toFixed(2)} s` : `${t.toFixed(t < 10 ? 2 : 0)} ms`);

export async function run(): Promise<void> {
  const boards: [string, number[]][] = [
    ['2D 20×20', [20, 20]],
    ['2D 50×50', [50, 50]],
    ['2D 100×100', [100, 100]],
    ['3D 20×20×20', [20, 20, 20]],
  ];
  const results = boards.map(([label, dims]) => measure(label, dims));

  printTable(
    `all-node impedance to ground at ${FREQUENCY / 1e3} kHz (10 nF bonds, 22 µH + 0.2 Ω to ground)`,
    [
      'board',
      'nodes',
      'nnz(L+U)',
      'analyze',
      'factor',
      'inv pattern',
      'recurrences',
      'check+repair',
      'recomputed',
      'total',
    ],
    results.map((r) => [
      r.label,
      String(r.n),
      String(r.nnzLU),
      ms(r.analyze),
      ms(r.factor),
      ms(r.pattern),
      ms(r.recurrences),
      ms(r.checked - r.recurrences),
      String(r.recomputed),
      ms(r.total),
    ]),
  );
  printTable(
    'references (same process): N-solve path = ImpedanceSolver.at + toGround for every node',
    ['board', 'N-solve path', 'how', 'ratio', 'mathjs inv', 'ratio', 'max rel diff vs solves', 'vs mathjs'],
    results.map((r) => [
      r.label,
      ms(r.reference),
      r.referenceNote,
      `${(r.reference / r.total).toFixed(0)}×`,
      r.mathjs === undefined ? '-' : ms(r.mathjs),
      r.mathjs === undefined ? '-' : `${(r.mathjs / r.total).toFixed(0)}×`,
      r.diffSolve.toExponential(1),
      r.diffMathjs === undefined ? '-' : r.diffMathjs.toExponential(1),
    ]),
  );
  const twoD = results.filter((r) => r.twoD);
  const slope = (a: number, b: number, na: number, nb: number) => (Math.log(b / a) / Math.log(nb / na)).toFixed(2);
  printTable(
    'growth exponent of time vs nodes between 2D sizes (log-log slope)',
    ['from → to', 'selected-inversion total', 'factorization alone', 'recurrences alone', 'N-solve path'],
    twoD.slice(1).map((r, k) => {
      const p = twoD[k];
      return [
        `${p.n} → ${r.n}`,
        slope(p.total, r.total, p.n, r.n),
        slope(p.factor, r.factor, p.n, r.n),
        slope(p.recurrences, r.recurrences, p.n, r.n),
        slope(p.reference, r.reference, p.n, r.n),
      ];
    }),
  );
  const target = results.find((r) => r.n === 10000);
  if (target) console.log(`\n10,000-node 2D board: ${ms(target.total)} in all (target: under 1 s)`);
}

// Also runnable on its own: npx tsx test/bench/all-node-impedance.ts
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  run().catch((err: unknown) => {
    console.error(err);
    process.exitCode = 1;
  });
}
