// A log that cannot be written any more: a full disk cuts a write short and then refuses it (ENOSPC), or a
// sync reports an I/O error (EIO). The writer must leave the file ending in a whole record, refuse every
// later row (nothing may be appended after a row in doubt), name the file and the errno, and still close
// its descriptor. The behaviour of write(2) on a full disk (a short write, then -1 with ENOSPC) is POSIX
// (from memory); the file is read back with csv-parse, not with our own reader.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { beforeEach, describe, expect, it } from 'vitest';
import { LogWriteError } from '../../../src/log/log-error.js';
import { diskFullAt, LOG_LIMIT_VARIABLE, logFileOps, nodeFileOps, type LogFileOps } from '../../../src/log/log-file-ops.js';
import { LOG_COLUMNS } from '../../../src/log/log-columns.js';
import { LogWriter } from '../../../src/log/log-writer.js';
import type { ReadingTaken } from '../../../src/run/run-events.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-log-full-'));
});

const reading = (point: number): ReadingTaken => ({
  event: 'reading',
  time: new Date(Date.UTC(2025, 0, 1, 0, 0, 0, point)).toISOString(),
  step: 1,
  point,
  kind: 'to-ground',
  hi: 'n1',
  lo: 'gnd',
  frequency_hz: 1e5 + point,
  re: 1 + point / 7,
  im: -point / 3,
  pred_re: 1,
  pred_im: -1,
  flag: 'ok',
});

/** Records what the writer asked of the disk. */
function watched(ops: LogFileOps): { ops: LogFileOps; closed: number[]; truncated: number[] } {
  const closed: number[] = [];
  const truncated: number[] = [];
  return {
    closed,
    truncated,
    ops: { ...ops, close: (fd) => (closed.push(fd), ops.close(fd)), ftruncate: (fd, n) => (truncated.push(n), ops.ftruncate(fd, n)) },
  };
}

describe('a full disk', () => {
  it('cuts the row that does not fit back off, refuses later rows, names the file and ENOSPC', () => {
    const file = path.join(dir, 'full.csv');
    const disk = watched(diskFullAt(700));
    const writer = LogWriter.create(file, { ops: disk.ops, syncEveryMs: 0 });
    let failure: unknown;
    let written = 0;
    for (let p = 1; p <= 20 && failure === undefined; p++) {
      try {
        writer.write(reading(p));
        written++;
      } catch (error) {
        failure = error;
      }
    }
    expect(failure).toBeInstanceOf(LogWriteError);
    expect((failure as LogWriteError).code).toBe('ENOSPC');
    expect((failure as Error).message).toBe(`${file}: writing the log failed (ENOSPC, the disk is full)`);
    expect((failure as LogWriteError).exitCode).toBe(3);
    expect(written).toBeGreaterThan(0);
    // The partial row was taken back: the file is whole records, the header and every row that was accepted.
    const text = readFileSync(file, 'utf8');
    expect(text.endsWith('\r\n')).toBe(true);
    expect(Buffer.byteLength(text)).toBeLessThanOrEqual(700);
    const records = parse(text) as string[][];
    expect(records[0]).toEqual([...LOG_COLUMNS]);
    expect(records.slice(1).map((r) => Number(r[1]))).toEqual(Array.from({ length: written }, (_, i) => i + 1));
    expect(disk.truncated).toHaveLength(1);
    // Nothing is ever appended after a failure, even a row that would fit.
    expect(() => writer.write(reading(99))).toThrow(failure as Error);
    expect(writer.failed).toBe(failure);
    writer.close();
    expect(disk.closed).toHaveLength(1);
    expect(readFileSync(file, 'utf8')).toBe(text);
  });

  it('is what TOPOPROBE_TEST_LOG_LIMIT_BYTES sets up; without it the real operations are used', () => {
    expect(logFileOps({})).toBe(nodeFileOps);
    expect(logFileOps({ [LOG_LIMIT_VARIABLE]: '' })).toBe(nodeFileOps);
    expect(logFileOps({ [LOG_LIMIT_VARIABLE]: '500' })).not.toBe(nodeFileOps);
    expect(() => logFileOps({ [LOG_LIMIT_VARIABLE]: 'lots' })).toThrow(`${LOG_LIMIT_VARIABLE}=lots: expected a whole number of bytes`);
  });
});

describe('an I/O error on sync', () => {
  it('fails the row whose sync failed, refuses later rows, and still closes the file', () => {
    const file = path.join(dir, 'eio.csv');
    let syncs = 0;
    const failing: LogFileOps = {
      ...nodeFileOps,
      fdatasync: (fd) => {
        // The header's sync and the first row's pass; the second row's fails.
        if (++syncs > 2) throw Object.assign(new Error('EIO: i/o error, fdatasync'), { code: 'EIO' });
        nodeFileOps.fdatasync(fd);
      },
    };
    const disk = watched(failing);
    const writer = LogWriter.create(file, { ops: disk.ops, syncEveryMs: 0 });
    writer.write(reading(1));
    expect(() => writer.write(reading(2))).toThrow(`${file}: syncing the log failed (EIO, an I/O error)`);
    expect(() => writer.write(reading(3))).toThrow(/syncing the log failed/);
    expect(() => writer.close()).not.toThrow();
    expect(disk.closed).toHaveLength(1);
    const points = (parse(readFileSync(file, 'utf8')) as string[][]).slice(1).map((r) => Number(r[1]));
    expect(points).not.toContain(3);
  });
});
