// A part while the board is being assembled: the final Part plus what the checks and lattice changes
// still need (where its ref was written, and its losses as given, so a new value keeps the same Q).

import type { Loss } from './part-values.js';
import type { Part } from './types.js';

/** A reference designator and the field path to blame for it. */
export interface RefUse {
  ref: string;
  refPath: string;
}

export interface DraftPart extends Part, RefUse {
  loss?: Loss;
}

export function finishPart(draft: DraftPart): Part {
  const part: Part = { ref: draft.ref, kind: draft.kind, nodes: draft.nodes, value: draft.value, origin: draft.origin };
  if (draft.tolerance !== undefined) part.tolerance = draft.tolerance;
  if (draft.esr !== undefined) part.esr = draft.esr;
  if (draft.rating_v !== undefined) part.rating_v = draft.rating_v;
  return part;
}
