// Seeded draws of part values within their tolerances, for the Monte Carlo bands.
//
// ASSUMPTION (named, not measured): every part with a stated tolerance t is independently uniformly
// distributed within ±t of its nominal value (a rectangular distribution, the usual reading of a
// tolerance limit when nothing else is known; common practice in metrology). Its standard deviation
// is then t/√3. Series resistances (esr, also where given as a Q) keep their nominal ohms, and parts
// without a tolerance keep their nominal value.
//
// Uniform numbers come from a seeded generator (the one mathjs uses), so a seed gives the same samples every run.
import { seededUniform } from '../numeric/seeded-uniform.js';
import type { Board, Part } from '../board/types.js';

export const TOLERANCE_DISTRIBUTION = 'uniform within ±tolerance, parts independent; esr kept nominal';

/** Standard deviation, as a fraction of nominal, of a part uniform within ±tolerance (t/√3). */
export function toleranceStandardDeviation(tolerance: number): number {
  return tolerance / Math.sqrt(3);
}

/** One board sample: the drawn value of each part that has a tolerance, by reference designator. */
export interface ToleranceSample {
  index: number;
  values: ReadonlyMap<string, number>;
}

export interface SampleOptions {
  count: number;
  seed: number;
}

/** `count` samples; the parts are drawn in board order, so the same board and seed give the same values. */
export function drawToleranceSamples(board: Pick<Board, 'parts'>, options: SampleOptions): ToleranceSample[] {
  const uniform = seededUniform(`topoprobe-tolerance-${options.seed}`);
  const varying = board.parts.filter((p) => (p.tolerance ?? 0) > 0);
  const samples: ToleranceSample[] = [];
  for (let index = 0; index < options.count; index++) {
    const values = new Map<string, number>();
    for (const part of varying) {
      const u = uniform(); // [0, 1)
      values.set(part.ref, part.value * (1 + (part.tolerance as number) * (2 * u - 1)));
    }
    samples.push({ index, values });
  }
  return samples;
}

/** The part map the engine takes (GroundedLaplacian.assemble, ImpedanceSolver) for one sample. */
export function samplePartMap(sample: ToleranceSample): (part: Part) => Part {
  return (part) => {
    const value = sample.values.get(part.ref);
    return value === undefined ? part : { ...part, value };
  };
}

/** A copy of the board with one sample's values, for checks that solve it as an ordinary board. */
export function boardWithSample(board: Board, sample: ToleranceSample): Board {
  const map = samplePartMap(sample);
  return { ...board, parts: board.parts.map(map) };
}
