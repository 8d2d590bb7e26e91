// Appends the rows of a scan log as the readings arrive. Every row goes to the file with its own write
// before the reading is reported anywhere else, so a crash or a kill -9 loses no reading already shown;
// an fdatasync follows at least every `syncEveryMs` (and on close) for a power cut. Rows are RFC 4180
// records written by csv-stringify, CR LF ended; a line without its CR LF is therefore a torn last write.
import { closeSync, fdatasyncSync, fstatSync, ftruncateSync, openSync, writeSync } from 'node:fs';
import { stringify } from 'csv-stringify/sync';
import type { ReadingTaken } from '../run/run-events.js';
import { LOG_COLUMNS, rowCells } from './log-columns.js';
import { LogError } from './log-error.js';

/** RFC 4180, section 2 (from memory): records end in CR LF; fields with commas, quotes or breaks are quoted. */
export const CSV_RECORD_END = '\r\n';

export interface WriterOptions {
  /** Longest time a written row may wait for an fdatasync; 0 syncs after every row. Default 250 ms. */
  syncEveryMs?: number;
}

export class LogWriter {
  private fd?: number;
  private lastSync = Date.now();
  private readonly syncEveryMs: number;
  rows = 0;

  private constructor(
    readonly file: string,
    fd: number,
    options: WriterOptions,
  ) {
    this.fd = fd;
    this.syncEveryMs = options.syncEveryMs ?? 250;
  }

  /** A new log with its header; refuses to replace a file that exists. */
  static create(file: string, options: WriterOptions = {}): LogWriter {
    const writer = new LogWriter(file, openOrExplain(file, 'wx'), options);
    writer.put(csvLine([...LOG_COLUMNS]));
    writer.sync();
    return writer;
  }

  /**
   * Continues a log: keeps its first `keepBytes` bytes (what ends in a complete record), cuts a torn tail,
   * and appends after it. A log cut to nothing gets its header again.
   */
  static resume(file: string, keepBytes: number, options: WriterOptions = {}): LogWriter {
    const fd = openOrExplain(file, 'r+');
    const size = fstatSync(fd).size;
    if (keepBytes < size) ftruncateSync(fd, keepBytes);
    const writer = new LogWriter(file, fd, options);
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

  sync(): void {
    if (this.fd === undefined) return;
    fdatasyncSync(this.fd);
    this.lastSync = Date.now();
  }

  close(): void {
    if (this.fd === undefined) return;
    this.sync();
    closeSync(this.fd);
    this.fd = undefined;
  }

  private put(text: string): void {
    if (this.fd === undefined) throw new LogError(this.file, 'the log is already closed');
    const bytes = Buffer.from(text, 'utf8');
    let done = 0;
    while (done < bytes.length) done += writeSync(this.fd, bytes, done, bytes.length - done, this.position + done);
    this.position += bytes.length;
  }
}

/** One CSV record. Line breaks inside text become spaces, so that a record is always exactly one line. */
export function csvLine(cells: (string | number)[]): string {
  const flat = cells.map((c) => (typeof c === 'string' ? c.replace(/[\r\n]+/g, ' ') : c));
  return stringify([flat], { record_delimiter: 'windows', eof: true });
}

function openOrExplain(file: string, flags: 'wx' | 'r+'): number {
  try {
    return openSync(file, flags);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    if (code === 'EEXIST') throw new LogError(file, 'exists already; give --resume to continue it, or another --log');
    if (code === 'ENOENT') throw new LogError(file, flags === 'wx' ? 'its folder does not exist' : 'no such log');
    if (code === 'EACCES' || code === 'EPERM') throw new LogError(file, 'permission denied');
    throw new LogError(file, `cannot open it: ${(error as Error).message}`);
  }
}
