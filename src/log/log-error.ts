// A log or its meta file that cannot be used as asked (missing, made by another plan, damaged). One line
// naming the file, exit code 2: the measurements in it are never touched.
export class LogError extends Error {
  readonly exitCode = 2;
  constructor(
    readonly file: string,
    problem: string,
  ) {
    super(`${file}: ${problem}`);
    this.name = 'LogError';
  }
}

/**
 * The log could not be written any more (a full disk, an I/O error): the run stops safe, exit 3. The rows
 * before the failing one are whole and on disk; the failing reading was never reported.
 */
export class LogWriteError extends Error {
  readonly exitCode = 3;
  readonly code: string | undefined;
  constructor(
    readonly file: string,
    readonly operation: 'write' | 'sync',
    cause: unknown,
    /** Rows this writer had written before the failure. */
    readonly rowsBefore: number,
  ) {
    const code = (cause as NodeJS.ErrnoException)?.code;
    const why = code === 'ENOSPC' ? 'the disk is full' : code === 'EIO' ? 'an I/O error' : code === 'EDQUOT' ? 'the disk quota is used up' : firstLine(cause);
    super(`${file}: ${operation === 'write' ? 'writing' : 'syncing'} the log failed (${code ? `${code}, ` : ''}${why})`);
    this.name = 'LogWriteError';
    this.code = code;
  }
}

function firstLine(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.split('\n')[0];
}
