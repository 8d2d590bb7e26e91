// Lattice boards for the mode benchmarks (our own values, in the style of the lab's demo boards).
import { GROUND, type Board } from '../../src/board/types.js';
import { makeBoard, type PartSpec } from '../support/make-board.js';

/** N×N×N cubic LC lattice: `bond` farads between neighbours, `tank` henries from every node to ground. */
export function cubicBoard(N: number, bond = 10e-9, tank = 22e-6): Board {
  const specs: PartSpec[] = [];
  const id = (x: number, y: number, z: number) => `n${x}_${y}_${z}`;
  for (let x = 0; x < N; x++) {
    for (let y = 0; y < N; y++) {
      for (let z = 0; z < N; z++) {
        specs.push(['L', id(x, y, z), GROUND, tank]);
        if (x + 1 < N) specs.push(['C', id(x, y, z), id(x + 1, y, z), bond]);
        if (y + 1 < N) specs.push(['C', id(x, y, z), id(x, y + 1, z), bond]);
        if (z + 1 < N) specs.push(['C', id(x, y, z), id(x, y, z + 1), bond]);
      }
    }
  }
  return makeBoard(`cube-${N}`, specs);
}

/**
 * 2D dimerized square lattice of nx×ny nodes (nx, ny even), built like shared/boards/corner-8x8.yaml:
 * 10/22 nF alternating in x, 4.7/47 nF in y, open edges terminated to ground with the missing bond, and
 * 22 µH from every node to ground.
 */
export function dimerizedSquareBoard(nx: number, ny: number): Board {
  const specs: PartSpec[] = [];
  const id = (x: number, y: number) => `s${x}_${y}`;
  const xBond = (x: number) => (x % 2 === 0 ? 10e-9 : 22e-9);
  const yBond = (y: number) => (y % 2 === 0 ? 4.7e-9 : 47e-9);
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      specs.push(['L', id(x, y), GROUND, 22e-6]);
      if (x + 1 < nx) specs.push(['C', id(x, y), id(x + 1, y), xBond(x)]);
      if (y + 1 < ny) specs.push(['C', id(x, y), id(x, y + 1), yBond(y)]);
    }
  }
  // Terminate: the first and last node of each row and column lack one outer bond.
  for (let y = 0; y < ny; y++) specs.push(['C', id(0, y), GROUND, xBond(1)], ['C', id(nx - 1, y), GROUND, xBond(nx - 1)]);
  for (let x = 0; x < nx; x++) specs.push(['C', id(x, 0), GROUND, yBond(1)], ['C', id(x, ny - 1), GROUND, yBond(ny - 1)]);
  return makeBoard(`dimerized-${nx}x${ny}`, specs);
}
