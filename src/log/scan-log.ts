// The scan log as a run keeps it: the CSV of readings (LogWriter) and its meta file, fed from the run's
// events. A fresh log is made when the run starts; a resumed one is checked first (same plan file, same
// board, every logged reading one the plan has, none twice) and continued after its last whole record.
import path from 'node:path';
import type { Board } from '../board/types.js';
import type { RunEvent, ScanDone } from '../run/run-events.js';
import { countReading, EMPTY_TALLY, type Tally } from '../run/run-tally.js';
import { readingKey } from '../run/work-list.js';
import { VERSION } from '../version.js';
import { LogError } from './log-error.js';
import { readMeta, writeMeta, META_FORMAT, type LogMeta } from './log-meta.js';
import { metaPathOf } from './log-paths.js';
import { readLog } from './log-reader.js';
import { LogWriter, type WriterOptions } from './log-writer.js';

/** What the meta file records about a run's setting. */
export interface LogSetting {
  plan: LogMeta['plan'];
  board: { name: string; hash: string; snapshot: Board };
  mode: LogMeta['mode'];
  instruments: LogMeta['instruments'];
  simulated: LogMeta['simulated'];
}

export interface ResumePoint {
  file: string;
  meta: LogMeta;
  /** readingKey(step, point) of every reading in the log. */
  done: Set<string>;
  tally: Tally;
  goodBytes: number;
  /** A torn last line that will be cut off. */
  torn?: string;
}

/** Checks that `file` can be resumed with this plan and board, touching nothing. */
export function checkResume(file: string, expect: { planSha256: string; boardHash: string; hasReading(step: number, point: number): boolean }): ResumePoint {
  const metaFile = metaPathOf(file);
  const meta = readMeta(metaFile);
  if (meta.plan.sha256 !== expect.planSha256) {
    throw new LogError(file, `was made with another plan (${meta.plan.file}, sha256 ${meta.plan.sha256.slice(0, 12)}…, this plan's is ${expect.planSha256.slice(0, 12)}…); resume it with the plan it was made with`);
  }
  if (meta.board.hash !== expect.boardHash) {
    throw new LogError(file, `was made for board ${meta.board.name} (hash ${meta.board.hash.slice(0, 12)}…), not this plan's board (hash ${expect.boardHash.slice(0, 12)}…)`);
  }
  if (meta.status === 'complete') throw new LogError(file, 'is complete already; nothing to resume');
  const contents = readLog(file);
  const done = new Set<string>();
  let tally = EMPTY_TALLY;
  contents.rows.forEach((row, i) => {
    const key = readingKey(row.step, row.point);
    if (!expect.hasReading(row.step, row.point)) throw new LogError(file, `line ${i + 2}: step ${row.step} point ${row.point} is not in the plan`);
    if (done.has(key)) throw new LogError(file, `line ${i + 2}: step ${row.step} point ${row.point} is logged twice`);
    done.add(key);
    tally = countReading(tally, row.flag);
  });
  return { file, meta, done, tally, goodBytes: contents.goodBytes, ...(contents.torn !== undefined ? { torn: contents.torn } : {}) };
}

export class ScanLog {
  private tally: Tally;
  private readonly addedBefore: number;
  private closed = false;

  private constructor(
    readonly file: string,
    private readonly writer: LogWriter,
    private meta: LogMeta,
  ) {
    this.tally = { readings: meta.readings, deviations: meta.deviations, invalid: meta.invalid };
    this.addedBefore = meta.readings;
    writeMeta(metaPathOf(file), meta);
  }

  /** A new log (refusing an existing file) and its meta file with status `running`. */
  static create(file: string, setting: LogSetting, options: WriterOptions = {}): ScanLog {
    const writer = LogWriter.create(file, options);
    const started = new Date().toISOString();
    const meta: LogMeta = {
      format: META_FORMAT,
      log: path.basename(file),
      software: { name: 'topoprobe', version: VERSION },
      ...setting,
      started,
      ended: null,
      status: 'running',
      ...EMPTY_TALLY,
      runs: [{ started, ended: null, status: 'running', readings: 0 }],
    };
    return new ScanLog(file, writer, meta);
  }

  /** Continues a checked log: its torn tail cut, a new run added to its meta. */
  static resume(point: ResumePoint, setting: LogSetting, options: WriterOptions = {}): ScanLog {
    const writer = LogWriter.resume(point.file, point.goodBytes, options);
    const started = new Date().toISOString();
    const previous = point.meta.runs.map((r) => (r.status === 'running' ? { ...r, status: 'interrupted' as const, reason: 'the process ended without closing the log' } : r));
    const meta: LogMeta = {
      ...point.meta,
      software: { name: 'topoprobe', version: VERSION },
      instruments: setting.instruments,
      simulated: setting.simulated,
      ended: null,
      status: 'running',
      ...point.tally,
      runs: [...previous, { started, ended: null, status: 'running', readings: 0 }],
    };
    return new ScanLog(point.file, writer, meta);
  }

  get counts(): Tally {
    return this.tally;
  }

  /** Takes every event; readings are written at once, `done` closes the log with its status. */
  record(event: RunEvent): void {
    if (event.event === 'reading') {
      this.writer.write(event);
      this.tally = countReading(this.tally, event.flag);
    } else if (event.event === 'step-started') {
      this.writer.sync();
    } else if (event.event === 'done') {
      this.finish(event);
    }
  }

  /**
   * Closes the CSV and writes the final meta; later calls do nothing. A final sync that fails still gets
   * the meta written (as failed) before the failure is thrown.
   */
  finish(given: Pick<ScanDone, 'status' | 'reason' | 'safe'>): void {
    if (this.closed) return;
    this.closed = true;
    let closeFailure: unknown;
    try {
      this.writer.close();
    } catch (error) {
      closeFailure = error;
    }
    const done = closeFailure === undefined ? given : { ...given, status: 'failed' as const, reason: given.reason ?? (closeFailure as Error).message };
    const ended = new Date().toISOString();
    const runs = [...this.meta.runs];
    runs[runs.length - 1] = {
      ...runs[runs.length - 1],
      ended,
      status: done.status,
      readings: this.tally.readings - this.addedBefore,
      ...(done.reason !== undefined ? { reason: done.reason } : {}),
      safe: done.safe,
    };
    this.meta = { ...this.meta, ended, status: done.status, ...this.tally, runs };
    writeMeta(metaPathOf(this.file), this.meta);
    if (closeFailure !== undefined) throw closeFailure;
  }
}
