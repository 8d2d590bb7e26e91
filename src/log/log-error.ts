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
