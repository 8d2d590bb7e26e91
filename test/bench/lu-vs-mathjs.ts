// Speed of the sparse complex LU (analyze + factor + solve) against mathjs dense lusolve on the same
// J(ω) of a square LC lattice: 10 nF between nearest neighbours, 22 µH from every node to ground,
// at 150 kHz. Both run in this process; the answers must agree before a time is reported.
import * as math from 'mathjs';
import { complexFromTriplets } from '../../src/numeric/csc.js';
import { analyzeLu } from '../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../src/numeric/lu-numeric.js';
import { solveLu } from '../../src/numeric/lu-solve.js';
import type { ComplexCsc, ComplexVector } from '../../src/numeric/types.js';
import { medianMs, printTable } from './timing.util.js';

const CAPACITANCE = 10e-9;
const INDUCTANCE = 22e-6;
const FREQUENCY = 150e3;

/** J = jωC_lap + L_lap/(jω) for a side×side lattice, built directly from element stamps. */
export function latticeAdmittance(side: number, omega = 2 * Math.PI * FREQUENCY): ComplexCsc {
  const n = side * side;
  const rows: number[] = [];
  const cols: number[] = [];
  const im: number[] = [];
  const yc = omega * CAPACITANCE; // jωC
  const yl = -1 / (omega * INDUCTANCE); // 1/(jωL) = −j/(ωL)
  for (let i = 0; i < n; i++) rows.push(i), cols.push(i), im.push(yl);
  for (let r = 0; r < side; r++) {
    for (let c = 0; c < side; c++) {
      const a = r * side + c;
      for (const b of [c + 1 < side ? a + 1 : -1, r + 1 < side ? a + side : -1]) {
        if (b < 0) continue;
        rows.push(a, b, a, b);
        cols.push(a, b, b, a);
        im.push(yc, yc, -yc, -yc);
      }
    }
  }
  return complexFromTriplets(n, rows, cols, new Array<number>(rows.length).fill(0), im);
}

function mathjsMatrix(A: ComplexCsc): math.Complex[][] {
  const n = A.n;
  const rows = Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(0, 0)));
  for (let j = 0; j < n; j++) {
    for (let p = A.colPtr[j]; p < A.colPtr[j + 1]; p++) rows[A.rowIdx[p]][j] = math.complex(A.re[p], A.im[p]);
  }
  return rows;
}

export async function run(): Promise<void> {
  const table: string[][] = [];
  for (const side of [7, 10, 14]) {
    const A = latticeAdmittance(side);
    const n = A.n;
    const b: ComplexVector = { re: new Float64Array(n), im: new Float64Array(n) };
    for (let i = 0; i < n; i++) b.re[i] = Math.cos(i) + 1; // a spread of injected currents (A)
    const ours = () => solveLu(factorLu(analyzeLu(A), A), b);
    const M = mathjsMatrix(A);
    const rhs = Array.from(b.re, (v) => [v]);
    const reference = () => math.lusolve(M, rhs);

    const x = ours();
    const ref = (reference().valueOf() as unknown as math.Complex[][]).map((row) => math.complex(row[0]));
    let diff = 0;
    let scale = 0;
    ref.forEach((z, i) => {
      diff = Math.max(diff, Math.hypot(z.re - x.re[i], z.im - x.im[i]));
      scale = Math.max(scale, Math.hypot(z.re, z.im));
    });
    if (!(diff <= 1e-9 * scale)) throw new Error(`lattice ${side}×${side}: solutions disagree (${diff / scale})`);

    const tOurs = medianMs(ours, 200, 15);
    const tRef = medianMs(reference, n >= 150 ? 3 : 5, 1);
    table.push([
      `${side}×${side}`,
      String(n),
      String(A.rowIdx.length),
      tOurs.toFixed(3),
      tRef.toFixed(1),
      `${(tRef / tOurs).toFixed(0)}×`,
      (diff / scale).toExponential(1),
    ]);
  }
  printTable('sparse LU (analyze+factor+solve) vs mathjs lusolve, LC lattice at 150 kHz', [
    'lattice',
    'nodes',
    'nnz',
    'ours ms',
    'mathjs ms',
    'ratio',
    'rel diff',
  ], table);
}
