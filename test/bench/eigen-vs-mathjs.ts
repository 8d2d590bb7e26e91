// Dense symmetric eigen-solver against mathjs eigs on random symmetric matrices, and the lossless-mode
// solver on a 1000-node lattice measured against the plain eigen-solve of the same size.
import * as math from 'mathjs';
import { symmetricEigen } from '../../src/numeric/dense-symmetric-eigen.js';
import { generalizedModes } from '../../src/numeric/pencil-modes.js';
import { seededRandom } from '../unit/numeric/helpers.js';
import { medianMs, printTable } from './timing.util.js';

function randomSymmetric(n: number, seed: number): Float64Array {
  const rand = seededRandom(seed);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) a[i * n + j] = a[j * n + i] = 2 * rand() - 1;
  }
  return a;
}

export async function run(): Promise<void> {
  const rows: string[][] = [];
  for (const n of [50, 100, 200]) {
    const a = randomSymmetric(n, n);
    const dense = Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
    const tOurs = medianMs(() => symmetricEigen(n, a), 5, 1);
    const tRef = medianMs(() => math.eigs(dense), n >= 200 ? 1 : 3, n >= 200 ? 0 : 1);
    const ours = symmetricEigen(n, a).values;
    const ref = (math.eigs(dense).values as unknown as number[]).slice().sort((x, y) => x - y);
    const diff = Math.max(...ref.map((v, k) => Math.abs(v - ours[k])));
    if (!(diff < 1e-10 * n)) throw new Error(`n=${n}: eigenvalues disagree by ${diff}`);
    rows.push([String(n), tOurs.toFixed(1), tRef.toFixed(1), `${(tRef / tOurs).toFixed(1)}×`, diff.toExponential(1)]);
  }
  printTable('symmetricEigen vs mathjs eigs (values and vectors)', ['n', 'ours ms', 'mathjs ms', 'ratio', 'max |Δλ|'], rows);

  // 1000-node lattice board (40×25): C to ground and between neighbours, L between neighbours.
  const nx = 40;
  const ny = 25;
  const n = nx * ny;
  const K = new Float64Array(n * n);
  const C = new Float64Array(n * n);
  const stamp = (m: Float64Array, a: number, b: number, g: number) => {
    m[a * n + a] += g;
    if (b < 0) return;
    m[b * n + b] += g;
    m[a * n + b] -= g;
    m[b * n + a] -= g;
  };
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      const a = y * nx + x;
      stamp(C, a, -1, 1e-9);
      if (x + 1 < nx) stamp(C, a, a + 1, 10e-9), stamp(K, a, a + 1, 1 / 22e-6);
      if (y + 1 < ny) stamp(C, a, a + nx, 10e-9), stamp(K, a, a + nx, 1 / 22e-6);
    }
  }
  const tEig = medianMs(() => symmetricEigen(n, K), 1, 0);
  const tModes = medianMs(() => generalizedModes(n, K, C), 1, 0);
  printTable('lossless modes of a 1000-node lattice', ['n', 'symmetricEigen ms', 'generalizedModes ms', 'ratio'], [
    [String(n), tEig.toFixed(0), tModes.toFixed(0), `${(tModes / tEig).toFixed(2)}×`],
  ]);
}
