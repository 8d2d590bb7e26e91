import { describe, expect, it } from 'vitest';
import { BoardError, GROUND, parseBoardText, type Board, type Part } from '../../../src/board/index.js';

/** A dimerized chain in YAML; `extra` is appended inside the lattice section. */
function chain(options: { repeats?: number; boundary?: string; terminate?: boolean; names?: string; extra?: string } = {}): string {
  return [
    'name: test-chain',
    'lattice:',
    `  repeats: [${options.repeats ?? 4}]`,
    `  boundary: ${options.boundary ?? 'open'}`,
    '  vectors: [[2, 0, 0]]',
    '  sites: { a: [0, 0], b: [1, 0] }',
    options.names ? `  names: "${options.names}"` : '',
    options.terminate ? '  terminate: true' : '',
    '  bonds:',
    '    - { id: v, from: a, to: b, kind: C, value: 10n, tolerance: 5%, esr: 0.02 }',
    '    - { id: w, from: b, to: a, offset: [1], kind: C, value: 33n, tolerance: 5%, esr: 0.02 }',
    '  grounds:',
    '    - { id: la, site: a, kind: L, value: 22u, q: 50, q_at: 100k }',
    '    - { id: lb, site: b, kind: L, value: 22u, q: 50, q_at: 100k }',
    options.extra ?? '',
  ].join('\n');
}

function part(board: Board, ref: string): Part {
  const found = board.parts.find((p) => p.ref === ref);
  if (!found) throw new Error(`no part ${ref}; refs: ${board.parts.map((p) => p.ref).join(' ')}`);
  return found;
}

function capacitanceAt(board: Board): Map<string, number> {
  const total = new Map<string, number>();
  for (const p of board.parts) {
    if (p.kind !== 'C') continue;
    for (const node of p.nodes) if (node !== GROUND) total.set(node, (total.get(node) ?? 0) + p.value);
  }
  return total;
}

function problemsOf(text: string): { path: string; message: string }[] {
  try {
    parseBoardText(text, 'inline.yaml');
  } catch (error) {
    if (error instanceof BoardError) return error.problems.map(({ path, message }) => ({ path, message }));
    throw error;
  }
  throw new Error('parsed without problems');
}

describe('lattice expansion: one axis', () => {
  it('makes sites x cells nodes and the bulk parts, named and placed by the defaults', () => {
    const board = parseBoardText(chain(), 'inline.yaml');
    expect(board.nodes.map((n) => n.name)).toEqual(['a0', 'b0', 'a1', 'b1', 'a2', 'b2', 'a3', 'b3']);
    // Open chain of 4 cells: 4 intracell + 3 intercell bonds, 8 inductors, no terminations.
    expect(board.parts).toHaveLength(4 + 3 + 8);
    expect(board.nodes.map((n) => n.position[0])).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(board.nodes[3]).toMatchObject({ cell: [1], site: 'b', position: [3, 0, 0] });
    expect(part(board, 'C_v_2').nodes).toEqual(['a2', 'b2']);
    expect(part(board, 'C_w_2').nodes).toEqual(['b2', 'a3']);
    expect(part(board, 'L_lb_3').nodes).toEqual(['b3', GROUND]);
    expect(board.parts.some((p) => p.ref === 'C_w_3')).toBe(false);
    expect(part(board, 'C_w_0').origin).toBe('lattice.bonds[1] cell (0)');
  });

  it('turns q at a frequency into esr = ωL/Q (series-resistance definition of Q; common practice)', () => {
    const board = parseBoardText(chain(), 'inline.yaml');
    expect(part(board, 'L_la_0').esr).toBeCloseTo((2 * Math.PI * 100e3 * 22e-6) / 50, 12);
    expect(part(board, 'C_v_0')).toMatchObject({ value: 10e-9, tolerance: 0.05, esr: 0.02 });
  });

  it('names nodes from a template with a running index counted from 1', () => {
    const board = parseBoardText(chain({ names: 'n{index}' }), 'inline.yaml');
    expect(board.nodes.map((n) => n.name)).toEqual(['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8']);
    expect(part(board, 'C_w_0').nodes).toEqual(['n2', 'n3']);
  });

  it('wraps bonds round a periodic axis and needs no termination there', () => {
    const board = parseBoardText(chain({ boundary: 'periodic', terminate: true }), 'inline.yaml');
    expect(board.parts).toHaveLength(4 + 4 + 8);
    expect(part(board, 'C_w_3').nodes).toEqual(['b3', 'a0']);
    expect(board.parts.filter((p) => /_(from|to)$/.test(p.ref))).toEqual([]);
    expect(new Set(capacitanceAt(board).values())).toEqual(new Set([43e-9]));
  });

  it('terminates open ends with the missing bond, so every node carries the bulk capacitance', () => {
    const board = parseBoardText(chain({ terminate: true }), 'inline.yaml');
    expect(part(board, 'C_w_0_to')).toMatchObject({ nodes: ['a0', GROUND], value: 33e-9, tolerance: 0.05, esr: 0.02 });
    expect(part(board, 'C_w_3_from')).toMatchObject({ nodes: ['b3', GROUND], value: 33e-9 });
    expect(board.parts).toHaveLength(4 + 3 + 2 + 8);
    const totals = [...capacitanceAt(board).values()];
    for (const total of totals) expect(total).toBeCloseTo(43e-9, 20);
    expect(part(board, 'C_w_0_to').origin).toBe('lattice.terminate for lattice.bonds[1] at cell (0)');
  });

  it('keeps the bulk unit cell in the summary', () => {
    const board = parseBoardText(chain({ terminate: true, extra: '  changes:\n    - { cell: 0, part: v, value: 47n }' }), 'inline.yaml');
    expect(board.lattice).toMatchObject({ dimensions: 1, repeats: [4], boundary: ['open'], vectors: [[2, 0, 0]] });
    expect(board.lattice?.sites).toEqual([
      { name: 'a', position: [0, 0, 0] },
      { name: 'b', position: [1, 0, 0] },
    ]);
    const cell = board.lattice?.cellParts ?? [];
    expect(cell.map((p) => [p.kind, p.from, p.to, p.offset, p.value])).toEqual([
      ['C', 'a', 'b', [0], 10e-9],
      ['C', 'b', 'a', [1], 33e-9],
      ['L', 'a', GROUND, [0], 22e-6],
      ['L', 'b', GROUND, [0], 22e-6],
    ]);
    expect(cell[2].esr).toBeCloseTo((2 * Math.PI * 100e3 * 22e-6) / 50, 12);
  });

  it('spreads sites without positions along the first lattice vector', () => {
    const text = 'lattice:\n  repeats: 2\n  sites: [a, b, c, d]\n  grounds:\n' +
      ['a', 'b', 'c', 'd'].map((s) => `    - { site: ${s}, kind: R, value: 1k }`).join('\n');
    const board = parseBoardText(text, 'inline.yaml');
    expect(board.nodes.map((n) => n.position[0])).toEqual([0, 0.25, 0.5, 0.75, 1, 1.25, 1.5, 1.75]);
    expect(board.name).toBe('inline');
    expect(part(board, 'R_g3_1').nodes).toEqual(['c1', GROUND]);
  });
});

describe('lattice expansion: two and three axes', () => {
  const square = (boundary: string) => `
lattice:
  repeats: [3, 2]
  boundary: ${boundary}
  vectors: [[1, 0], [0, 2]]
  sites: { s: [0, 0] }
  bonds:
    - { id: x, from: s, to: s, offset: [1, 0], kind: C, value: 1n }
    - { id: y, from: s, to: s, offset: [0, 1], kind: C, value: 2n }
  grounds:
    - { id: g, site: s, kind: L, value: 1u }
`;

  it('enumerates cells with the first axis fastest and places them by the lattice vectors', () => {
    const board = parseBoardText(square('[open, open]'), 'inline.yaml');
    expect(board.nodes.map((n) => n.name)).toEqual(['s0_0', 's1_0', 's2_0', 's0_1', 's1_1', 's2_1']);
    expect(board.nodes.map((n) => n.position)).toEqual([
      [0, 0, 0], [1, 0, 0], [2, 0, 0], [0, 2, 0], [1, 2, 0], [2, 2, 0],
    ]);
    // Open 3 x 2: 2*2 bonds along x, 3*1 along y, 6 parts to ground.
    expect(board.parts).toHaveLength(4 + 3 + 6);
    expect(part(board, 'C_x_1_1').nodes).toEqual(['s1_1', 's2_1']);
    expect(part(board, 'C_y_2_0').nodes).toEqual(['s2_0', 's2_1']);
  });

  it('wraps only the periodic axis when boundaries are mixed', () => {
    const board = parseBoardText(square('[periodic, open]'), 'inline.yaml');
    expect(part(board, 'C_x_2_0').nodes).toEqual(['s2_0', 's0_0']);
    expect(board.parts.some((p) => p.ref === 'C_y_0_1')).toBe(false);
    expect(board.parts).toHaveLength(6 + 3 + 6);
  });

  it('expands three axes', () => {
    const text = `
lattice:
  repeats: [2, 2, 2]
  sites: [s]
  bonds:
    - { from: s, to: s, offset: [1, 0, 0], kind: C, value: 1n }
    - { from: s, to: s, offset: [0, 1, 0], kind: C, value: 1n }
    - { from: s, to: s, offset: [0, 0, 1], kind: C, value: 1n }
  grounds:
    - { site: s, kind: L, value: 1u }
`;
    const board = parseBoardText(text, 'inline.yaml');
    expect(board.nodes).toHaveLength(8);
    expect(board.parts).toHaveLength(12 + 8);
    expect(board.nodes[7]).toMatchObject({ name: 's1_1_1', position: [1, 1, 1], cell: [1, 1, 1] });
    expect(part(board, 'C_b3_1_0_0').nodes).toEqual(['s1_0_0', 's1_0_1']);
  });

  it('follows negative offsets', () => {
    const text = chain().replace('{ id: w, from: b, to: a, offset: [1]', '{ id: w, from: a, to: b, offset: [-1]');
    const board = parseBoardText(text, 'inline.yaml');
    expect(part(board, 'C_w_1').nodes).toEqual(['a1', 'b0']);
    expect(board.parts.some((p) => p.ref === 'C_w_0')).toBe(false);
  });
});

describe('lattice changes', () => {
  it('changes values in a range of cells (a domain wall) and keeps the rest', () => {
    const extra = '  changes:\n    - { cell: "2..3", part: v, value: 33n }\n    - { cell: [2], part: w, value: 10n, tolerance: 1% }';
    const board = parseBoardText(chain({ extra }), 'inline.yaml');
    expect([0, 1, 2, 3].map((i) => part(board, `C_v_${i}`).value)).toEqual([10e-9, 10e-9, 33e-9, 33e-9]);
    expect([0, 1, 2].map((i) => part(board, `C_w_${i}`).value)).toEqual([33e-9, 33e-9, 10e-9]);
    expect(part(board, 'C_w_2').tolerance).toBe(0.01);
    expect(part(board, 'C_w_2').esr).toBe(0.02);
    expect(part(board, 'C_v_2').origin).toBe('lattice.bonds[0] cell (2), changed by lattice.changes[0]');
  });

  it('keeps a part\'s Q when its value changes, so the esr follows (esr = ωL/Q)', () => {
    const extra = '  changes:\n    - { ref: L_la_1, value: 47u }';
    const board = parseBoardText(chain({ extra }), 'inline.yaml');
    expect(part(board, 'L_la_1').esr).toBeCloseTo((2 * Math.PI * 100e3 * 47e-6) / 50, 12);
    expect(part(board, 'L_la_0').esr).toBeCloseTo((2 * Math.PI * 100e3 * 22e-6) / 50, 12);
  });

  it('removes parts by ref (a termination too) or by cell and id', () => {
    const extra = '  changes:\n    - { ref: C_w_3_from, remove: true }\n    - { cell: all, part: lb, remove: true }';
    const board = parseBoardText(chain({ terminate: true, extra }), 'inline.yaml');
    expect(board.parts.some((p) => p.ref === 'C_w_3_from')).toBe(false);
    expect(board.parts.some((p) => p.ref.startsWith('L_lb_'))).toBe(false);
    expect(board.parts.some((p) => p.ref === 'C_w_0_to')).toBe(true);
    expect(board.parts).toHaveLength(4 + 3 + 1 + 4);
  });

  it('adds parts in selected cells, to ground or to a site in a neighbouring cell', () => {
    const extra = [
      '  changes:',
      '    - { cell: 0, add: { from: a, to: gnd, kind: C, value: 33n } }',
      '    - { cell: "0..1", add: { id: skip, from: a, to: a, offset: [2], kind: R, value: 1M } }',
    ].join('\n');
    const board = parseBoardText(chain({ extra }), 'inline.yaml');
    expect(part(board, 'C_x1_0')).toMatchObject({ nodes: ['a0', GROUND], value: 33e-9, origin: 'lattice.changes[0].add cell (0)' });
    expect(part(board, 'R_skip_0').nodes).toEqual(['a0', 'a2']);
    expect(part(board, 'R_skip_1').nodes).toEqual(['a1', 'a3']);
  });

  it('lets explicit components use lattice node names', () => {
    const text = `${chain({ names: 'n{index}' })}\ncomponents:\n  - { ref: RP, kind: R, nodes: [n8, probe], value: 50 }\n  - { ref: RT, kind: R, nodes: [probe, GND], value: 1M }`;
    const board = parseBoardText(text, 'inline.yaml');
    expect(board.nodes.map((n) => n.name)).toEqual(['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8', 'probe']);
    expect(board.nodes[8].position).toEqual([8, 0, 0]);
    expect(part(board, 'RT').nodes).toEqual(['probe', GROUND]);
  });

  it('reports changes that select nothing or say nothing', () => {
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: 3, part: w, value: 47n }' }))).toEqual([
      { path: 'lattice.changes[0].cell', message: 'w has no part in cell (3) (its other end is past an open boundary, or it was removed)' },
    ]);
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: 0, part: v }' }))[0].message).toMatch(/does nothing/);
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: 0, part: vv, value: 1n }' }))).toEqual([
      { path: 'lattice.changes[0].part', message: 'no bond or part to ground has the id "vv" (did you mean "v"?); ids are v, w, la, lb' },
    ]);
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: 0, part: v, value: 1uH }' }))).toEqual([
      { path: 'lattice.changes[0].value', message: '"1uH" is in henries, expected farads' },
    ]);
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: "3..1", part: v, remove: true }' }))[0]).toEqual({
      path: 'lattice.changes[0].cell', message: 'range "3..1" runs backwards',
    });
    expect(problemsOf(chain({ extra: '  changes:\n    - { cell: 3, add: { from: b, to: a, offset: [1], kind: C, value: 1n } }' }))[0]).toEqual({
      path: 'lattice.changes[0].add.offset', message: 'from cell (3) this reaches past an open boundary',
    });
  });
});

describe('lattice problems', () => {
  it('reports an unknown placeholder and a wrong number of boundaries', () => {
    expect(problemsOf(chain({ names: 'n{row}' }))).toEqual([
      { path: 'lattice.names', message: 'unknown placeholder {row}; use {site}, {i}, {j}, {k} or {index}' },
    ]);
    expect(problemsOf(chain({ boundary: '[open, open]' }))).toEqual([
      { path: 'lattice.boundary', message: 'has 2 entries, the lattice has 1 axis (or give one word for all)' },
    ]);
  });

  it('reports a bond to ground, a same-site bond without offset and repeated ids', () => {
    const text = chain().replace('{ id: v, from: a, to: b,', '{ id: v, from: a, to: GND,');
    expect(problemsOf(text)[0]).toEqual({ path: 'lattice.bonds[0].to', message: 'bonds join two sites; list parts to ground under lattice.grounds' });
    const same = chain().replace('{ id: v, from: a, to: b,', '{ id: v, from: a, to: a,');
    expect(problemsOf(same)[0].path).toBe('lattice.bonds[0]');
    const twice = chain().replace('id: lb', 'id: la');
    expect(problemsOf(twice)).toEqual([{ path: 'lattice.grounds[1].id', message: 'id "la" is already used by lattice.grounds[0]' }]);
  });

  it('reports more than three axes and a lattice without parts', () => {
    expect(problemsOf('lattice:\n  repeats: [2, 2, 2, 2]\n  sites: [a]\n  grounds: [{ site: a, kind: R, value: 1 }]')).toEqual([
      { path: 'lattice.repeats', message: 'needs one to three numbers (cells along each axis), got 4' },
    ]);
    expect(problemsOf('lattice:\n  repeats: 2\n  sites: [a]')).toEqual([
      { path: 'lattice', message: 'the unit cell has no parts; give bonds and/or grounds' },
    ]);
  });
});
