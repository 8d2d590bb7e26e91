// Ordering speed and quality on lattice graphs: approximate minimum degree on 10,000-node 2D and
// 20×20×20 3D grids, and the analyze+factor pipeline against mathjs slu (its own AMD, order 1) on
// the same matrices in the same process.
import * as math from 'mathjs';
import { approximateMinimumDegree } from '../../src/numeric/amd.js';
import { analyzeLu } from '../../src/numeric/lu-symbolic.js';
import { factorLu } from '../../src/numeric/lu-numeric.js';
import { latticePattern, laplacianValues, mathjsSparse } from '../unit/numeric/helpers.js';
import { medianMs, printTable } from './timing.util.js';

export async function run(): Promise<void> {
  const orderingRows: string[][] = [];
  for (const dims of [[100, 100], [20, 20, 20]]) {
    const p = latticePattern(dims);
    const A = laplacianValues(p);
    const tAmd = medianMs(() => approximateMinimumDegree(p), 7, 2);
    const sym = analyzeLu(p);
    const tFactor = medianMs(() => factorLu(sym, A), dims.length === 3 ? 1 : 5, 1);
    const f = factorLu(sym, A);
    orderingRows.push([
      dims.join('×'),
      String(p.n),
      tAmd.toFixed(1),
      tFactor.toFixed(1),
      `${((100 * tAmd) / (tAmd + tFactor)).toFixed(1)}%`,
      String(f.nnzL + f.nnzU - p.n),
    ]);
  }
  printTable('approximate minimum degree on lattices', ['grid', 'nodes', 'amd ms', 'factor ms', 'amd share', 'nnz(L+U)'], orderingRows);

  const versusRows: string[][] = [];
  for (const dims of [[100, 100], [12, 12, 12]]) {
    const p = latticePattern(dims);
    const A = laplacianValues(p);
    const S = mathjsSparse(p, A.re);
    const ours = () => factorLu(analyzeLu(p), A);
    const reference = () => math.slu(S, 1, 0.001) as unknown as { L: { _values: number[] }; U: { _values: number[] } };
    const tOurs = medianMs(ours, 5, 1);
    const tRef = medianMs(reference, 3, 1);
    const f = ours();
    const s = reference();
    versusRows.push([
      dims.join('×'),
      String(p.n),
      tOurs.toFixed(1),
      tRef.toFixed(1),
      `${(tRef / tOurs).toFixed(1)}×`,
      String(f.nnzL + f.nnzU - p.n),
      String(s.L._values.length + s.U._values.length - p.n),
    ]);
  }
  printTable('analyze+factor vs mathjs slu(order 1)', ['grid', 'nodes', 'ours ms', 'mathjs ms', 'ratio', 'nnz ours', 'nnz mathjs'], versusRows);
}
