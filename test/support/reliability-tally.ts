// Reliability suites report what they tried here; `npm run reliability` sets TOPOPROBE_TALLY_FILE, runs the
// suites and prints the totals in one table. Under plain `npm test` nothing is written: the assertions in the
// suites are what pass or fail, the tally only counts them.
import { appendFileSync } from 'node:fs';

export type TallyArea = 'fault' | 'kill' | 'bad-input' | 'property' | 'safety';

export interface TallyEntry {
  area: TallyArea;
  /** What was tried, e.g. "late answers over pty" or "board: unknown part kind". */
  name: string;
  /** It came out as it must: survived/finished or stopped safe (fault), nothing lost (kill), one clear line exit 2 (bad input), no counterexample (property). */
  ok: boolean;
  /** Cases behind this entry (property runs; kills in a series). Default 1. */
  cases?: number;
  /** Readings that had been reported and are missing from the final log (kill, fault). */
  lost?: number;
  /** Readings present more than once in the final log (kill, fault). */
  duplicated?: number;
}

export function tally(entry: TallyEntry): void {
  const file = process.env.TOPOPROBE_TALLY_FILE;
  if (!file) return;
  appendFileSync(file, `${JSON.stringify({ cases: 1, lost: 0, duplicated: 0, ...entry })}\n`);
}
