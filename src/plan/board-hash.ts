// The board's fingerprint: sha256 of a canonical JSON (canonical-json.ts) of what decides its readings,
// the node names and every part's reference, kind, ends, value, tolerance, series resistance and rating.
// Parts are sorted by reference and nodes by name, so reordering the file, editing comments or
// descriptions, or moving it to another folder keeps the hash; changing any part changes it. A run uses
// it to refuse a board the plan was not made for.
import { createHash } from 'node:crypto';
import type { Board } from '../board/types.js';
import { canonicalJson } from './canonical-json.js';

export function boardFingerprint(board: Pick<Board, 'nodes' | 'parts'>): unknown {
  const nodes = board.nodes.map((n) => n.name).sort();
  const parts = board.parts
    .map((p) => ({ ref: p.ref, kind: p.kind, nodes: [...p.nodes], value: p.value, tolerance: p.tolerance, esr: p.esr, rating_v: p.rating_v }))
    .sort((a, b) => (a.ref < b.ref ? -1 : a.ref > b.ref ? 1 : 0));
  return { nodes, parts };
}

/** Lower-case hex sha256 of the canonical fingerprint. */
export function boardHash(board: Pick<Board, 'nodes' | 'parts'>): string {
  return createHash('sha256').update(canonicalJson(boardFingerprint(board)), 'utf8').digest('hex');
}
