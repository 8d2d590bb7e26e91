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

/** The part of a fit spec a problem lies in, so that a caller can name its own word for it (a flag). */
export type FitSpecField = 'capacitanceScale' | 'inductanceScale' | 'inductorResistance' | 'parts';

/**
 * A problem with one field of the fit spec: "fit spec: <subject><rest>", where subject names the field
 * (parts[2], inductorResistance.atHz) and rest says what is wrong with it.
 */
export class FitSpecError extends FitError {
  constructor(
    readonly field: FitSpecField,
    readonly subject: string,
    readonly rest: string,
  ) {
    super(`fit spec: ${subject}${rest}`);
    this.name = 'FitSpecError';
  }
}
