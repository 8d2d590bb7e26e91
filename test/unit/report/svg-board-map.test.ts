// The board map: drawn from node coordinates with one scale for both axes (a map keeps its shape, common
// practice), y up as on the board, z drawn oblique; one circle per node, one mark per part to ground.
import { describe, expect, it } from 'vitest';
import { GROUND, type Board } from '../../../src/board/types.js';
import { LogColourScale } from '../../../src/report/colour-scale.js';
import { boardMap, layoutBoard, projectPosition, type NodeShade } from '../../../src/report/svg-board-map.js';

/** A 3 × 2 grid, 2 units apart in x and 1 in y, with capacitors along rows and an inductor to ground at each node. */
function grid(names = ['p', 'q', 'r', 's', 't', 'u']): Board {
  const at = (i: number): [number, number, number] => [2 * (i % 3), Math.floor(i / 3), 0];
  const nodes = names.map((name, i) => ({ name, position: at(i) }));
  const parts = [
    { ref: 'C1', kind: 'C' as const, nodes: [names[0], names[1]] as [string, string], value: 10e-9, origin: 't' },
    { ref: 'C2', kind: 'C' as const, nodes: [names[1], names[2]] as [string, string], value: 33e-9, origin: 't' },
    { ref: 'C3', kind: 'C' as const, nodes: [names[3], names[4]] as [string, string], value: 10e-9, origin: 't' },
    ...names.map((n, i) => ({ ref: `L${i}`, kind: 'L' as const, nodes: [n, GROUND] as [string, string], value: 22e-6, origin: 't' })),
  ];
  return { name: 'grid', file: '<test>', nodes, parts };
}

const count = (text: string, pattern: RegExp) => (text.match(pattern) ?? []).length;

describe('projection', () => {
  it('keeps x and y, and draws z at half length along 30° (cabinet view)', () => {
    expect(projectPosition([3, 4, 0])).toEqual([3, 4]);
    const [x, y] = projectPosition([0, 0, 2]);
    expect(x).toBeCloseTo(Math.sqrt(3) / 2, 12);
    expect(y).toBeCloseTo(0.5, 12);
  });
});

describe('layout', () => {
  const board = grid();
  const layout = layoutBoard(board, 400, 400);
  const p = (n: string) => layout.positions.get(n)!;

  it('uses one scale for both axes', () => {
    const dx = p('q')[0] - p('p')[0]; // 2 board units
    const dy = p('p')[1] - p('s')[1]; // 1 board unit, y up on the board is up on the page
    expect(dx).toBeGreaterThan(0);
    expect(dy).toBeGreaterThan(0);
    expect(dx / dy).toBeCloseTo(2, 9);
  });

  it('fits inside the width it is given', () => {
    for (const [x, y] of layout.positions.values()) {
      expect(x).toBeGreaterThan(0);
      expect(x).toBeLessThan(400);
      expect(y).toBeGreaterThan(0);
      expect(y).toBeLessThan(layout.height);
    }
  });

  it('spaces nearest neighbours no wider than 64 px on a small board', () => {
    // The nearest neighbours here are one board unit apart, in y.
    expect(p('p')[1] - p('s')[1]).toBeLessThanOrEqual(64 + 1e-9);
    expect(layout.spacing).toBeCloseTo(p('p')[1] - p('s')[1], 9);
  });
});

describe('layout of a board without coordinates', () => {
  it('draws nodes that all share one point in a row, in board order', () => {
    const flat = grid();
    flat.nodes = flat.nodes.map((n) => ({ ...n, position: [0, 0, 0] }));
    const layout = layoutBoard(flat, 400, 400);
    const xs = flat.nodes.map((n) => layout.positions.get(n.name)![0]);
    const ys = new Set(flat.nodes.map((n) => layout.positions.get(n.name)![1]));
    for (let i = 1; i < xs.length; i++) expect(xs[i] - xs[i - 1]).toBeCloseTo(xs[1] - xs[0], 9);
    expect(xs[1]).toBeGreaterThan(xs[0]);
    expect(ys.size).toBe(1);
  });
});

describe('boardMap', () => {
  const board = grid();
  const scale = new LogColourScale(1, 1000);
  const shades = new Map<string, NodeShade>([
    ['p', { value: 1, flag: 'ok', title: 'p' }],
    ['q', { value: 1000, flag: 'deviation', title: 'q' }],
    ['r', { flag: 'invalid', title: 'r' }],
  ]);
  const svg = boardMap({ board, shades, scale, label: 'map', className: 'm' }).text;

  it('draws one circle per node, lines for parts between nodes and a mark per part to ground', () => {
    expect(count(svg, /<circle class="node/g)).toBe(6);
    expect(count(svg, /<line class="part /g)).toBe(3);
    expect(count(svg, /<g class="ground /g)).toBe(6);
  });

  it('fills measured nodes from the scale and leaves the others open', () => {
    expect(svg).toContain(`data-node="p" cx="${layoutBoard(board, 520, 420).positions.get('p')![0].toFixed(1)}"`);
    expect(svg).toMatch(new RegExp(`data-node="p"[^>]*fill="${scale.colour(1)}"`));
    expect(svg).toMatch(new RegExp(`data-node="q"[^>]*fill="${scale.colour(1000)}"`));
    expect(count(svg, /class="node no-value"/g)).toBe(4);
  });

  it('marks a deviation with a triangle and an invalid reading with a cross', () => {
    expect(count(svg, /<polygon class="flag-deviation"/g)).toBe(1);
    expect(count(svg, /<path class="flag-invalid"/g)).toBe(1);
  });

  it('draws larger capacitors with thicker lines (33 nF against 10 nF)', () => {
    const width = (ref: string) => Number(new RegExp(`stroke-width="([0-9.]+)"><title>${ref} `).exec(svg)![1]);
    expect(width('C2')).toBeGreaterThan(width('C1'));
    expect(width('C1')).toBe(width('C3'));
  });

  it('escapes node names and part refs', () => {
    const hostile = grid(['<b>x</b>', 'q', 'r', 's', 't', 'u']);
    const out = boardMap({ board: hostile, shades: new Map(), scale: undefined, label: 'map', className: 'm' }).text;
    expect(out).not.toContain('<b>');
    expect(out).toContain('&lt;b&gt;x&lt;/b&gt;');
  });
});
