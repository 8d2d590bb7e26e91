// The board as it sits on the bench: the designed board with the injected faults applied. The
// simulated analyzer computes its readings from this board, never from the design or a prediction.
//   open  -> the part is removed;
//   short -> the part is replaced by a 1 mΩ resistor between the same nodes (a solder bridge);
//   value -> the part with the new value, keeping its series resistance.
// Removing a part can leave nodes with no path to ground, and a floating node makes the nodal matrix
// singular at every frequency. A real board still leaks to ground through its laminate and flux, so each
// node of such an island gets a 1 TΩ leakage resistor to ground: the circuit stays solvable and the
// node reads as an open circuit (far above the analyzer's range).
import { GROUND, type Board, type Part } from '../src/board/types.js';
import type { PartFault } from './faults.js';

export const SHORT_RESISTANCE = 1e-3;
export const LEAKAGE_RESISTANCE = 1e12;

export function buildBoardAsBuilt(board: Board, faults: readonly PartFault[]): Board {
  const byRef = new Map(faults.map((f) => [f.ref, f]));
  const parts: Part[] = [];
  for (const part of board.parts) {
    const fault = byRef.get(part.ref);
    if (!fault) {
      parts.push(part);
      continue;
    }
    const origin = `${part.origin}, fault ${fault.text}`;
    if (fault.change.kind === 'open') continue;
    if (fault.change.kind === 'short') parts.push({ ref: part.ref, kind: 'R', nodes: part.nodes, value: SHORT_RESISTANCE, origin });
    else parts.push({ ...part, value: fault.change.value, origin });
  }
  const refs = new Set(parts.map((p) => p.ref));
  for (const node of floatingNodes(board.nodes.map((n) => n.name), parts)) {
    let ref = `R_leak_${node}`;
    while (refs.has(ref)) ref = `_${ref}`;
    refs.add(ref);
    parts.push({ ref, kind: 'R', nodes: [node, GROUND], value: LEAKAGE_RESISTANCE, origin: `leakage of floating node ${node} (a part removed by a fault)` });
  }
  return { ...board, name: `${board.name} (as built)`, parts };
}

/** Nodes with no path to ground through any part (union-find over the parts). */
export function floatingNodes(nodes: readonly string[], parts: readonly Part[]): string[] {
  const parent = new Map<string, string>([[GROUND, GROUND], ...nodes.map((n) => [n, n] as [string, string])]);
  const root = (n: string): string => {
    let r = n;
    while (parent.get(r) !== r) r = parent.get(r)!;
    parent.set(n, r);
    return r;
  };
  for (const part of parts) {
    const a = root(part.nodes[0]);
    const b = root(part.nodes[1]);
    if (a !== b) parent.set(a, b);
  }
  const ground = root(GROUND);
  return nodes.filter((n) => root(n) !== ground);
}
