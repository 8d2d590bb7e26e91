// The errors the instrument layer throws besides TransportError. Each message is one line; the exit code
// tells bad input (2: a profile limit, an address) from instrument trouble (3: a wrong or refused answer).

import type { ErrorEntry } from './error-queue.js';
import { formatErrorEntries } from './error-queue.js';

/** An answer that does not have the form the command promises. Exit 3. */
export class AnswerError extends Error {
  readonly exitCode = 3;
  constructor(
    readonly command: string,
    readonly answer: string,
    /** What is wrong, as a phrase: "has 1 field, expected 2". */
    readonly problem: string,
    /** The instrument's error queue, drained after the bad answer, when it was. */
    readonly instrumentErrors: ErrorEntry[] = [],
  ) {
    super(`answer to "${command}" ${problem}: ${quoteAnswer(answer)}${errorsSuffix(instrumentErrors)}`);
    this.name = 'AnswerError';
  }

  /** The same error with the drained error queue added to its message. */
  withInstrumentErrors(entries: ErrorEntry[]): AnswerError {
    if (entries.length === 0) return this;
    return new AnswerError(this.command, this.answer, this.problem, entries);
  }
}

/** The instrument reported errors in its queue (a refused command, a setup it did not take). Exit 3. */
export class InstrumentError extends Error {
  readonly exitCode = 3;
  constructor(
    message: string,
    readonly entries: ErrorEntry[] = [],
  ) {
    super(message);
    this.name = 'InstrumentError';
  }
}

/** A setting outside the profile's limits, refused before anything was sent. Exit 2 (the request was bad). */
export class LimitError extends Error {
  readonly exitCode = 2;
  constructor(
    message: string,
    /** The profile field that holds the limit, e.g. "limits.frequency.max". */
    readonly limit: string,
  ) {
    super(message);
    this.name = 'LimitError';
  }
}

/** An instrument address or setting that cannot be used as written. Exit 2. */
export class InstrumentSettingError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'InstrumentSettingError';
  }
}

/** Quotes an answer for a message: JSON escapes show control bytes; long answers are cut. */
export function quoteAnswer(answer: string, max = 80): string {
  const cut = answer.length > max ? `${answer.slice(0, max)}...` : answer;
  return JSON.stringify(cut);
}

function errorsSuffix(entries: ErrorEntry[]): string {
  return entries.length > 0 ? ` (instrument error queue: ${formatErrorEntries(entries)})` : '';
}
