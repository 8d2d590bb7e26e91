// The 10 lossless modes nearest a target on a 3D board too large for comfort with the dense solver: a
// 12×12×12 cubic LC lattice (1,728 nodes, 10 nF bonds, 22 µH from every node to ground). Its spectrum runs
// from about 99 kHz to 1.30 MHz with the median mode near 145 kHz; cubic symmetry makes most eigenvalues
// 3-, 6- or more-fold degenerate. Shift-invert Lanczos is timed at a target in the middle of the spectrum
// and at targets near both edges, against the dense generalizedModes on the same board (run once; it
// gives every mode, so the nearest 10 for each target come from one run).
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { generalizedModes } from '../../src/numeric/pencil-modes.js';
import { shiftInvertModes } from '../../src/numeric/lanczos-shift-invert.js';
import { cubicBoard } from './modes-boards.util.js';
import { medianMs, printTable } from './timing.util.js';

const COUNT = 10;
const TARGETS: [label: string, hz: number][] = [
  ['middle', 140e3],
  ['low edge', 100e3],
  ['high edge', 1.25e6],
];

export async function run(): Promise<void> {
  const lap = new GroundedLaplacian(cubicBoard(12));
  const { pattern, capacitance, inverseInductance } = lap.losslessSparse();
  const { n, capacitance: Cd, inverseInductance: Kd } = lap.losslessMatrices();

  const t0 = performance.now();
  const dense = generalizedModes(n, Kd, Cd);
  const denseMs = performance.now() - t0;

  const rows: string[][] = [];
  for (const [label, hz] of TARGETS) {
    const sigma = (2 * Math.PI * hz) ** 2;
    const solve = () => shiftInvertModes(pattern, inverseInductance, capacitance, { count: COUNT, shift: sigma });
    const ms = medianMs(solve, 3, 1);
    const result = solve();
    const ours = Array.from(result.values, (w2) => Math.sqrt(w2)).sort((a, b) => a - b);
    const ref = Array.from(dense.omega2)
      .sort((a, b) => Math.abs(a - sigma) - Math.abs(b - sigma))
      .slice(0, COUNT)
      .map(Math.sqrt)
      .sort((a, b) => a - b);
    const maxRel = Math.max(...ref.map((w, i) => Math.abs(ours[i] / w - 1)));
    const counted = result.completeness.method === 'inertia' ? `${result.completeness.counted}` : result.completeness.method;
    rows.push([
      `${label} ${(hz / 1e3).toFixed(0)} kHz`,
      ms.toFixed(0),
      denseMs.toFixed(0),
      `${(denseMs / ms).toFixed(0)}×`,
      maxRel.toExponential(1),
      Math.max(...result.residuals).toExponential(1),
      String(result.solves),
      String(result.restarts),
      counted,
    ]);
  }
  printTable(
    `${COUNT} modes nearest a target, 12×12×12 LC lattice (n = ${n}): shift-invert Lanczos vs dense generalizedModes`,
    ['target', 'Lanczos ms', 'dense ms', 'ratio', 'max rel Δf', 'max residual', 'solves', 'restarts', 'inertia count'],
    rows,
  );
}
