// Speed of the fit's Jacobian from adjoint sensitivities against a forward-difference Jacobian (one more
// evaluation of all residuals per parameter), for the all-parts fit of chain-24 and corner-8x8: every
// node read to ground at 12 frequencies around the band. Both run in this process on the same model; they
// must agree before a time is reported.
import { loadBoard } from '../../src/board/index.js';
import type { Board } from '../../src/board/types.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { FitModel } from '../../src/analysis/fit-model.js';
import { FitParameters } from '../../src/analysis/fit-parameters.js';
import { prepareReadings } from '../../src/analysis/fit-readings.js';
import { checkFitSpec } from '../../src/analysis/fit-spec.js';
import type { Reading } from '../../src/analysis/readings.js';
import { medianMs, printTable } from './timing.util.js';

const FREQUENCIES = 12;

function scan(board: Board, from: number, to: number): Reading[] {
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const readings: Reading[] = [];
  for (let i = 0; i < FREQUENCIES; i++) {
    const f = from + ((to - from) * i) / (FREQUENCIES - 1);
    const solved = solver.at(f);
    for (const node of board.nodes) {
      const z = solved.toGround(node.name);
      // 1 % off the nominal board, so that residuals and their derivatives are not special.
      readings.push({ step: i, point: readings.length, kind: 'to-ground', hi: node.name, lo: 'gnd', frequency_hz: f, re: z.re * 1.01, im: z.im, pred_re: 0, pred_im: 0, flag: 'ok' });
    }
  }
  return readings;
}

function forwardDifferences(model: FitModel, theta: Float64Array, h: number): Float64Array {
  const P = model.parameterCount;
  const base = model.residuals(theta);
  const jacobian = new Float64Array(base.length * P);
  for (let m = 0; m < P; m++) {
    const moved = Float64Array.from(theta);
    moved[m] += h;
    const r = model.residuals(moved);
    for (let i = 0; i < r.length; i++) jacobian[i * P + m] = (r[i] - base[i]) / h;
  }
  return jacobian;
}

export async function run(): Promise<void> {
  const rows: string[][] = [];
  for (const [file, from, to] of [
    ['chain-24.yaml', 120e3, 210e3],
    ['corner-8x8.yaml', 90e3, 150e3],
  ] as const) {
    const board = loadBoard(`shared/boards/${file}`);
    const readings = scan(board, from, to);
    const laplacian = new GroundedLaplacian(board);
    const parameters = new FitParameters(board, checkFitSpec(board, { allParts: true }), { referenceHz: (from + to) / 2 });
    const model = new FitModel(laplacian, prepareReadings(readings, laplacian.index, board), parameters, { relative: 1e-3, floor: 0 });
    const theta = parameters.start;

    const adjoint = model.residualsAndJacobian(theta).jacobian;
    const differences = forwardDifferences(model, theta, 1e-7);
    let largest = 0;
    let worst = 0;
    for (let i = 0; i < adjoint.length; i++) {
      largest = Math.max(largest, Math.abs(adjoint[i]));
      worst = Math.max(worst, Math.abs(adjoint[i] - differences[i]));
    }
    if (!(worst <= 1e-4 * largest)) throw new Error(`${file}: adjoint and finite-difference Jacobians differ by ${worst / largest} of the largest entry`);

    const adjointMs = medianMs(() => model.residualsAndJacobian(theta), 5);
    const differenceMs = medianMs(() => forwardDifferences(model, theta, 1e-7), 1, 0);
    rows.push([
      board.name,
      String(parameters.count),
      String(readings.length),
      adjointMs.toFixed(1),
      differenceMs.toFixed(0),
      (differenceMs / adjointMs).toFixed(0),
      (worst / largest).toExponential(1),
    ]);
  }
  printTable('Fit Jacobian, all-parts fit: adjoint sensitivities against forward differences (this process)', [
    'board', 'parameters', 'readings', 'adjoint ms', 'differences ms', 'ratio', 'max rel. diff',
  ], rows);
}
