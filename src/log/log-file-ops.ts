// The few file operations the log writer uses, behind one small interface, so that a test can make the
// disk fill up without root or a special file system. Only the test seam reads the environment:
// TOPOPROBE_TEST_LOG_LIMIT_BYTES=N lets the CSV grow to N bytes and then fails every write with ENOSPC,
// cutting the write that crosses the limit short first, as write(2) on a full disk does.
import { closeSync, fdatasyncSync, fstatSync, ftruncateSync, openSync, writeSync } from 'node:fs';

export interface LogFileOps {
  open(file: string, flags: 'wx' | 'r+'): number;
  /** Writes from `buffer[offset .. offset + length)` at `position`; returns the bytes written (may be fewer). */
  write(fd: number, buffer: Uint8Array, offset: number, length: number, position: number): number;
  fdatasync(fd: number): void;
  ftruncate(fd: number, length: number): void;
  size(fd: number): number;
  close(fd: number): void;
}

export const nodeFileOps: LogFileOps = {
  open: (file, flags) => openSync(file, flags),
  write: (fd, buffer, offset, length, position) => writeSync(fd, buffer, offset, length, position),
  fdatasync: (fd) => fdatasyncSync(fd),
  ftruncate: (fd, length) => ftruncateSync(fd, length),
  size: (fd) => fstatSync(fd).size,
  close: (fd) => closeSync(fd),
};

export const LOG_LIMIT_VARIABLE = 'TOPOPROBE_TEST_LOG_LIMIT_BYTES';

/** The operations a log is written with: the real ones, or a disk that fills up at the test limit. */
export function logFileOps(env: NodeJS.ProcessEnv = process.env): LogFileOps {
  const text = env[LOG_LIMIT_VARIABLE];
  if (text === undefined || text === '') return nodeFileOps;
  const limit = Number(text);
  if (!Number.isInteger(limit) || limit < 0) throw new RangeError(`${LOG_LIMIT_VARIABLE}=${text}: expected a whole number of bytes`);
  return diskFullAt(limit);
}

/** A disk with room for `limit` bytes of this file. */
export function diskFullAt(limit: number, ops: LogFileOps = nodeFileOps): LogFileOps {
  return {
    ...ops,
    write(fd, buffer, offset, length, position) {
      const room = limit - position;
      if (room <= 0) throw Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC', errno: -28, syscall: 'write' });
      return ops.write(fd, buffer, offset, Math.min(length, room), position);
    },
  };
}
