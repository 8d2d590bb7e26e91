// Part faults to inject into the simulated bench, written REF=open, REF=short or REF=VALUE
// (C_intra_3=33n, L_tanka_5=2.2uH): a part missing, a solder bridge across it, or a wrong value fitted.
// Values are read in the part's own unit, with SI prefixes and units like the board file.
import { closestName } from '../src/board/spelling.js';
import type { Board, Part } from '../src/board/types.js';
import { UNIT_OF_KIND } from '../src/board/part-values.js';
import { parseQuantity, QuantityError } from '../src/units/quantity.js';

export type FaultChange = { kind: 'open' } | { kind: 'short' } | { kind: 'value'; value: number };

export interface PartFault {
  ref: string;
  change: FaultChange;
  /** The fault as it was written, for messages and logs. */
  text: string;
}

/** A fault that cannot be read or does not fit the board; one line naming the fault text. Exit code 2. */
export class FaultError extends Error {
  readonly exitCode = 2;
  constructor(
    readonly text: string,
    problem: string,
  ) {
    super(`fault ${JSON.stringify(text)}: ${problem}`);
    this.name = 'FaultError';
  }
}

const FORM = 'expected REF=open, REF=short or REF=VALUE (e.g. C_intra_3=33n)';
const NEAR_NAMES = 3;

/** Reads one fault against `board`. Throws FaultError. */
export function parseFault(text: string, board: Pick<Board, 'name' | 'parts'>): PartFault {
  const at = text.indexOf('=');
  if (at < 0) throw new FaultError(text, `has no "="; ${FORM}`);
  const ref = text.slice(0, at).trim();
  const what = text.slice(at + 1).trim();
  if (ref === '') throw new FaultError(text, `names no part before "="; ${FORM}`);
  if (what === '') throw new FaultError(text, `says nothing after "="; ${FORM}`);
  const part = board.parts.find((p) => p.ref === ref);
  if (!part) throw new FaultError(text, `no part ${JSON.stringify(ref)} on board ${board.name}${nearNamesHint(ref, board.parts)}`);
  const lower = what.toLowerCase();
  if (lower === 'open') return { ref, change: { kind: 'open' }, text };
  if (lower === 'short') return { ref, change: { kind: 'short' }, text };
  try {
    return { ref, change: { kind: 'value', value: parseQuantity(what, UNIT_OF_KIND[part.kind]) }, text };
  } catch (error) {
    if (!(error instanceof QuantityError)) throw error;
    throw new FaultError(text, `${error.message} (${ref} is ${kindWord(part)}; or write open or short)`);
  }
}

/** Reads several faults; a part may carry one fault only. Throws FaultError at the first problem. */
export function parseFaults(texts: readonly string[], board: Pick<Board, 'name' | 'parts'>): PartFault[] {
  const seen = new Map<string, string>();
  return texts.map((text) => {
    const fault = parseFault(text, board);
    const earlier = seen.get(fault.ref);
    if (earlier !== undefined) throw new FaultError(text, `${fault.ref} already has a fault (${earlier}); give one fault per part`);
    seen.set(fault.ref, text);
    return fault;
  });
}

function nearNamesHint(ref: string, parts: readonly Part[]): string {
  const refs = parts.map((p) => p.ref);
  const near: string[] = [];
  let left = refs;
  // closestName gives the single best typo match; asking again without it gives the runner-up.
  for (let i = 0; i < NEAR_NAMES; i++) {
    const best = closestName(ref, left);
    if (best === undefined) break;
    near.push(best);
    left = left.filter((r) => r !== best);
  }
  if (near.length === 0) near.push(...refs.filter((r) => r[0]?.toLowerCase() === ref[0]?.toLowerCase()).slice(0, NEAR_NAMES));
  if (near.length === 0) near.push(...refs.slice(0, NEAR_NAMES));
  return near.length > 0 ? `; near names: ${near.join(', ')}` : '';
}

function kindWord(part: Part): string {
  return part.kind === 'C' ? 'a capacitor' : part.kind === 'L' ? 'an inductor' : 'a resistor';
}
