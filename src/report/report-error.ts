// Report data that does not fit together (a reading naming a node the board lacks, a frequency that is
// no number): one line naming the reading's step and point or the field. Exit code 2.

export class ReportError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'ReportError';
  }
}
