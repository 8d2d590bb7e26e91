// What each planned reading asks of the board, per volt of excitation, on the nominal board: the drive
// impedance the analyzer sees (for the current limit) and the largest voltage across any part (for the
// ratings). With the level across the measuring terminals, the drive vector x (node voltages per ampere
// driven, J⁻¹w) scales to volts by level / Z_drive, so part k sees level · |x_a − x_b| / |Z_drive|.
// A level that is an open-circuit source voltage behind a source resistance puts less across a passive
// board (|Z / (R_s + Z)| ≤ 1), so both checks err on the safe side.
import type { Part } from '../board/types.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import { evaluateSchedule, scheduleByFrequency, type ReadingRequest } from '../predict/tolerance-evaluate.js';
import { readingResponses } from '../predict/tolerance-readings.js';

export interface ReadingLoad {
  /** Smallest |Z_drive| over the reading's points, and where. */
  minDriveOhm: number;
  minDriveAt: number;
  /** Largest part voltage per volt of level, any part, and which. */
  worstRatio: number;
  worstPart: string;
  /** Largest level the rated parts allow (Infinity without ratings), the part and frequency that bind. */
  ratedLevel: number;
  ratedPart: string;
  ratedAt: number;
  /** That part's rating (V) and its voltage per volt of level there. */
  ratedRating: number;
  ratedRatio: number;
}

/** The optional voltage rating of a part (board field `rating`), volts. */
export function partRating(part: Part): number | undefined {
  return part.rating_v;
}

export function readingLoads(laplacian: GroundedLaplacian, requests: readonly ReadingRequest[]): ReadingLoad[] {
  const loads: ReadingLoad[] = requests.map(() => ({ minDriveOhm: Infinity, minDriveAt: 0, worstRatio: 0, worstPart: '', ratedLevel: Infinity, ratedPart: '', ratedAt: 0, ratedRating: 0, ratedRatio: 0 }));
  const parts = laplacian.board.parts;
  const ends = parts.map((p) => [laplacian.index.row(p.nodes[0]), laplacian.index.row(p.nodes[1])] as const);
  evaluateSchedule(laplacian, requests, scheduleByFrequency(requests), (r, _p, _z, solved) => {
    const request = requests[r];
    const { drive } = readingResponses(solved, request.reading);
    const a0 = laplacian.index.row(request.reading.hi);
    const b0 = request.reading.kind === 'two-point' ? laplacian.index.row(request.reading.lo) : -1;
    const driveOhm = Math.hypot(at(drive.re, a0) - at(drive.re, b0), at(drive.im, a0) - at(drive.im, b0));
    const load = loads[r];
    const f = solved.frequencyHz;
    if (driveOhm < load.minDriveOhm) {
      load.minDriveOhm = driveOhm;
      load.minDriveAt = f;
    }
    if (!(driveOhm > 0)) return;
    parts.forEach((part, k) => {
      const [a, b] = ends[k];
      const ratio = Math.hypot(at(drive.re, a) - at(drive.re, b), at(drive.im, a) - at(drive.im, b)) / driveOhm;
      if (ratio > load.worstRatio) {
        load.worstRatio = ratio;
        load.worstPart = part.ref;
      }
      const rating = partRating(part);
      if (rating !== undefined && ratio > 0 && rating / ratio < load.ratedLevel) {
        load.ratedLevel = rating / ratio;
        load.ratedPart = part.ref;
        load.ratedAt = f;
        load.ratedRating = rating;
        load.ratedRatio = ratio;
      }
    });
  });
  return loads;
}

function at(values: Float64Array, row: number): number {
  return row >= 0 ? values[row] : 0;
}
