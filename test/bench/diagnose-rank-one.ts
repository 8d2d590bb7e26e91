// Diagnosis time on corner-8x8 with rank-one (Sherman–Morrison) updates of the factored J, against the
// reference that stamps and refactors J for every candidate value. Both rank the same parts on the same
// readings in this process, and must agree on the ranking before a time is reported. The reference is
// too slow for all 208 parts, so the ratio is taken on a subset; the full rank-one diagnosis (every part,
// fixture paths and all) is timed as well.
import { fileURLToPath } from 'node:url';
import { loadBoard } from '../../src/board/index.js';
import { diagnose } from '../../src/analysis/diagnose.js';
import { scanReadings } from './diagnose-scan.util.js';
import { medianMs, printTable } from './timing.util.js';

const FREQUENCIES = [94e3, 117.3e3, 146.6e3];
const SUBSET = 8;

export async function run(): Promise<void> {
  const board = loadBoard(fileURLToPath(new URL('../../shared/boards/corner-8x8.yaml', import.meta.url)));
  const readings = scanReadings(board, { faults: ['C_yout1_1_1=4.7n'], frequencies: FREQUENCIES, seed: 2 });
  // The faulted part among a spread of others.
  const step = Math.floor(board.parts.length / SUBSET);
  const parts = [...new Set(['C_yout1_1_1', ...board.parts.filter((_, k) => k % step === 0).map((p) => p.ref)])].slice(0, SUBSET);
  const options = { parts, fixture: false, pairs: false } as const;

  const fast = diagnose(board, readings, options);
  const reference = diagnose(board, readings, { ...options, method: 'refactor' });
  const same = fast.candidates.every((c, i) => reference.candidates[i]?.ref === c.ref);
  if (!same) throw new Error(`rank-one and refactor rankings differ: ${fast.candidates.map((c) => c.ref)} / ${reference.candidates.map((c) => c.ref)}`);

  const fastMs = medianMs(() => diagnose(board, readings, options), 5);
  const referenceMs = medianMs(() => diagnose(board, readings, { ...options, method: 'refactor' }), 1, 0);
  const fullMs = medianMs(() => diagnose(board, readings), 3);
  const perPartReference = referenceMs / parts.length;

  printTable(
    `diagnose on corner-8x8 (${readings.length} readings at ${FREQUENCIES.length} frequencies; leader ${fast.candidates[0].ref})`,
    ['method', 'parts', 'time ms', 'ratio'],
    [
      ['refactor J per value', String(parts.length), referenceMs.toFixed(0), '1'],
      ['rank-one updates', String(parts.length), fastMs.toFixed(1), `${(referenceMs / fastMs).toFixed(0)}× faster`],
      ['rank-one, full diagnosis', `${board.parts.length} + fixture`, fullMs.toFixed(0), ''],
      ['refactor, extrapolated', String(board.parts.length), (perPartReference * board.parts.length).toFixed(0), `${((perPartReference * board.parts.length) / fullMs).toFixed(0)}× slower than full rank-one`],
    ],
  );
}
