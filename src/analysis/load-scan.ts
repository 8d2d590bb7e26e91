// A scan as the analysis verbs see it: the log's readings and its metadata (whose board snapshot makes the
// log enough on its own: predictions are recomputed from it, not trusted from the plan).
import { existsSync } from 'node:fs';
import { isGroundName } from '../board/node-names.js';
import type { Board } from '../board/types.js';
import { readLog } from '../log/log-reader.js';
import { readMeta, type LogMeta } from '../log/log-meta.js';
import { metaPathOf } from '../log/log-paths.js';
import { LogError } from '../log/log-error.js';
import type { Reading } from './readings.js';

export interface LoadedScan {
  file: string;
  meta: LogMeta;
  board: Board;
  readings: Reading[];
  /** A torn last line left by a crash: not a reading, reported and ignored here. */
  torn?: string;
}

export function loadScan(file: string): LoadedScan {
  const metaFile = metaPathOf(file);
  if (!existsSync(file)) throw new LogError(file, 'no such log');
  if (!existsSync(metaFile)) throw new LogError(file, `has no metadata beside it (${metaFile}); the board snapshot is needed to analyse it`);
  const meta = readMeta(metaFile);
  const contents = readLog(file);
  if (contents.rows.length === 0) throw new LogError(file, 'holds no readings yet; nothing to analyse (resume the run first)');
  // Every terminal must be a node of the board the log was made on: otherwise the log and its meta file
  // do not belong together, and no verb can say anything about the reading.
  const nodes = new Set(meta.board.snapshot.nodes.map((n) => n.name));
  contents.rows.forEach((r, i) => {
    for (const field of ['hi', 'lo', 'sense'] as const) {
      const name = r[field];
      if (name === undefined || name === '' || isGroundName(name) || nodes.has(name)) continue;
      throw new LogError(file, `line ${i + 2}, column ${field}: ${JSON.stringify(name)} is not a node of board ${meta.board.snapshot.name} (from ${metaFile})`);
    }
  });
  const readings: Reading[] = contents.rows.map((r) => ({
    step: r.step,
    point: r.point,
    kind: r.kind,
    hi: r.hi,
    lo: r.lo,
    ...(r.sense ? { sense: r.sense } : {}),
    frequency_hz: r.frequency_hz,
    re: r.re ?? Number.NaN,
    im: r.im ?? Number.NaN,
    pred_re: r.pred_re,
    pred_im: r.pred_im,
    flag: r.flag,
  }));
  return { file, meta, board: meta.board.snapshot, readings, ...(contents.torn ? { torn: contents.torn } : {}) };
}
