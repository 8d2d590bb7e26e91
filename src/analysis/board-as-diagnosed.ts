// The board as a diagnosis found it: the blamed part (or the pair of parts) changed the way the diagnosis
// fitted it. A fit of global scales or coil losses over a scan with a faulty part would bend every
// parameter to imitate the fault; fitted over the board as diagnosed, it measures the rest of the board.
import type { Board, Part } from '../board/types.js';
import { SHORT_OHMS } from './diagnose-change.js';
import { partFinding } from './diagnose-describe.js';
import type { Diagnosis, PartCandidate } from './diagnose-types.js';

export interface DiagnosedBoard {
  board: Board;
  /** One line per change made, as the diagnosis words it. */
  changes: string[];
}

/** The board with the diagnosis's finding applied; undefined when the verdict blames no part. */
export function boardAsDiagnosed(board: Board, diagnosis: Diagnosis): DiagnosedBoard | undefined {
  let found: PartCandidate[];
  if (diagnosis.verdict === 'single-part' && diagnosis.candidates[0]?.subject === 'part') found = [diagnosis.candidates[0]];
  else if (diagnosis.verdict === 'several-faults' && diagnosis.pair) found = [diagnosis.pair.first, diagnosis.pair.second];
  else return undefined;
  const byRef = new Map(found.map((c) => [c.ref, c]));
  const parts: Part[] = [];
  for (const part of board.parts) {
    const c = byRef.get(part.ref);
    if (!c) parts.push(part);
    else if (c.change.kind === 'value') parts.push({ ...part, value: c.change.value });
    else if (c.change.kind === 'short') parts.push({ ref: part.ref, kind: 'R', nodes: part.nodes, value: SHORT_OHMS, origin: `${part.origin} (shorted, as diagnosed)` });
    // An open part is simply not there.
  }
  return { board: { ...board, parts }, changes: found.map((c) => partFinding(c)) };
}
