// Appends the rows of a scan log as the readings arrive. Every row goes to the file with its own write
// before the reading is reported anywhere else, so a crash or a kill -9 loses no reading already shown;
// an fdatasync follows at least every `syncEveryMs` (and on close) for a power cut. Rows are RFC 4180
// records written by csv-stringify, CR LF ended; a line without its CR LF is therefore a torn last write.
// A write or sync that fails (a full disk, an I/O error) takes its partial row back off where it can and
// leaves the writer refusing every later row: nothing is ever appended after a row that may be torn.
import { stringify } from 'csv-stringify/sync';
import type { ReadingTaken } from '../run/run-events.js';
import { LOG_COLUMNS, rowCells } from './log-columns.js';
import { LogError, LogWriteError } from './log-error.js';
import { logFileOps, type LogFileOps } from './log-file-ops.js';

/** RFC 4180, section 2 (from memory): records end in CR LF; fields with commas, quotes or breaks are quoted. */
export const CSV_RECORD_END = '\r\n';

export interface WriterOptions {
  /** Longest time a written row may wait for an fdatasync; 0 syncs after every row. Default 250 ms. */
  syncEveryMs?: number;
  /** The file operations (tests: a disk that fills up); default the real ones, or the test seam's. */
  ops?: LogFileOps;
}

export class LogWriter {
  private fd?: number;
  private lastSync = Date.now();
  private readonly syncEveryMs: number;
  /** The first write or sync that failed: every later row is refused with it. */
  private failure?: LogWriteError;
  rows = 0;

  private constructor(
    readonly file: string,
    fd: number,
    options: WriterOptions,
    private readonly ops: LogFileOps,
  ) {
    this.fd = fd;
    this.syncEveryMs = options.syncEveryMs ?? 250;
  }

  /** A new log with its header; refuses to replace a file that exists. */
  static create(file: string, options: WriterOptions = {}): LogWriter {
    const ops = options.ops ?? logFileOps();
    const writer = new LogWriter(file, openOrExplain(ops, file, 'wx'), options, ops);
    writer.put(csvLine([...LOG_COLUMNS]));
    writer.sync();
    return writer;
  }

  /**
   * Continues a log: keeps its first `keepBytes` bytes (what ends in a complete record), cuts a torn tail,
   * and appends after it. A log cut to nothing gets its header again.
   */
  static resume(file: string, keepBytes: number, options: WriterOptions = {}): LogWriter {
    const ops = options.ops ?? logFileOps();
    const fd = openOrExplain(ops, file, 'r+');
    const size = ops.size(fd);
    if (keepBytes < size) ops.ftruncate(fd, keepBytes);
    const writer = new LogWriter(file, fd, options, ops);
    writer.position = keepBytes;
    if (keepBytes === 0) writer.put(csvLine([...LOG_COLUMNS]));
    writer.sync();
    return writer;
  }

  private position = 0;

  write(reading: ReadingTaken): void {
    this.put(csvLine(rowCells(reading)));
    this.rows++;
    if (Date.now() - this.lastSync >= this.syncEveryMs) this.sync();
  }

  /** The failure that stopped this log being written, if one did. */
  get failed(): LogWriteError | undefined {
    return this.failure;
  }

  sync(): void {
    if (this.fd === undefined || this.failure) return;
    try {
      this.ops.fdatasync(this.fd);
    } catch (error) {
      // After a failed sync the kernel may have dropped the pages: what was written is in doubt.
      throw (this.failure = new LogWriteError(this.file, 'sync', error, this.rows));
    }
    this.lastSync = Date.now();
  }

  /** Syncs and closes; the descriptor is closed even when the sync fails (which is then thrown). */
  close(): void {
    if (this.fd === undefined) return;
    const fd = this.fd;
    try {
      this.sync();
    } finally {
      this.fd = undefined;
      this.ops.close(fd);
    }
  }

  private put(text: string): void {
    if (this.fd === undefined) throw new LogError(this.file, 'the log is already closed');
    if (this.failure) throw this.failure;
    const bytes = Buffer.from(text, 'utf8');
    const start = this.position;
    let done = 0;
    try {
      while (done < bytes.length) done += this.ops.write(this.fd, bytes, done, bytes.length - done, start + done);
    } catch (error) {
      this.failure = new LogWriteError(this.file, 'write', error, this.rows);
      // A full disk cuts a write short: take the partial row back off so the file ends in a whole record.
      // If even that fails, the torn line is found and dropped on resume.
      if (done > 0) {
        try {
          this.ops.ftruncate(this.fd, start);
        } catch {
          // left for the reader's torn-line check
        }
      }
      throw this.failure;
    }
    this.position += bytes.length;
  }
}

/** One CSV record. Line breaks inside text become spaces, so that a record is always exactly one line. */
export function csvLine(cells: (string | number)[]): string {
  const flat = cells.map((c) => (typeof c === 'string' ? c.replace(/[\r\n]+/g, ' ') : c));
  return stringify([flat], { record_delimiter: 'windows', eof: true });
}

function openOrExplain(ops: LogFileOps, file: string, flags: 'wx' | 'r+'): number {
  try {
    return ops.open(file, flags);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'EEXIST') throw new LogError(file, 'exists already; give --resume to continue it, or another --log');
    if (code === 'ENOENT') throw new LogError(file, flags === 'wx' ? 'its folder does not exist' : 'no such log');
    if (code === 'EACCES' || code === 'EPERM') throw new LogError(file, 'permission denied');
    throw new LogError(file, `cannot open it: ${(error as Error).message}`);
  }
}
