// What a fit frees: the parameter sets a user can ask for, checked against the board. Each set becomes one
// or more parameters (fit-parameters.ts); sets that would make the same value twice free are refused, as
// the fit would then have no unique answer.
import { closestName } from '../board/spelling.js';
import type { Board, Part, PartKind } from '../board/types.js';
import { FitError, FitSpecError } from './fit-errors.js';

/** The inductors' series resistance: one R in ohms for all of them, or one Q at a stated frequency. */
export type InductorResistanceSpec = { form: 'ohms' } | { form: 'q'; atHz: number };

export interface FitSpec {
  /** One factor on the value of every capacitor not fitted on its own. */
  capacitanceScale?: boolean;
  /** One factor on the value of every inductor not fitted on its own. */
  inductanceScale?: boolean;
  /** The inductors' series resistance, shared by all of them. */
  inductorResistance?: InductorResistanceSpec;
  /** The values of these parts (refs), each on its own; a part fitted on its own is not scaled. */
  parts?: readonly string[];
  /** Every part's value on its own, each held weakly toward its nominal value (see fit-parameters.ts). */
  allParts?: boolean;
}

export interface CheckedSpec {
  capacitanceScale: boolean;
  inductanceScale: boolean;
  inductorResistance?: InductorResistanceSpec;
  /** Indices into board.parts of the parts fitted on their own, in board order. */
  ownParts: number[];
  /** True for an all-parts fit: the own parts carry a prior toward nominal. */
  withPrior: boolean;
}

/** Checks the spec against the board; throws FitError naming the field. */
export function checkFitSpec(board: Board, spec: FitSpec): CheckedSpec {
  const parts = board.parts;
  if (spec.allParts && (spec.capacitanceScale || spec.inductanceScale)) {
    const which = spec.capacitanceScale ? 'capacitanceScale' : 'inductanceScale';
    throw new FitSpecError(which, which, ' cannot be combined with allParts, which already frees every value (a scale on top has no unique solution)');
  }
  if (spec.allParts && spec.parts && spec.parts.length > 0) {
    throw new FitSpecError('parts', 'parts', ' cannot be combined with allParts, which already fits every part on its own');
  }

  let own: number[] = [];
  if (spec.allParts) own = parts.map((_, k) => k);
  else if (spec.parts) own = namedParts(board, spec.parts);

  const fittedOnOwn = new Set(own);
  const leftOfKind = (kind: PartKind) => parts.filter((p, k) => p.kind === kind && !fittedOnOwn.has(k)).length;
  if (spec.capacitanceScale && leftOfKind('C') === 0) {
    throw new FitSpecError('capacitanceScale', 'capacitanceScale', `: board ${board.name} has no capacitor left to scale`);
  }
  if (spec.inductanceScale && leftOfKind('L') === 0) {
    throw new FitSpecError('inductanceScale', 'inductanceScale', `: board ${board.name} has no inductor left to scale`);
  }
  const resistance = spec.inductorResistance;
  if (resistance) {
    if (!parts.some((p) => p.kind === 'L')) throw new FitSpecError('inductorResistance', 'inductorResistance', `: board ${board.name} has no inductor`);
    if (resistance.form === 'q' && !(resistance.atHz > 0 && Number.isFinite(resistance.atHz))) {
      throw new FitSpecError('inductorResistance', 'inductorResistance.atHz', ` must be a frequency above zero, got ${resistance.atHz}`);
    }
    if (resistance.form !== 'ohms' && resistance.form !== 'q') {
      throw new FitSpecError('inductorResistance', 'inductorResistance.form', ` must be "ohms" or "q", got ${JSON.stringify((resistance as { form: unknown }).form)}`);
    }
  }
  const checked: CheckedSpec = {
    capacitanceScale: spec.capacitanceScale === true,
    inductanceScale: spec.inductanceScale === true,
    ownParts: own,
    withPrior: spec.allParts === true,
  };
  if (resistance) checked.inductorResistance = resistance;
  if (!checked.capacitanceScale && !checked.inductanceScale && !resistance && own.length === 0) {
    throw new FitError('fit spec: nothing to fit; choose capacitanceScale, inductanceScale, inductorResistance, parts or allParts');
  }
  return checked;
}

function namedParts(board: Board, refs: readonly string[]): number[] {
  const indexOf = new Map(board.parts.map((p, k) => [p.ref, k]));
  const seen = new Set<number>();
  refs.forEach((ref, i) => {
    const k = indexOf.get(ref);
    if (k === undefined) throw new FitSpecError('parts', `parts[${i}]`, `: no part ${JSON.stringify(ref)} on board ${board.name}${hint(ref, board.parts)}`);
    if (seen.has(k)) throw new FitSpecError('parts', `parts[${i}]`, `: ${ref} is named twice`);
    seen.add(k);
  });
  return [...seen].sort((a, b) => a - b);
}

function hint(ref: string, parts: readonly Part[]): string {
  const near = closestName(ref, parts.map((p) => p.ref));
  return near ? ` (did you mean ${near}?)` : '';
}
