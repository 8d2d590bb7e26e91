// Checks that need the whole board: unique reference designators, and a path to ground from every node.

import type { DraftPart, RefUse } from './draft.js';
import type { ProblemLog } from './errors.js';
import { GROUND } from './types.js';

/** Every ref once; a repeat is reported where it appears again, naming where it was first. */
export function checkUniqueRefs(parts: readonly RefUse[], log: ProblemLog): void {
  const first = new Map<string, string>();
  for (const part of parts) {
    const earlier = first.get(part.ref);
    if (earlier === undefined) first.set(part.ref, part.refPath);
    else log.add(part.refPath, `duplicate reference designator ${JSON.stringify(part.ref)} (also at ${earlier})`);
  }
}

const SHOWN_NAMES = 8;

/**
 * `declaredAt` gives for each node the path to blame. A group of nodes joined to each other but to ground through no part makes the nodal admittance
 * matrix singular at every frequency (its potential is undefined), so each such island is reported
 * with its node names (the first few of a big island).
 */
export function checkGroundPaths(nodeNames: readonly string[], parts: readonly DraftPart[], declaredAt: Map<string, string>, log: ProblemLog): void {
  const parent = new Map<string, string>([[GROUND, GROUND], ...nodeNames.map((n) => [n, n] as [string, string])]);
  const root = (node: string): string => {
    let r = node;
    while (parent.get(r) !== r) r = parent.get(r) as string;
    for (let n = node; n !== r; ) {
      const next = parent.get(n) as string;
      parent.set(n, r);
      n = next;
    }
    return r;
  };
  for (const part of parts) {
    const [a, b] = part.nodes.map(root);
    if (a !== b) parent.set(a === root(GROUND) ? b : a, a === root(GROUND) ? a : b);
  }
  const islands = new Map<string, string[]>();
  const ground = root(GROUND);
  for (const node of nodeNames) {
    const r = root(node);
    if (r === ground) continue;
    const island = islands.get(r) ?? [];
    island.push(node);
    islands.set(r, island);
  }
  for (const island of islands.values()) {
    const where = declaredAt.get(island[0]) ?? '';
    const shown = island.slice(0, SHOWN_NAMES).join(', ');
    const more = island.length > SHOWN_NAMES ? ` and ${island.length - SHOWN_NAMES} more` : '';
    const what = island.length === 1 ? `node ${shown} has` : `${island.length} nodes (${shown}${more}) have`;
    log.add(where, `${what} no path to gnd through any part, so the admittance matrix is singular; add a part to gnd`);
  }
}
