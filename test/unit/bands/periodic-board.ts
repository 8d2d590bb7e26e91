// Expands a lattice summary by hand into a finite Board with periodic wrap on every axis, so the Bloch
// bands can be checked against the modes of a real finite board (without the board file reader).
import { GROUND, type Board, type LatticeSummary, type Part } from '../../../src/board/types.js';

export function periodicBoard(name: string, lattice: LatticeSummary): Board {
  const { repeats, vectors } = lattice;
  const cells: number[][] = [];
  const total = repeats.reduce((a, b) => a * b, 1);
  for (let index = 0; index < total; index++) {
    // first axis fastest
    const cell: number[] = [];
    let rest = index;
    for (const r of repeats) {
      cell.push(rest % r);
      rest = Math.floor(rest / r);
    }
    cells.push(cell);
  }
  const node = (site: string, cell: number[]) => `${site}@${cell.join('.')}`;
  const wrap = (cell: number[], offset: number[]) => cell.map((c, axis) => (((c + (offset[axis] ?? 0)) % repeats[axis]) + repeats[axis]) % repeats[axis]);

  const nodes = cells.flatMap((cell) =>
    lattice.sites.map((site) => ({
      name: node(site.name, cell),
      position: site.position.map((x, d) => cell.reduce((s, c, axis) => s + c * vectors[axis][d], x)) as [number, number, number],
      cell,
      site: site.name,
    })),
  );
  const parts: Part[] = [];
  for (const cell of cells) {
    lattice.cellParts.forEach((p, k) => {
      const from = node(p.from, cell);
      const to = p.to === GROUND ? GROUND : node(p.to, wrap(cell, p.offset));
      if (from === to) throw new Error(`part ${k} wraps onto itself: the board needs more repeats`);
      parts.push({ ref: `${p.kind}${parts.length + 1}`, kind: p.kind, nodes: [from, to], value: p.value, origin: `cellParts[${k}] cell ${cell.join(',')}` });
    });
  }
  return { name, file: '<test>', nodes, parts, lattice: { ...lattice, boundary: repeats.map(() => 'periodic' as const) } };
}
