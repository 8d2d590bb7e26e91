// Exit codes shared by every verb (design contract): data problems and instrument problems are told apart.
export const EXIT = {
  ok: 0,
  deviations: 1,
  badInput: 2,
  instrument: 3,
  interrupted: 130,
} as const;

/** A problem with what the user gave us (a flag, a file, a field). Printed as one line, exit 2. */
export class UsageError extends Error {
  readonly exitCode = EXIT.badInput;
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

/** A problem with an instrument or its connection. Printed as one line, exit 3. */
export class InstrumentFailure extends Error {
  readonly exitCode = EXIT.instrument;
  constructor(message: string) {
    super(message);
    this.name = 'InstrumentFailure';
  }
}
