// The demo boards in shared/boards/ are used by the CLI demo, so their physics is checked here from the
// expanded parts, independently of how the lattice was described.

import { readFileSync } from 'node:fs';
import { eigs } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { GROUND, loadBoard, parseBoardText, type Board } from '../../../src/board/index.js';

/** Capacitance matrix (nodal form) and the inductance to ground at each node. */
function networkOf(board: Board) {
  const index = new Map(board.nodes.map((n, k) => [n.name, k]));
  const n = board.nodes.length;
  const C = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const inverseL = new Array<number>(n).fill(0);
  for (const part of board.parts) {
    const [a, b] = part.nodes.map((node) => (node === GROUND ? undefined : index.get(node)));
    if (part.kind === 'C') {
      for (const k of [a, b]) if (k !== undefined) C[k][k] += part.value;
      if (a !== undefined && b !== undefined) {
        C[a][b] -= part.value;
        C[b][a] -= part.value;
      }
    } else if (part.kind === 'L') {
      expect(b).toBeUndefined(); // every inductor of the demo lattices goes to ground
      inverseL[a as number] += 1 / part.value;
    }
  }
  return { index, C, inverseL };
}

/**
 * At the frequency where each node's inductor cancels its total capacitance (ω0² = 1/(L·C_total), the
 * LC resonance; common practice), the admittance matrix divided by jω is C - 1/(ω0² L) = -(coupling
 * capacitances): its null-ish vectors are the edge and corner modes. Eigen-pairs in nF.
 */
function modesAtCancellation(board: Board) {
  const { index, C, inverseL } = networkOf(board);
  const totals = C.map((row, k) => row[k]);
  const f0 = 1 / (2 * Math.PI * Math.sqrt(totals[0] / inverseL[0]));
  const omega2 = (2 * Math.PI * f0) ** 2;
  const M = C.map((row, i) => row.map((x, j) => (i === j ? x - inverseL[i] / omega2 : x) * 1e9));
  const { eigenvectors } = eigs(M) as unknown as { eigenvectors: { value: number; vector: number[] }[] };
  const modes = eigenvectors
    .map((e) => ({ value: e.value, vector: e.vector }))
    .sort((p, q) => Math.abs(p.value) - Math.abs(q.value));
  return { index, totals, inverseL, f0, modes };
}

describe('shared/boards/chain-24.yaml', () => {
  const board = loadBoard('shared/boards/chain-24.yaml');

  it('has 24 nodes n1..n24 on a line and 12 + 11 couplings, 2 end terminations and 24 inductors', () => {
    expect(board.name).toBe('chain-24');
    expect(board.nodes.map((n) => n.name)).toEqual(Array.from({ length: 24 }, (_, k) => `n${k + 1}`));
    expect(board.nodes.map((n) => n.position)).toEqual(Array.from({ length: 24 }, (_, k) => [k, 0, 0]));
    expect(board.parts).toHaveLength(12 + 11 + 2 + 24);
    const intra = board.parts.filter((p) => p.ref.startsWith('C_intra_'));
    const inter = board.parts.filter((p) => /^C_inter_\d+$/.test(p.ref));
    expect(intra.map((p) => p.value)).toEqual(new Array(12).fill(10e-9));
    expect(inter.map((p) => p.value)).toEqual(new Array(11).fill(33e-9));
    for (const p of [...intra, ...inter]) expect(p).toMatchObject({ tolerance: 0.05, esr: 0.02 });
    expect(board.parts.filter((p) => /_(from|to)$/.test(p.ref)).map((p) => [p.ref, p.nodes[0], p.value])).toEqual([
      ['C_inter_0_to', 'n1', 33e-9],
      ['C_inter_11_from', 'n24', 33e-9],
    ]);
  });

  it('gives every node 43 nF in total and 22 µH (10 %, Q 50 at 100 kHz) to ground', () => {
    const { C, inverseL } = networkOf(board);
    for (let k = 0; k < 24; k++) {
      expect(C[k][k]).toBeCloseTo(43e-9, 20);
      expect(1 / inverseL[k]).toBeCloseTo(22e-6, 15);
    }
    for (const l of board.parts.filter((p) => p.kind === 'L')) {
      expect(l.tolerance).toBe(0.1);
      expect(l.esr).toBeCloseTo((2 * Math.PI * 100e3 * 22e-6) / 50, 12); // esr = ωL/Q
    }
  });

  it('cancels ground at f0 = 1/(2π√(22 µH · 43 nF)) ≈ 163.6 kHz with a left edge mode on n1, n3, n5, … of ratio -10/33', () => {
    const { f0, modes, index } = modesAtCancellation(board);
    expect(f0).toBeCloseTo(1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9)), 6);
    expect(f0 / 1e3).toBeCloseTo(163.6, 1);
    // Two edge modes (one per end) sit near zero; the bulk stays at least |33 - 10| nF away.
    expect(Math.abs(modes[1].value)).toBeLessThan(1e-3);
    expect(Math.abs(modes[2].value)).toBeGreaterThan(20);
    const edge = [modes[0], modes[1]].map((m) => m.vector).sort((p, q) => Math.abs(q[0]) - Math.abs(p[0]))[0];
    const at = (name: string) => edge[index.get(name) as number];
    for (let cell = 0; cell < 5; cell++) {
      expect(at(`n${2 * cell + 3}`) / at(`n${2 * cell + 1}`)).toBeCloseTo(-10 / 33, 6);
    }
    // The b sites near the left end stay empty (the right end's mode, mixed in, lives on b sites far right).
    for (const name of ['n2', 'n4', 'n6']) expect(Math.abs(at(name))).toBeLessThan(1e-4 * Math.abs(at('n1')));
  });
});

describe('the domain wall example of README.md on chain-24', () => {
  it('swaps the couplings from cell 6 on and still gives every node 43 nF', () => {
    const readme = readFileSync('README.md', 'utf8');
    const changes = /```yaml\n(  changes:\n[\s\S]*?)```/.exec(readme)?.[1];
    expect(changes).toBeDefined();
    const board = parseBoardText(readFileSync('shared/boards/chain-24.yaml', 'utf8') + (changes as string), 'wall.yaml');
    const { C } = networkOf(board);
    for (let k = 0; k < 24; k++) expect(C[k][k]).toBeCloseTo(43e-9, 20);
    const value = (ref: string) => board.parts.find((p) => p.ref === ref)?.value;
    expect([value('C_intra_5'), value('C_inter_5'), value('C_intra_6'), value('C_inter_6')]).toEqual([10e-9, 10e-9, 33e-9, 10e-9]);
    expect(board.parts.find((p) => p.ref === 'C_wall_5')?.nodes).toEqual(['n12', GROUND]);
  });
});

describe('shared/boards/corner-8x8.yaml', () => {
  const board = loadBoard('shared/boards/corner-8x8.yaml');

  it('has 64 nodes on an 8 x 8 grid', () => {
    expect(board.nodes).toHaveLength(64);
    const spots = new Set(board.nodes.map((n) => n.position.join(',')));
    for (let x = 0; x < 8; x++) for (let y = 0; y < 8; y++) expect(spots.has(`${x},${y},0`)).toBe(true);
    expect(board.lattice).toMatchObject({ dimensions: 2, repeats: [4, 4], boundary: ['open', 'open'] });
    expect(board.lattice?.cellParts).toHaveLength(8 + 4);
  });

  it('uses the stated couplings and gives every node 83.7 nF and 22 µH', () => {
    const values = (prefix: string) => [...new Set(board.parts.filter((p) => p.ref.startsWith(prefix)).map((p) => p.value))];
    expect(values('C_xin')).toEqual([10e-9]);
    expect(values('C_xout')).toEqual([22e-9]);
    expect(values('C_yin')).toEqual([4.7e-9]);
    expect(values('C_yout')).toEqual([47e-9]);
    const { C, inverseL } = networkOf(board);
    for (let k = 0; k < 64; k++) {
      expect(C[k][k]).toBeCloseTo(83.7e-9, 20);
      expect(1 / inverseL[k]).toBeCloseTo(22e-6, 15);
    }
  });

  it('cancels ground at f0 ≈ 117.3 kHz with four corner modes in a gap', () => {
    const { f0, modes, index } = modesAtCancellation(board);
    expect(f0 / 1e3).toBeCloseTo(117.3, 1);
    // Gap: the edge states start near |22 - 10| = 12 nF; the corner modes hybridise only weakly.
    expect(modes.slice(0, 4).every((m) => Math.abs(m.value) < 1)).toBe(true);
    expect(Math.abs(modes[4].value)).toBeGreaterThan(10);
    const corner = modes.slice(0, 4).map((m) => m.vector).sort((p, q) => Math.abs(q[0]) - Math.abs(p[0]))[0];
    const at = (name: string) => corner[index.get(name) as number];
    // Lower left corner mode on the a sites, decaying by about -10/22 along x and -4.7/47 along y.
    expect(at('a1_0') / at('a0_0')).toBeCloseTo(-10 / 22, 2);
    expect(at('a0_1') / at('a0_0')).toBeCloseTo(-4.7 / 47, 4);
  });
});

describe('shared/boards/tank-3.json', () => {
  it('loads the plain format with named parts', () => {
    const board = loadBoard('shared/boards/tank-3.json');
    expect(board.nodes.map((n) => n.name)).toEqual(['t1', 't2', 't3']);
    expect(board.parts.map((p) => p.ref)).toEqual(['L1', 'L2', 'L3', 'C1', 'C2', 'C3', 'C12', 'C23', 'R1']);
    expect(board.lattice).toBeUndefined();
  });
});
