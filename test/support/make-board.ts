// Builds Board objects in memory for reference tests, without going through a file.
import { GROUND, type Board, type Part, type PartKind } from '../../src/board/types.js';

export type PartSpec = [kind: PartKind, a: string, b: string, value: number, esr?: number];

export function makeBoard(name: string, specs: PartSpec[]): Board {
  const nodes: string[] = [];
  const seen = new Set<string>();
  const parts: Part[] = specs.map(([kind, a, b, value, esr], i) => {
    for (const n of [a, b]) {
      if (n !== GROUND && !seen.has(n)) {
        seen.add(n);
        nodes.push(n);
      }
    }
    return { ref: `${kind}${i + 1}`, kind, nodes: [a, b], value, esr, origin: `test[${i}]` };
  });
  return {
    name,
    file: '<test>',
    nodes: nodes.map((n) => ({ name: n, position: [0, 0, 0] })),
    parts,
  };
}

/** Deterministic pseudo-random numbers (mulberry32) so reference tests are repeatable. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
