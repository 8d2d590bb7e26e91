// Handlers signal a failed command by throwing this; the device turns it into an error-queue entry.
// It never leaves the device: `receive` catches every throw.

import type { ScpiErrorCode } from './error-codes.js';

export class ScpiError extends Error {
  constructor(
    readonly code: ScpiErrorCode,
    /** Device-dependent information appended to the standard text, e.g. the command as typed. */
    readonly detail?: string,
  ) {
    super(detail === undefined ? String(code) : `${code}: ${detail}`);
    this.name = 'ScpiError';
  }
}
