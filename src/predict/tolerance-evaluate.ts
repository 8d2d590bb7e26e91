// Evaluates many readings at many frequencies on one board (nominal or one tolerance sample) with one
// factorization per frequency: the readings are grouped by frequency, and where many node-to-ground
// readings share one frequency they all come from one selected inversion.
import type { Complex } from '../circuit/admittance.js';
import { ImpedanceSolver, SingularBoardError, type SolvedFrequency } from '../circuit/impedance.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import type { Part } from '../board/types.js';
import { readingValue, type Reading } from './tolerance-readings.js';

export interface ReadingRequest {
  reading: Reading;
  frequencies: readonly number[];
}

/** Where (request, point) pairs sit, by frequency ascending. */
export type FrequencySchedule = [frequency: number, points: [request: number, point: number][]][];

export function scheduleByFrequency(requests: readonly ReadingRequest[]): FrequencySchedule {
  const byFrequency = new Map<number, [number, number][]>();
  requests.forEach((request, r) =>
    request.frequencies.forEach((f, p) => {
      const list = byFrequency.get(f);
      if (list) list.push([r, p]);
      else byFrequency.set(f, [[r, p]]);
    }),
  );
  return [...byFrequency.entries()].sort((a, b) => a[0] - b[0]);
}

/** With at least this many node-to-ground readings at one frequency, one selected inversion serves them all. */
const SELECTED_INVERSION_FROM = 8;

/** A board that cannot be solved at a frequency of the plan (lossless and exactly on a resonance). */
export class UnsolvableReadingError extends Error {
  constructor(readonly frequencyHz: number, detail: string) {
    super(detail);
    this.name = 'UnsolvableReadingError';
  }
}

export function evaluateSchedule(
  laplacian: GroundedLaplacian,
  requests: readonly ReadingRequest[],
  schedule: FrequencySchedule,
  visit: (request: number, point: number, z: Complex, solved: SolvedFrequency) => void,
  partMap?: (part: Part) => Part,
): void {
  const solver = new ImpedanceSolver(laplacian, partMap);
  for (const [f, points] of schedule) {
    let solved: SolvedFrequency;
    try {
      solved = solver.at(f);
    } catch (err) {
      if (err instanceof SingularBoardError) throw new UnsolvableReadingError(f, err.message);
      throw err;
    }
    const toGround = points.filter(([r]) => requests[r].reading.kind === 'to-ground').length;
    if (toGround >= SELECTED_INVERSION_FROM) solved.allToGround();
    for (const [r, p] of points) visit(r, p, readingValue(solved, requests[r].reading), solved);
  }
}
