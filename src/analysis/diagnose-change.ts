// The single-part changes a diagnosis tries, as the part that replaces the placed one and as the change
// of admittance that brings. They mirror the usual assembly faults: a wrong value (including the wrong
// decade), a part missing or not soldered (open), a solder bridge across it (short).
import type { Part } from '../board/types.js';
import { partAdmittance, type Complex } from '../circuit/admittance.js';

export type PartChange = { kind: 'scale'; scale: number } | { kind: 'open' } | { kind: 'short' };

/** Resistance of a solder bridge (common practice: milliohms). */
export const SHORT_OHMS = 1e-3;

/** The part as it would be after the change; an open is a part of zero admittance. */
export function changedPart(part: Part, change: PartChange): Part {
  switch (change.kind) {
    case 'scale':
      return { ...part, value: part.value * change.scale };
    case 'short':
      return { ref: part.ref, kind: 'R', nodes: part.nodes, value: SHORT_OHMS, origin: part.origin };
    case 'open':
      // 1/Infinity is exactly 0 in partAdmittance: the part's stamps vanish, its pattern stays.
      return { ref: part.ref, kind: 'R', nodes: part.nodes, value: Infinity, origin: part.origin };
  }
}

/** Admittance after the change minus the placed part's admittance `y0`, at angular frequency omega. */
export function admittanceChange(part: Part, change: PartChange, omega: number, y0: Complex): Complex {
  if (change.kind === 'open') return { re: -y0.re, im: -y0.im };
  const y = partAdmittance(changedPart(part, change), omega);
  return { re: y.re - y0.re, im: y.im - y0.im };
}
