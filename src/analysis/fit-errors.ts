// Problems with what the user asked the fit to do: a parameter set that names no part or overlaps another,
// readings that do not fit the board, options out of range. One line naming the field or the reading;
// exit code 2 (bad input), like every other input problem of topoprobe.

export class FitError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message.replace(/\s*\r?\n\s*/g, ' ').trim());
    this.name = 'FitError';
  }
}
