// Bad input to the diagnosis (a reading that names no node of the board, a value that is no number, an
// option out of range): one line naming the reading's step and point, or the option. Exit code 2.

export class DiagnoseError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'DiagnoseError';
  }
}
