// Which failures a run rides out and how: a late or garbled answer is asked again after a growing pause, a
// setting the instrument refused once is tried again (its error-queue entries become warnings), a dropped
// line is reconnected. Anything else, or the same trouble past the attempts allowed, stops the run.
import { AnswerError, InstrumentError, TransportError } from '../instruments/index.js';

export type Trouble = 'late' | 'garbled' | 'refused' | 'line-lost' | 'fatal';

export interface RetryPolicy {
  /** Attempts after the first for one piece of work (one reading, or entering one step). */
  retries: number;
  /** Reconnection attempts for one dropped line. */
  reconnects: number;
  /** First pause in ms; each further one doubles, up to `maxDelayMs`. */
  baseDelayMs: number;
  maxDelayMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { retries: 3, reconnects: 6, baseDelayMs: 200, maxDelayMs: 8000 };

export function classifyTrouble(error: unknown): Trouble {
  if (error instanceof TransportError) {
    if (error.failure === 'timeout') return 'late';
    if (error.failure === 'garbage') return 'garbled';
    if (error.failure === 'closed') return 'line-lost';
    return 'fatal';
  }
  // A refusal that left entries in the error queue may be a passing complaint; a refusal of the profile's
  // identity or setup has none and is final.
  if (error instanceof InstrumentError && error.entries.length > 0) return 'refused';
  if (error instanceof AnswerError) return 'garbled';
  return 'fatal';
}

/** The pause before attempt `attempt` (1-based): base, 2 x base, 4 x base, ... capped. */
export function backoffMs(policy: RetryPolicy, attempt: number): number {
  return Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** Math.max(0, attempt - 1));
}

export function errorMessage(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  const nl = text.indexOf('\n');
  return nl < 0 ? text : text.slice(0, nl);
}
