// What both drivers do the same way: check the instrument is the one the profile describes, send its
// setup, and read the error queue after a setting when the profile asks for it.

import { formatErrorEntries } from './error-queue.js';
import type { Identity } from './identity.js';
import { AnswerError, InstrumentError } from './instrument-errors.js';
import { matchesIdentity } from './profile.js';
import type { InstrumentProfile } from './profile-types.js';
import type { ScpiSession } from './scpi-session.js';

export interface DriverOptions {
  /** Waits for settling times; tests pass one that records instead of waiting. */
  sleep?: (ms: number) => Promise<void>;
}

export const realSleep = (ms: number): Promise<void> => (ms > 0 ? new Promise((resolve) => setTimeout(resolve, ms)) : Promise.resolve());

/** *IDN? must match the profile; then the setup commands, after which the error queue must be empty. */
export async function startInstrument(profile: InstrumentProfile, session: ScpiSession): Promise<Identity> {
  const identity = await session.identify();
  if (!matchesIdentity(profile, identity)) {
    throw new InstrumentError(
      `${session.endpoint}: the instrument answers *IDN? with ${JSON.stringify(identity.raw)}, which does not match the identity /${profile.identity.source}/ of profile ${profile.name} (${profile.file})`,
    );
  }
  const errors = await session.configure(profile.setup);
  if (errors.length > 0) {
    throw new InstrumentError(`${session.endpoint}: the setup of profile ${profile.name} left errors: ${formatErrorEntries(errors)}`, errors);
  }
  return identity;
}

/** Sends a setting and, when the profile checks every command, fails on what the error queue then holds. */
export async function sendSetting(profile: InstrumentProfile, session: ScpiSession, command: string): Promise<void> {
  await session.write(command);
  if (profile.errors.check !== 'every-command') return;
  const errors = await session.drainErrors();
  if (errors.length > 0) throw new InstrumentError(`${session.endpoint}: ${JSON.stringify(command)} was refused: ${formatErrorEntries(errors)}`, errors);
}

/** Runs a query and reads its answer; a malformed answer is reported with the drained error queue. */
export async function askAndRead<T>(session: ScpiSession, command: string, timeoutMs: number, read: (answer: string) => T): Promise<T> {
  const answer = await session.query(command, { timeoutMs });
  try {
    return read(answer);
  } catch (error) {
    if (!(error instanceof AnswerError)) throw error;
    const entries = await session.drainErrors().catch(() => []);
    throw error.withInstrumentErrors(entries);
  }
}
