// Reads and checks the `lattice` section up to (not including) expansion: axes, repeats, boundaries,
// lattice vectors, sites, and the unit cell's bonds and parts to ground.

import { joinPath, type ProblemLog } from './errors.js';
import { axes, cellCount, type Boundary } from './lattice-cells.js';
import { defaultNameTemplate, isGroundName, templateProblems } from './node-names.js';
import { readPartValues, type Loss } from './part-values.js';
import { BondShape, GroundShape, LatticeShape } from './schema.js';
import { readFields, readShape } from './shape-check.js';
import { closestName } from './spelling.js';
import { GROUND, type PartKind } from './types.js';

export type Vector3 = [number, number, number];

/** The most nodes a lattice may expand to: a hundred times the largest boards we benchmark. */
export const MAX_LATTICE_NODES = 1_000_000;

export interface SiteSpec {
  name: string;
  position: Vector3;
  path: string;
}

/** One part of the unit cell: a bond between sites, or a part from a site to ground (to = GROUND). */
export interface CellPartSpec {
  id: string;
  kind: PartKind;
  from: string;
  to: string;
  offset: number[];
  value: number;
  tolerance?: number;
  loss?: Loss;
  /** Voltage rating, volts. */
  rating?: number;
  path: string;
}

export interface LatticeSpec {
  dimensions: number;
  repeats: number[];
  boundary: Boundary[];
  vectors: Vector3[];
  sites: SiteSpec[];
  bonds: CellPartSpec[];
  grounds: CellPartSpec[];
  nameTemplate: string;
  terminate: boolean;
  /** Part ids in use (bonds and grounds), with where each was given; added parts must not reuse one. */
  ids: Map<string, string>;
  /** The kind of the parts behind each id, for changes that name a part by id. */
  kinds: Map<string, PartKind>;
  /** Raw change entries, read by lattice-changes.ts once the lattice is expanded. */
  changes: unknown[];
}

/** The checked lattice description, or undefined if anything in it is wrong (problems logged). */
export function readLatticeSpec(raw: unknown, log: ProblemLog): LatticeSpec | undefined {
  const before = log.count;
  // Fields are read one by one when the section as a whole has problems, so that a wrong `vectors`
  // does not hide a wrong bond. Checks that need a missing field (site names, axes) are skipped.
  const shape = readFields(LatticeShape, raw, 'lattice', log);
  if (!shape) return undefined;

  const repeats = shape.repeats === undefined ? undefined : readRepeats(shape.repeats, log);
  const dimensions = repeats?.length ?? 0;
  const boundary = repeats ? readBoundary(shape.boundary, dimensions, log) : undefined;
  const vectors = repeats ? readVectors(shape.vectors, dimensions, log) : undefined;
  const sites = shape.sites === undefined ? undefined : readSites(shape.sites, vectors?.[0] ?? [1, 0, 0], log);
  const nodeCount = repeats && sites ? cellCount(repeats) * sites.length : 0;
  if (nodeCount > MAX_LATTICE_NODES) {
    // Checked before expansion: a mistyped repeat count (1000000 for 100) would otherwise exhaust memory.
    const shown = Number.isSafeInteger(nodeCount) ? String(nodeCount) : nodeCount.toPrecision(3);
    log.add('lattice.repeats', `${repeats!.join(' x ')} cells of ${sites!.length} ${sites!.length === 1 ? 'site' : 'sites'} make ${shown} nodes, more than the ${MAX_LATTICE_NODES} a board may have`);
  }
  const nameTemplate = shape.names ?? defaultNameTemplate(Math.max(dimensions, 1));
  if (shape.names !== undefined && repeats) {
    for (const problem of templateProblems(shape.names, dimensions)) log.add('lattice.names', problem);
  }

  const siteNames = sites?.map((s) => s.name);
  const ids = new Map<string, string>();
  const bonds = (shape.bonds ?? []).flatMap((entry, index) => {
    const path = `lattice.bonds[${index}]`;
    const bond = readBond(entry, path, siteNames, dimensions, log);
    if (bond) bond.id = claimId(bond.id || `b${index + 1}`, path, ids, log);
    return bond ? [bond] : [];
  });
  const grounds = (shape.grounds ?? []).flatMap((entry, index) => {
    const path = `lattice.grounds[${index}]`;
    const ground = readGround(entry, path, siteNames, dimensions, log);
    if (ground) ground.id = claimId(ground.id || `g${index + 1}`, path, ids, log);
    return ground ? [ground] : [];
  });
  const rawSection = raw as { bonds?: unknown; grounds?: unknown };
  const listed = (list: unknown) => (Array.isArray(list) ? list.length : list === undefined ? 0 : 1);
  if (listed(rawSection.bonds) + listed(rawSection.grounds) === 0) {
    log.add('lattice', 'the unit cell has no parts; give bonds and/or grounds');
  }
  if (log.count !== before || !repeats || !boundary || !vectors || !sites) return undefined;
  return {
    dimensions,
    repeats,
    boundary,
    vectors,
    sites,
    bonds,
    grounds,
    nameTemplate,
    terminate: shape.terminate ?? false,
    ids,
    kinds: new Map([...bonds, ...grounds].map((p) => [p.id, p.kind])),
    changes: shape.changes ?? [],
  };
}

function readRepeats(raw: number | number[], log: ProblemLog): number[] | undefined {
  const list = Array.isArray(raw) ? raw : [raw];
  if (list.length < 1 || list.length > 3) {
    log.add('lattice.repeats', `needs one to three numbers (cells along each axis), got ${list.length}`);
    return undefined;
  }
  let ok = true;
  list.forEach((n, axis) => {
    if (!Number.isInteger(n) || n < 1) {
      log.add(Array.isArray(raw) ? `lattice.repeats[${axis}]` : 'lattice.repeats', `must be a whole number of at least 1, got ${n}`);
      ok = false;
    }
  });
  return ok ? list : undefined;
}

function readBoundary(raw: Boundary | Boundary[] | undefined, dimensions: number, log: ProblemLog): Boundary[] | undefined {
  if (raw === undefined) return new Array(dimensions).fill('open');
  if (!Array.isArray(raw)) return new Array(dimensions).fill(raw);
  if (raw.length !== dimensions) {
    log.add('lattice.boundary', `has ${raw.length} entries, the lattice has ${axes(dimensions)} (or give one word for all)`);
    return undefined;
  }
  return raw;
}

function readVectors(raw: number[][] | undefined, dimensions: number, log: ProblemLog): Vector3[] | undefined {
  if (raw === undefined) return Array.from({ length: dimensions }, (_, axis) => unitVector(axis));
  if (raw.length !== dimensions) {
    log.add('lattice.vectors', `has ${raw.length} vectors, the lattice has ${axes(dimensions)}`);
    return undefined;
  }
  const vectors = raw.map(pad3);
  vectors.forEach((v, axis) => {
    if (v.every((x) => x === 0)) log.add(`lattice.vectors[${axis}]`, 'is the zero vector; cells along this axis would sit on top of each other');
  });
  return vectors;
}

function readSites(raw: string[] | Record<string, number[] | null>, firstVector: Vector3, log: ProblemLog): SiteSpec[] {
  const listed = Array.isArray(raw);
  const entries: [string, number[] | null][] = listed ? raw.map((name) => [name, null]) : Object.entries(raw);
  if (entries.length === 0) log.add('lattice.sites', 'needs at least one site');
  const seen = new Set<string>();
  const sites: SiteSpec[] = [];
  entries.forEach(([name, at], k) => {
    const path = listed ? `lattice.sites[${k}]` : joinPath('lattice.sites', name);
    if (isGroundName(name)) return log.add(path, `${JSON.stringify(name)} is the ground node and cannot be a site`);
    if (seen.has(name)) return log.add(path, `site ${JSON.stringify(name)} is listed twice`);
    seen.add(name);
    // Without a position, sites are spread evenly along the first lattice vector.
    const position = at ? pad3(at) : (firstVector.map((x) => (x * k) / entries.length) as Vector3);
    sites.push({ name, position, path });
  });
  return sites;
}

function readBond(entry: unknown, path: string, sites: string[] | undefined, dimensions: number, log: ProblemLog): CellPartSpec | undefined {
  const shape = readShape(BondShape, entry, path, log);
  if (!shape) return undefined;
  const before = log.count;
  checkSite(shape.from, joinPath(path, 'from'), sites, log);
  if (isGroundName(shape.to)) log.add(joinPath(path, 'to'), 'bonds join two sites; list parts to ground under lattice.grounds');
  else checkSite(shape.to, joinPath(path, 'to'), sites, log);
  const offset = shape.offset ?? new Array(dimensions).fill(0);
  if (dimensions > 0 && offset.length !== dimensions) {
    log.add(joinPath(path, 'offset'), `has ${offset.length} numbers, the lattice has ${axes(dimensions)}`);
  } else if (shape.from === shape.to && offset.every((o) => o === 0)) {
    log.add(path, `joins site ${JSON.stringify(shape.from)} to itself in the same cell; give an offset to a neighbouring cell`);
  }
  const values = readPartValues(shape, shape.kind, path, log);
  if (log.count !== before || !values || values.value === undefined) return undefined;
  return { id: shape.id ?? '', kind: shape.kind, from: shape.from, to: shape.to, offset, value: values.value, tolerance: values.tolerance, loss: values.loss, rating: values.rating, path };
}

function readGround(entry: unknown, path: string, sites: string[] | undefined, dimensions: number, log: ProblemLog): CellPartSpec | undefined {
  const shape = readShape(GroundShape, entry, path, log);
  if (!shape) return undefined;
  const before = log.count;
  checkSite(shape.site, joinPath(path, 'site'), sites, log);
  const values = readPartValues(shape, shape.kind, path, log);
  if (log.count !== before || !values || values.value === undefined) return undefined;
  const offset = new Array(dimensions).fill(0);
  return { id: shape.id ?? '', kind: shape.kind, from: shape.site, to: GROUND, offset, value: values.value, tolerance: values.tolerance, loss: values.loss, rating: values.rating, path };
}

/** Whether `name` is a site; without a usable site list (already reported) every name passes. */
export function checkSite(name: string, path: string, sites: readonly string[] | undefined, log: ProblemLog): boolean {
  if (!sites || sites.includes(name)) return true;
  const guess = closestName(name, sites);
  log.add(path, `unknown site ${JSON.stringify(name)}${guess ? ` (did you mean "${guess}"?)` : ''}; sites are ${sites.join(', ') || 'none'}`);
  return false;
}

/** Part ids must be unique across bonds, grounds and added parts, as they become part of the refs. */
export function claimId(id: string, path: string, ids: Map<string, string>, log: ProblemLog): string {
  const earlier = ids.get(id);
  if (earlier) log.add(joinPath(path, 'id'), `id ${JSON.stringify(id)} is already used by ${earlier}`);
  else ids.set(id, path);
  return id;
}

function pad3(values: readonly number[]): Vector3 {
  return [values[0] ?? 0, values[1] ?? 0, values[2] ?? 0];
}

function unitVector(axis: number): Vector3 {
  const v: Vector3 = [0, 0, 0];
  v[axis] = 1;
  return v;
}
