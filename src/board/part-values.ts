// A part's value, tolerance and losses, read from the raw fields with the unit its kind implies.
// Losses are written either as `esr` (ohms) or as a quality factor `q` measured at frequency `q_at`;
// a Q becomes the series resistance that has that Q at that frequency:
//   inductor   Q = ωL/R      ->  esr = ωL/Q        (ω = 2π·q_at)
//   capacitor  Q = 1/(ωCR)   ->  esr = 1/(ωCQ)
// (the usual definition of Q for a reactance in series with a resistance; common practice).

import { parsePercent, parseQuantity, QuantityError, type UnitName } from '../units/quantity.js';
import { joinPath, type ProblemLog } from './errors.js';
import type { PartKind } from './types.js';

export const UNIT_OF_KIND: Record<PartKind, UnitName> = { C: 'F', L: 'H', R: 'ohm' };

/** How a part's losses were given; kept as written so a changed value keeps the same Q. */
export type Loss = { esr: number } | { q: number; qAt: number };

export interface RawValueFields {
  value?: number | string;
  tolerance?: number | string;
  esr?: number | string;
  q?: number;
  q_at?: number | string;
  rating?: number | string;
}

export interface PartValues {
  value?: number;
  tolerance?: number;
  loss?: Loss;
  /** Voltage rating, volts. */
  rating?: number;
}

/** Reads the fields that are present; returns undefined if any of them is wrong (problems logged). */
export function readPartValues(raw: RawValueFields, kind: PartKind, path: string, log: ProblemLog): PartValues | undefined {
  const before = log.count;
  const out: PartValues = {};
  const read = <T>(field: string, parse: () => T): T | undefined => {
    try {
      return parse();
    } catch (error) {
      if (!(error instanceof QuantityError)) throw error;
      log.add(joinPath(path, field), error.message);
      return undefined;
    }
  };
  if (raw.value !== undefined) out.value = read('value', () => parseQuantity(raw.value, UNIT_OF_KIND[kind]));
  if (raw.tolerance !== undefined) out.tolerance = read('tolerance', () => parsePercent(raw.tolerance));
  if (raw.rating !== undefined) out.rating = read('rating', () => parseQuantity(raw.rating, 'V'));

  if (kind === 'R') {
    for (const field of ['esr', 'q', 'q_at'] as const) {
      if (raw[field] !== undefined) log.add(joinPath(path, field), `${field} applies to capacitors and inductors, not to a resistor`);
    }
  } else if (raw.esr !== undefined && raw.q !== undefined) {
    log.add(joinPath(path, 'q'), 'give either esr or q (with q_at), not both');
  } else if (raw.esr !== undefined) {
    const esr = read('esr', () => parseQuantity(raw.esr, 'ohm', { allowZero: true }));
    if (esr !== undefined) out.loss = { esr };
  } else if (raw.q !== undefined || raw.q_at !== undefined) {
    if (raw.q === undefined) log.add(joinPath(path, 'q_at'), 'q_at is the frequency of a quality factor; give q as well');
    else if (raw.q_at === undefined) log.add(joinPath(path, 'q'), 'q needs q_at, the frequency it holds at (e.g. q_at: 100kHz)');
    else {
      const qAt = read('q_at', () => parseQuantity(raw.q_at, 'Hz'));
      if (qAt !== undefined) out.loss = { q: raw.q, qAt };
    }
  }
  return log.count === before ? out : undefined;
}

/** Series resistance in ohms for the given losses, or undefined if none were given. */
export function seriesResistance(kind: PartKind, value: number, loss: Loss | undefined): number | undefined {
  if (!loss) return undefined;
  if ('esr' in loss) return loss.esr;
  const omega = 2 * Math.PI * loss.qAt;
  return kind === 'L' ? (omega * value) / loss.q : 1 / (omega * value * loss.q);
}
