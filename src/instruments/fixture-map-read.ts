// Reads a fixture map file (JSON or YAML) and checks it against the board it will be used with:
// channel numbers, no channel wired twice, node names that exist, and a HI channel for every node
// that is to be measured. Every problem is collected, one line each.
import { readFileSync, statSync } from 'node:fs';
import { joinPath, ProblemLog } from '../board/errors.js';
import { parseBoardDocument } from '../board/read-source.js';
import { describeInput, readFields, readShape } from '../board/shape-check.js';
import { closestName } from '../board/spelling.js';
import { GROUND, type Board } from '../board/types.js';
import { FixtureMapError } from './fixture-map-error.js';
import { BUSES, FixtureMap, type FixtureMapData, type NodeChannels } from './fixture-map-model.js';
import { FixtureMapShape, NodeChannelsShape } from './fixture-map-schema.js';

export interface FixtureMapCheck {
  /** Nodes that will be measured to ground: each needs `hi`, and ground needs `lo`. */
  measured?: readonly string[];
}

/** Reads and checks the map at `path` for `board`. Throws FixtureMapError listing every problem. */
export function loadFixtureMap(path: string, board: Board, check: FixtureMapCheck = {}): FixtureMap {
  return parseFixtureMapText(readFixtureMapFile(path), path, board, check);
}

/** Same as loadFixtureMap for text in memory; `file` names it in messages and picks JSON or YAML. */
export function parseFixtureMapText(text: string, file: string, board: Board, check: FixtureMapCheck = {}): FixtureMap {
  const log = new ProblemLog(file);
  const data = parseBoardDocument(text, file, log);
  throwIfAny(log);
  const map = readMap(data, board, log);
  if (map && check.measured) checkHiChannels(map, check.measured, log);
  throwIfAny(log);
  return new FixtureMap(map as FixtureMapData, file);
}

/** Checks an existing map (a file's or the default) can measure `nodes` to ground. */
export function checkMeasurable(map: FixtureMap, nodes: readonly string[]): void {
  const log = new ProblemLog(map.source);
  checkHiChannels(map.toData(), nodes, log);
  throwIfAny(log);
}

function readMap(data: unknown, board: Board, log: ProblemLog): FixtureMapData | undefined {
  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    log.add('', `must hold a mapping with nodes and gnd, got ${describeInput(data)}`);
    return undefined;
  }
  const top = readFields(FixtureMapShape, data, '', log);
  if (!top?.nodes) return undefined;
  const boardNodes = board.nodes.map((n) => n.name);
  const known = new Set(boardNodes);
  const map: FixtureMapData = { nodes: {}, gnd: {} };
  const entries = Object.entries(top.nodes);
  if (entries.length === 0) log.add('nodes', 'lists no node; give at least one node with its channels');
  for (const [name, raw] of entries) {
    const path = joinPath('nodes', name);
    const channels = readChannels(raw, path, log);
    if (name.toLowerCase() === GROUND) {
      log.add(path, 'ground goes under gnd at the top level, not under nodes');
    } else if (!known.has(name)) {
      const guess = closestName(name, boardNodes);
      log.add(path, `no node "${name}" on board ${board.name}${guess ? ` (did you mean "${guess}"?)` : ''}`);
    } else if (channels) {
      map.nodes[name] = channels;
    }
  }
  if (top.gnd !== undefined) map.gnd = readChannels(top.gnd, 'gnd', log) ?? {};
  checkUniqueChannels(map, log);
  return map;
}

function readChannels(raw: unknown, path: string, log: ProblemLog): NodeChannels | undefined {
  const channels = readShape(NodeChannelsShape, raw, path, log);
  if (!channels) return undefined;
  if (BUSES.every((bus) => channels[bus] === undefined)) {
    // An entry holding only misspelt fields has been reported already, field by field.
    const hadFields = raw !== null && typeof raw === 'object' && Object.keys(raw).length > 0;
    if (!hadFields) log.add(path, 'lists no channel; give hi, lo and/or sense');
    return undefined;
  }
  const out: NodeChannels = {};
  for (const bus of BUSES) if (channels[bus] !== undefined) out[bus] = channels[bus];
  return out;
}

/** One relay joins one node to one bus; a channel listed twice would short two terminals together. */
function checkUniqueChannels(map: FixtureMapData, log: ProblemLog): void {
  const firstUse = new Map<number, string>();
  const entries: [string, NodeChannels][] = [...Object.entries(map.nodes).map(([n, c]) => [joinPath('nodes', n), c] as [string, NodeChannels]), ['gnd', map.gnd]];
  for (const [path, channels] of entries) {
    for (const bus of BUSES) {
      const channel = channels[bus];
      if (channel === undefined) continue;
      const here = joinPath(path, bus);
      const earlier = firstUse.get(channel);
      if (earlier) log.add(here, `channel ${channel} is already used by ${earlier}`);
      else firstUse.set(channel, here);
    }
  }
}

function checkHiChannels(map: FixtureMapData, nodes: readonly string[], log: ProblemLog): void {
  for (const node of nodes) {
    const entry = map.nodes[node];
    if (entry === undefined) log.add(joinPath('nodes', node), `node ${node} is to be measured but the map does not list it; give it a hi channel`);
    else if (entry.hi === undefined) log.add(joinPath('nodes', node, 'hi'), `missing; node ${node} is to be measured and needs a channel to the HI bus`);
  }
  if (nodes.length > 0 && map.gnd.lo === undefined) {
    log.add('gnd.lo', 'missing; measuring to ground needs a channel joining gnd to the LO bus');
  }
}

function readFixtureMapFile(path: string): string {
  const log = new ProblemLog(path);
  try {
    if (statSync(path).isDirectory()) log.add('', 'is a directory, not a fixture map file');
    else return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const reason = code === 'ENOENT' ? 'no such file' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : String((error as Error).message ?? error);
    log.add('', `cannot read the file: ${reason}`);
  }
  throw new FixtureMapError(log.problems);
}

function throwIfAny(log: ProblemLog): void {
  if (log.count === 0) return;
  // The shared YAML reader speaks of board files; here it is a fixture map.
  const problems = log.problems.map((p) => ({ ...p, message: p.message.replace('a board file holds', 'a fixture map file holds') }));
  throw new FixtureMapError(problems);
}
