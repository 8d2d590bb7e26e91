// Entry points: a board file (or its text) in, a checked and expanded Board out, or a BoardError
// listing every problem found.

import { basename, extname } from 'node:path';
import { checkGroundPaths, checkUniqueRefs } from './board-checks.js';
import { readComponents } from './components.js';
import { finishPart, type DraftPart } from './draft.js';
import { ProblemLog } from './errors.js';
import { readLattice } from './lattice.js';
import { parseBoardDocument, readBoardFile } from './read-source.js';
import { BoardShape } from './schema.js';
import { describeInput, readFields } from './shape-check.js';
import { GROUND, type Board, type BoardNode } from './types.js';

/** Reads, checks and expands the board file at `path`. Throws BoardError. */
export function loadBoard(path: string): Board {
  return parseBoardText(readBoardFile(path), path);
}

/** Same as loadBoard for text already in memory; `file` names it in messages and picks the format. */
export function parseBoardText(text: string, file = '<inline>'): Board {
  const log = new ProblemLog(file);
  const data = parseBoardDocument(text, file, log);
  log.throwIfAny();
  const board = buildBoard(data, file, log);
  log.throwIfAny();
  return board as Board;
}

function buildBoard(data: unknown, file: string, log: ProblemLog): Board | undefined {
  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    log.add('', `must hold a mapping with name, components and/or lattice, got ${describeInput(data)}`);
    return undefined;
  }
  const top = readFields(BoardShape, data, '', log);
  if (!top) return undefined;
  const rawComponents = top.components ?? [];
  const raw = data as { components?: unknown; lattice?: unknown };
  const listsNothing = raw.components === undefined || (Array.isArray(raw.components) && raw.components.length === 0);
  if (listsNothing && raw.lattice === undefined) {
    log.add('components', 'the board has no parts; give components, a lattice, or both');
    return undefined;
  }

  const before = log.count;
  const lattice = top.lattice === undefined ? undefined : readLattice(top.lattice, log);
  const components = readComponents(rawComponents, log);
  const latticeUsable = top.lattice === undefined || lattice !== undefined;
  const componentsUsable = components.complete && (raw.components === undefined || top.components !== undefined);

  const parts: DraftPart[] = [...(lattice?.parts ?? []), ...components.parts];
  checkUniqueRefs([...(lattice?.parts ?? []), ...components.refs], log);
  const nodes = collectNodes(lattice?.nodes ?? [], components.nodesSeen);
  // The ground check needs the whole board: with a part dropped for a problem it would report islands
  // that are not there.
  if (log.count === before && latticeUsable && componentsUsable) {
    const declaredAt = new Map([...(lattice?.nodeDeclared ?? []), ...components.nodesSeen]);
    checkGroundPaths(nodes.map((n) => n.name), parts, declaredAt, log);
  }
  const board: Board = {
    name: top.name ?? boardNameFromFile(file),
    file,
    nodes,
    parts: parts.map(finishPart),
  };
  if (lattice) board.lattice = lattice.summary;
  return board;
}

/**
 * Lattice nodes first (cell-major), then nodes that only explicit components use, in file order.
 * Those get positions on a line to the right of the lattice, for plotting only.
 */
function collectNodes(latticeNodes: BoardNode[], explicitNodes: Map<string, string>): BoardNode[] {
  const known = new Set(latticeNodes.map((n) => n.name));
  const startX = latticeNodes.length > 0 ? Math.max(...latticeNodes.map((n) => n.position[0])) + 1 : 0;
  const extra = [...explicitNodes.keys()].filter((name) => name !== GROUND && !known.has(name));
  return [...latticeNodes, ...extra.map((name, k): BoardNode => ({ name, position: [startX + k, 0, 0] }))];
}

function boardNameFromFile(file: string): string {
  const base = basename(file, extname(file));
  return base && base !== '<inline>' ? base : 'board';
}
