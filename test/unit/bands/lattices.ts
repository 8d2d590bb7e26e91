// Unit cells used by the band tests, written out as lattice summaries (our own values).
import { GROUND, type CellPart, type LatticeSummary } from '../../../src/board/types.js';

/** Dimerized capacitor chain: intracell v (A-B), intercell w (B to the next A), L from every site to ground. */
export function dimerizedChain(v: number, w: number, L: number, a: number, cells = 1): LatticeSummary {
  return {
    dimensions: 1,
    repeats: [cells],
    boundary: ['periodic'],
    vectors: [[a, 0, 0]],
    sites: [
      { name: 'A', position: [0, 0, 0] },
      { name: 'B', position: [a / 2, 0, 0] },
    ],
    cellParts: [
      { kind: 'C', from: 'A', to: 'B', offset: [0], value: v },
      { kind: 'C', from: 'B', to: 'A', offset: [1], value: w },
      { kind: 'L', from: 'A', to: GROUND, offset: [0], value: L },
      { kind: 'L', from: 'B', to: GROUND, offset: [0], value: L },
      // a loss resistor: takes no part in the lossless bands or modes
      { kind: 'R', from: 'A', to: 'B', offset: [0], value: 1e3 },
    ],
  };
}

/**
 * A two-site square-lattice cell where both C(theta) and K(theta) carry phases on both axes, including a bond
 * from a site to its own image in the next cell and a diagonal bond.
 */
export function mixedSquareSheet(repeats: [number, number]): LatticeSummary {
  return {
    dimensions: 2,
    repeats,
    boundary: ['periodic', 'periodic'],
    vectors: [
      [1, 0, 0],
      [0, 1, 0],
    ],
    sites: [
      { name: 'a', position: [0, 0, 0] },
      { name: 'b', position: [0.5, 0.5, 0] },
    ],
    cellParts: [
      { kind: 'C', from: 'a', to: 'b', offset: [0, 0], value: 4.7e-9 },
      { kind: 'C', from: 'b', to: 'a', offset: [1, 0], value: 6.8e-9 },
      { kind: 'C', from: 'b', to: 'a', offset: [0, 1], value: 3.3e-9 },
      { kind: 'C', from: 'a', to: 'a', offset: [0, 1], value: 2.2e-9 },
      { kind: 'C', from: 'b', to: GROUND, offset: [0, 0], value: 1.5e-9 },
      { kind: 'L', from: 'a', to: GROUND, offset: [0, 0], value: 10e-6 },
      { kind: 'L', from: 'b', to: GROUND, offset: [0, 0], value: 15e-6 },
      { kind: 'L', from: 'a', to: 'b', offset: [1, 1], value: 47e-6 },
      { kind: 'L', from: 'b', to: 'b', offset: [1, 0], value: 33e-6 },
      { kind: 'R', from: 'a', to: GROUND, offset: [0, 0], value: 50 },
    ],
  };
}

/**
 * Honeycomb ribbon with zigzag edges, periodic along x with period a (the zigzag direction). The cell is a
 * whole cross-section of W zigzag chains, each with an A and a B site (2W sites). Geometry, with bond
 * length d = a / sqrt(3): chain j (1-based) sits at height (j-1) 1.5 d; odd chains put A_j at x = 0 and
 * B_j at (a/2, d/2 higher), even chains A_j at x = a/2 and B_j at x = 0, so that every site lies in
 * [0, a). Bonds: along each chain A_j-B_j twice (one crossing into the next cell, which one depends on the
 * chain's parity), and a vertical rung B_j-A_{j+1} inside the cell. A_1 and B_W are the edge sites with
 * two bonds instead of three; a ground capacitor Ct makes up their missing bond, so the diagonal of C is
 * 3 Ct everywhere. Every site has L to ground.
 */
export function zigzagRibbon(W: number, Ct: number, L: number, a: number): LatticeSummary {
  const d = a / Math.sqrt(3);
  const sites: LatticeSummary['sites'] = [];
  const cellParts: CellPart[] = [];
  const A = (j: number) => `A${j}`;
  const B = (j: number) => `B${j}`;
  for (let j = 1; j <= W; j++) {
    const odd = j % 2 === 1;
    const y = (j - 1) * 1.5 * d;
    sites.push({ name: A(j), position: [odd ? 0 : a / 2, y, 0] }, { name: B(j), position: [odd ? a / 2 : 0, y + d / 2, 0] });
    cellParts.push(
      { kind: 'C', from: A(j), to: B(j), offset: [odd ? 0 : 1], value: Ct },
      { kind: 'C', from: B(j), to: A(j), offset: [odd ? 1 : 0], value: Ct },
    );
    if (j < W) cellParts.push({ kind: 'C', from: B(j), to: A(j + 1), offset: [0], value: Ct });
  }
  cellParts.push(
    { kind: 'C', from: A(1), to: GROUND, offset: [0], value: Ct },
    { kind: 'C', from: B(W), to: GROUND, offset: [0], value: Ct },
  );
  for (const s of sites) cellParts.push({ kind: 'L', from: s.name, to: GROUND, offset: [0], value: L });
  return { dimensions: 1, repeats: [1], boundary: ['periodic'], vectors: [[a, 0, 0]], sites, cellParts };
}
