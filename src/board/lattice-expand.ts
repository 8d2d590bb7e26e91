// Expands a checked lattice description into nodes and parts, cell by cell.
//
// Reference designators (stable: they depend only on kind, part id and cell):
//   bond or part to ground   <kind>_<id>_<cell>        C_b1_3, L_g1_2_0   (cell of the bond's `from` site)
//   termination              <kind>_<id>_<cell>_from   at a `from` node whose partner is past an open edge
//                            <kind>_<id>_<cell>_to     at a `to` node whose partner is past an open edge
// where <cell> is the cell index per axis joined by "_", counted from 0.

import type { DraftPart } from './draft.js';
import { joinPath, type ProblemLog } from './errors.js';
import { cellAt, cellCount, cellIndex, cellLabel, shiftCell } from './lattice-cells.js';
import type { CellPartSpec, LatticeSpec } from './lattice-spec.js';
import { fillTemplate, isGroundName } from './node-names.js';
import { seriesResistance } from './part-values.js';
import { GROUND, type BoardNode } from './types.js';

export interface LatticeExpansion {
  nodes: BoardNode[];
  parts: DraftPart[];
  nodeName(cell: readonly number[], site: string): string;
  /** For each node, the path to point at when it has no path to ground. */
  nodeDeclared: Map<string, string>;
}

export function latticeRef(kind: string, id: string, cell: readonly number[], end?: 'from' | 'to'): string {
  return [kind, id, ...cell, ...(end ? [end] : [])].join('_');
}

export function expandLattice(spec: LatticeSpec, log: ProblemLog): LatticeExpansion | undefined {
  const siteIndex = new Map(spec.sites.map((site, k) => [site.name, k]));
  const names = nameNodes(spec, log);
  if (!names) return undefined;
  const nodeName = (cell: readonly number[], site: string) =>
    names[cellIndex(cell, spec.repeats) * spec.sites.length + (siteIndex.get(site) as number)];

  const nodes: BoardNode[] = [];
  const nodeDeclared = new Map<string, string>();
  const cells = Array.from({ length: cellCount(spec.repeats) }, (_, index) => cellAt(index, spec.repeats));
  for (const cell of cells) {
    for (const site of spec.sites) {
      const position = site.position.map((x, d) =>
        cell.reduce((sum, c, axis) => sum + c * spec.vectors[axis][d], x),
      ) as [number, number, number];
      const name = nodeName(cell, site.name);
      nodes.push({ name, position, cell: [...cell], site: site.name });
      nodeDeclared.set(name, 'lattice.grounds');
    }
  }

  const parts: DraftPart[] = [];
  const wrapsOntoItself = new Set<CellPartSpec>();
  const place = (source: CellPartSpec, ref: string, ends: [string, string], origin: string) => {
    const part: DraftPart = { ref, kind: source.kind, nodes: ends, value: source.value, origin, refPath: origin };
    if (source.tolerance !== undefined) part.tolerance = source.tolerance;
    if (source.rating !== undefined) part.rating_v = source.rating;
    if (source.loss) {
      part.loss = source.loss;
      part.esr = seriesResistance(source.kind, source.value, source.loss);
    }
    parts.push(part);
  };
  for (const cell of cells) {
    for (const bond of spec.bonds) {
      const from = nodeName(cell, bond.from);
      const target = shiftCell(cell, bond.offset, spec.repeats, spec.boundary);
      if (target) {
        const to = nodeName(target, bond.to);
        if (to === from) wrapsOntoItself.add(bond);
        else place(bond, latticeRef(bond.kind, bond.id, cell), [from, to], `${bond.path} cell ${cellLabel(cell)}`);
      } else if (spec.terminate) {
        place(bond, latticeRef(bond.kind, bond.id, cell, 'from'), [from, GROUND], terminationOrigin(bond, cell));
      }
      const negated = bond.offset.map((o) => -o);
      if (spec.terminate && !shiftCell(cell, negated, spec.repeats, spec.boundary)) {
        place(bond, latticeRef(bond.kind, bond.id, cell, 'to'), [nodeName(cell, bond.to), GROUND], terminationOrigin(bond, cell));
      }
    }
    for (const ground of spec.grounds) {
      place(ground, latticeRef(ground.kind, ground.id, cell), [nodeName(cell, ground.from), GROUND], `${ground.path} cell ${cellLabel(cell)}`);
    }
  }
  for (const bond of wrapsOntoItself) {
    log.add(joinPath(bond.path, 'offset'), 'wraps round a periodic axis back onto the node it starts from; that axis needs more repeats');
  }
  return wrapsOntoItself.size > 0 ? undefined : { nodes, parts, nodeName, nodeDeclared };
}

function terminationOrigin(bond: CellPartSpec, cell: readonly number[]): string {
  return `lattice.terminate for ${bond.path} at cell ${cellLabel(cell)}`;
}

/** Node names in node order (cell-major, sites in file order); undefined if the template clashes. */
function nameNodes(spec: LatticeSpec, log: ProblemLog): string[] | undefined {
  const names: string[] = [];
  const firstUse = new Map<string, string>();
  const total = cellCount(spec.repeats);
  for (let index = 0; index < total; index++) {
    const cell = cellAt(index, spec.repeats);
    for (const site of spec.sites) {
      const name = fillTemplate(spec.nameTemplate, site.name, cell, names.length + 1);
      const where = `site ${site.name} of cell ${cellLabel(cell)}`;
      if (isGroundName(name)) {
        log.add('lattice.names', `gives ${where} the name ${JSON.stringify(name)}, which means ground`);
        return undefined;
      }
      const earlier = firstUse.get(name);
      if (earlier) {
        log.add('lattice.names', `gives the name ${JSON.stringify(name)} to both ${earlier} and ${where}; use {site}, {i}, {j}, {k} or {index} so that names differ`);
        return undefined;
      }
      firstUse.set(name, where);
      names.push(name);
    }
  }
  return names;
}
