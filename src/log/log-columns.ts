// The scan log's columns (design contract): one row per reading, in the order read. `step` and `point`
// name the reading in the plan; `re`/`im` are empty for an invalid reading, whose `note` says why.
import type { ReadingTaken } from '../run/run-events.js';

export const LOG_COLUMNS = ['step', 'point', 'kind', 'hi', 'lo', 'sense', 'frequency_hz', 're', 'im', 'pred_re', 'pred_im', 'flag', 'note', 'time'] as const;

export type LogColumn = (typeof LOG_COLUMNS)[number];

/** One row of the log: a reading event without its event tag (the columns above, in that order). */
export type LogRow = Omit<ReadingTaken, 'event'>;

/** The row of a reading, as the CSV writer takes it (in column order; empty cells for absent values). */
export function rowCells(r: ReadingTaken): (string | number)[] {
  return [r.step, r.point, r.kind, r.hi, r.lo, r.sense ?? '', r.frequency_hz, r.re ?? '', r.im ?? '', r.pred_re, r.pred_im, r.flag, r.note ?? '', r.time];
}
