// Applies `lattice.changes` to an expanded lattice, in the order written. Each change does one thing:
//   new values   for one part (ref: C_b2_5) or for a bond/ground id in selected cells (cell + part)
//   remove: true the same targets are taken off the board
//   add: {...}   a new part in each selected cell, from a site to a site (with offset) or to gnd
// A new value keeps the part's losses as written: a part given q keeps that Q, so its esr follows.

import type { DraftPart } from './draft.js';
import { joinPath, type ProblemLog } from './errors.js';
import { cellLabel, selectCells, shiftCell, axes } from './lattice-cells.js';
import { latticeRef, type LatticeExpansion } from './lattice-expand.js';
import { checkSite, claimId, type LatticeSpec } from './lattice-spec.js';
import { isGroundName } from './node-names.js';
import { readPartValues, seriesResistance } from './part-values.js';
import { ChangeShape, type RawChange } from './schema.js';
import { readShape } from './shape-check.js';
import { closestName } from './spelling.js';
import { GROUND } from './types.js';

/** Applies every change to `lattice.parts` in place; returns false if any change was wrong. */
export function applyLatticeChanges(spec: LatticeSpec, lattice: LatticeExpansion, log: ProblemLog): boolean {
  const before = log.count;
  spec.changes.forEach((entry, index) => {
    const path = `lattice.changes[${index}]`;
    const change = readShape(ChangeShape, entry, path, log);
    if (change) applyChange(change, index, path, spec, lattice, log);
  });
  return log.count === before;
}

function applyChange(change: RawChange, index: number, path: string, spec: LatticeSpec, lattice: LatticeExpansion, log: ProblemLog): void {
  const setsValues = (['value', 'tolerance', 'esr', 'q', 'q_at', 'rating'] as const).some((f) => change[f] !== undefined);
  const actions = [setsValues, change.remove === true, change.add !== undefined].filter(Boolean).length;
  if (actions === 0) return log.add(path, 'does nothing; give new values (value, tolerance, esr, q), remove: true, or add');
  if (actions > 1) return log.add(path, 'does more than one thing; give only one of new values, remove: true or add');
  if (change.add) return addParts(change, index, path, spec, lattice, log);

  const targets = findTargets(change, path, spec, lattice, log);
  if (!targets) return;
  if (change.remove) {
    const gone = new Set(targets);
    const kept = lattice.parts.filter((part) => !gone.has(part));
    lattice.parts.length = 0;
    for (const part of kept) lattice.parts.push(part);
    return;
  }
  const values = readPartValues(change, targets[0].kind, path, log);
  if (!values) return;
  for (const part of targets) {
    if (values.value !== undefined) part.value = values.value;
    if (values.tolerance !== undefined) part.tolerance = values.tolerance;
    if (values.rating !== undefined) part.rating_v = values.rating;
    if (values.loss) part.loss = values.loss;
    part.esr = seriesResistance(part.kind, part.value, part.loss);
    if (part.esr === undefined) delete part.esr;
    part.origin += `, changed by ${path}`;
  }
}

function findTargets(change: RawChange, path: string, spec: LatticeSpec, lattice: LatticeExpansion, log: ProblemLog): DraftPart[] | undefined {
  if (change.ref !== undefined) {
    if (change.cell !== undefined || change.part !== undefined) {
      log.add(path, 'give either ref, or cell and part, to say which part; not both');
      return undefined;
    }
    const part = lattice.parts.find((p) => p.ref === change.ref);
    if (part) return [part];
    const guess = closestName(change.ref, lattice.parts.map((p) => p.ref));
    log.add(joinPath(path, 'ref'), `no lattice part is called ${JSON.stringify(change.ref)}${guess ? ` (did you mean "${guess}"?)` : ''}`);
    return undefined;
  }
  if (change.cell === undefined && change.part === undefined) {
    log.add(path, 'says no part: give ref, or cell and part');
    return undefined;
  }
  if (change.cell === undefined) {
    log.add(joinPath(path, 'cell'), 'missing: part needs a cell to say where');
    return undefined;
  }
  if (change.part === undefined) {
    log.add(joinPath(path, 'part'), 'missing: cell needs a part id (such as b1) to say which part');
    return undefined;
  }
  const kind = spec.kinds.get(change.part);
  if (!kind) {
    const ids = [...spec.kinds.keys()];
    const guess = closestName(change.part, ids);
    log.add(joinPath(path, 'part'), `no bond or part to ground has the id ${JSON.stringify(change.part)}${guess ? ` (did you mean "${guess}"?)` : ''}; ids are ${ids.join(', ')}`);
    return undefined;
  }
  const selection = readCells(change.cell, path, spec, log);
  if (!selection) return undefined;
  const byRef = new Map(lattice.parts.map((p) => [p.ref, p]));
  const id = change.part;
  const targets = selection.flatMap((cell) => byRef.get(latticeRef(kind, id, cell)) ?? []);
  if (targets.length === 0) {
    const where = selection.length === 1 ? `cell ${cellLabel(selection[0])}` : 'the selected cells';
    log.add(joinPath(path, 'cell'), `${id} has no part in ${where} (its other end is past an open boundary, or it was removed)`);
    return undefined;
  }
  return targets;
}

function addParts(change: RawChange, index: number, path: string, spec: LatticeSpec, lattice: LatticeExpansion, log: ProblemLog): void {
  const add = change.add as NonNullable<RawChange['add']>;
  const addPath = joinPath(path, 'add');
  if (change.ref !== undefined || change.part !== undefined) return log.add(path, 'add makes a new part; leave out ref and part');
  if (change.cell === undefined) return log.add(joinPath(path, 'cell'), 'missing: say in which cells to add the part');
  const before = log.count;
  const sites = spec.sites.map((s) => s.name);
  checkSite(add.from, joinPath(addPath, 'from'), sites, log);
  const toGround = isGroundName(add.to);
  if (!toGround) checkSite(add.to, joinPath(addPath, 'to'), sites, log);
  const offset = add.offset ?? new Array(spec.dimensions).fill(0);
  if (offset.length !== spec.dimensions) log.add(joinPath(addPath, 'offset'), `has ${offset.length} numbers, the lattice has ${axes(spec.dimensions)}`);
  const id = claimId(add.id ?? `x${index + 1}`, addPath, spec.ids, log);
  if (spec.ids.get(id) === addPath) spec.kinds.set(id, add.kind);
  const values = readPartValues(add, add.kind, addPath, log);
  const selection = readCells(change.cell, path, spec, log);
  if (log.count !== before || !values || values.value === undefined || !selection) return;

  for (const cell of selection) {
    const from = lattice.nodeName(cell, add.from);
    let to = GROUND;
    if (!toGround) {
      const target = shiftCell(cell, offset, spec.repeats, spec.boundary);
      if (!target) return log.add(joinPath(addPath, 'offset'), `from cell ${cellLabel(cell)} this reaches past an open boundary`);
      to = lattice.nodeName(target, add.to);
      if (to === from) return log.add(addPath, `joins node ${JSON.stringify(from)} to itself in cell ${cellLabel(cell)}`);
    }
    const origin = `${addPath} cell ${cellLabel(cell)}`;
    const part: DraftPart = { ref: latticeRef(add.kind, id, cell), kind: add.kind, nodes: [from, to], value: values.value, origin, refPath: origin };
    if (values.tolerance !== undefined) part.tolerance = values.tolerance;
    if (values.rating !== undefined) part.rating_v = values.rating;
    if (values.loss) {
      part.loss = values.loss;
      part.esr = seriesResistance(add.kind, values.value, values.loss);
    }
    lattice.parts.push(part);
  }
}

function readCells(input: NonNullable<RawChange['cell']>, path: string, spec: LatticeSpec, log: ProblemLog): number[][] | undefined {
  const read = selectCells(input, spec.repeats);
  if ('cells' in read) return read.cells;
  log.add(read.entry >= 0 ? joinPath(path, 'cell', read.entry) : joinPath(path, 'cell'), read.problem);
  return undefined;
}
