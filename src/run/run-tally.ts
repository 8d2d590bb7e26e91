// Running counts of a scan, folded from its events (pure): what the progress bar, the summary and the exit
// code need. A resumed run starts from the counts of the readings already in the log.
import { scan, type OperatorFunction } from 'rxjs';
import type { ReadingFlag, RunEvent } from './run-events.js';

export interface Tally {
  readings: number;
  deviations: number;
  invalid: number;
}

export const EMPTY_TALLY: Tally = { readings: 0, deviations: 0, invalid: 0 };

export function countReading(t: Tally, flag: ReadingFlag): Tally {
  return {
    readings: t.readings + 1,
    deviations: t.deviations + (flag === 'deviation' ? 1 : 0),
    invalid: t.invalid + (flag === 'invalid' ? 1 : 0),
  };
}

export function addEvent(t: Tally, e: RunEvent): Tally {
  return e.event === 'reading' ? countReading(t, e.flag) : t;
}

/** The tally after each event, from `start`. */
export function tallyEvents(start: Tally = EMPTY_TALLY): OperatorFunction<RunEvent, Tally> {
  return scan(addEvent, start);
}

/** Readings outside their band or not readable at all: either makes a completed scan exit 1. */
export const flagged = (t: Tally): number => t.deviations + t.invalid;
