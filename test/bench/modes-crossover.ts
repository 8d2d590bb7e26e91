// Where shift-invert Lanczos overtakes the dense pencil solver, the measurement behind DENSE_NODE_LIMIT in
// src/predict/modes.ts: 2D dimerized lattices (as shared/boards/corner-8x8.yaml, larger), 10 modes at the
// median node self-resonance, timed against the dense generalizedModes of the same board.
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { generalizedModes } from '../../src/numeric/pencil-modes.js';
import { shiftInvertModes } from '../../src/numeric/lanczos-shift-invert.js';
import { medianNodeResonance } from '../../src/numeric/shift-invert-target.js';
import { DENSE_NODE_LIMIT } from '../../src/predict/modes.js';
import { dimerizedSquareBoard } from './modes-boards.util.js';
import { medianMs, printTable } from './timing.util.js';

export async function run(): Promise<void> {
  const rows: string[][] = [];
  for (const side of [10, 14, 16, 18, 20, 24, 30]) {
    const lap = new GroundedLaplacian(dimerizedSquareBoard(side, side));
    const { pattern, capacitance, inverseInductance } = lap.losslessSparse();
    const { n, capacitance: Cd, inverseInductance: Kd } = lap.losslessMatrices();
    const sigma = medianNodeResonance(pattern, inverseInductance, capacitance)!;
    const sparseMs = medianMs(() => shiftInvertModes(pattern, inverseInductance, capacitance, { count: 10, shift: sigma }), 3, 1);
    const denseMs = medianMs(() => generalizedModes(n, Kd, Cd), n > 500 ? 1 : 3, n > 500 ? 0 : 1);
    rows.push([String(n), denseMs.toFixed(0), sparseMs.toFixed(0), `${(denseMs / sparseMs).toFixed(2)}×`]);
  }
  printTable(`dense vs shift-invert, 10 modes (predictModes switches above ${DENSE_NODE_LIMIT} nodes)`, ['n', 'dense ms', 'Lanczos ms', 'dense / Lanczos'], rows);
}
