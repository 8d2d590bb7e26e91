// What one reading measures, independent of any plan: node to ground, two-point between two nodes, or
// transfer (the voltage at `sense` per ampere driven into `hi` and out at ground). Shared by the Monte
// Carlo and the first-order tolerance bands, so both evaluate a reading the same way.
import { GROUND } from '../board/types.js';
import type { Complex } from '../circuit/admittance.js';
import type { SolvedFrequency } from '../circuit/impedance.js';
import type { ComplexVector } from '../numeric/types.js';

export type ReadingKind = 'to-ground' | 'two-point' | 'transfer';

export interface Reading {
  kind: ReadingKind;
  hi: string;
  /** GROUND for to-ground and transfer readings. */
  lo: string;
  /** Transfer readings only: the node whose voltage is read. */
  sense?: string;
}

/** The reading's predicted value at a solved frequency (ohms, or volts per ampere for transfer). */
export function readingValue(solved: SolvedFrequency, reading: Reading): Complex {
  switch (reading.kind) {
    case 'to-ground':
      return solved.toGround(reading.hi);
    case 'two-point':
      return solved.between(reading.hi, reading.lo);
    case 'transfer':
      return solved.transfer(reading.hi, senseOf(reading));
  }
}

/**
 * The two node-voltage vectors whose quadratic form gives the reading, Z = uᵀ J⁻¹ w: `drive` = J⁻¹w is
 * what the excitation sets up, `adjoint` = J⁻¹u is the response to a unit current at the sensing
 * terminals. For to-ground and two-point readings u = w, so both are the same vector.
 */
export function readingResponses(solved: SolvedFrequency, reading: Reading): { drive: ComplexVector; adjoint: ComplexVector } {
  if (reading.kind === 'transfer') {
    return { drive: solved.responseTo(reading.hi), adjoint: solved.responseTo(senseOf(reading)) };
  }
  const hi = solved.responseTo(reading.hi);
  if (reading.kind === 'to-ground' || reading.lo === GROUND) return { drive: hi, adjoint: hi };
  const lo = solved.responseTo(reading.lo);
  const diff: ComplexVector = { re: new Float64Array(hi.re.length), im: new Float64Array(hi.im.length) };
  for (let i = 0; i < hi.re.length; i++) {
    diff.re[i] = hi.re[i] - lo.re[i];
    diff.im[i] = hi.im[i] - lo.im[i];
  }
  return { drive: diff, adjoint: diff };
}

/** A stable text key for a reading, e.g. "to-ground n1", "two-point n1 n2", "transfer n1 n5". */
export function readingKey(reading: Reading): string {
  return reading.kind === 'transfer' ? `transfer ${reading.hi} ${reading.sense}` : reading.kind === 'two-point' ? `two-point ${reading.hi} ${reading.lo}` : `to-ground ${reading.hi}`;
}

function senseOf(reading: Reading): string {
  if (reading.sense === undefined) throw new RangeError(`a transfer reading from ${reading.hi} needs a sense node`);
  return reading.sense;
}
