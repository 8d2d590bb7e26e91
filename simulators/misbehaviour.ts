// Deterministic misbehaviour of an instrument or its link, for reliability tests: the same seed and the same
// messages give the same trouble every run. A server (TCP, pty) asks `decide(message)` for each program
// message and carries the decision out; `withMisbehaviour` does the same for in-process use.
//
// Late answers, dropped answers and garbage only touch messages that contain a query (nothing else is
// answered). Spurious errors, the disconnect and the reboot count every message.

import { seededUniform } from '../src/numeric/seeded-uniform.js';
import { z } from 'zod';
import type { SimulatedDevice } from './device.js';
import { containsQuery, lexMessage } from './scpi/lexer.js';
import { delay } from './scpi/delay.js';

const rate = z.number().min(0).max(1);
const optionsSchema = z
  .object({
    seed: z.number().int(),
    /** Messages at the start of every connection left alone, so that a client can identify the instrument. */
    spare: z.number().int().min(0).optional(),
    /** Answers held back by `delayMs` (make it longer than the client's timeout). */
    late: z.object({ rate, delayMs: z.number().min(0) }).strict().optional(),
    /** Queries whose answer is silently dropped. */
    drop: z.object({ rate }).strict().optional(),
    /** Answers replaced by, or prefixed with, `bytes` bytes of non-ASCII junk (0x80..0xFF). */
    garbage: z.object({ rate, mode: z.enum(['replace', 'prefix']), bytes: z.number().int().min(1).max(4096).optional() }).strict().optional(),
    /** The link is dropped after this many messages (counted again from the next connection). */
    disconnectAfter: z.number().int().min(1).optional(),
    /** The instrument reboots after this many messages: its identity changes, everything resets, the link drops. */
    rebootAfter: z.number().int().min(1).optional(),
    /** Every `every`-th message queues an error (default -200 Execution error) before it executes. */
    spuriousError: z
      .object({ every: z.number().int().min(1), code: z.number().int().optional(), detail: z.string().optional() })
      .strict()
      .optional(),
  })
  .strict();

export type MisbehaviourOptions = z.infer<typeof optionsSchema>;

export interface LinkDecision {
  /** 1-based count of the message on this connection. */
  index: number;
  /** Extra time before the answer is written, ms. */
  delayMs: number;
  /** Swallow the answer. */
  drop: boolean;
  /** Junk to put in place of, or in front of, the answer. */
  corrupt?: { mode: 'replace' | 'prefix'; junk: Uint8Array };
  /** Drop the connection once this message is handled (its answer, if any, written first). */
  disconnectAfter: boolean;
  /** Reboot the device once this message is handled (new identity, reset), then drop the connection. */
  reboot: boolean;
  /** Queue this on the device (`injectError`) before the message executes. */
  injectError?: { code: number; detail: string };
}

/** One line naming the option that is wrong (exit code 2 where it comes from a user). */
export class MisbehaviourOptionsError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'MisbehaviourOptionsError';
  }
}

export class Misbehaviour {
  readonly options: MisbehaviourOptions;
  private readonly random: () => number;
  private index = 0;
  private rebooted = false;

  constructor(options: MisbehaviourOptions) {
    const parsed = optionsSchema.safeParse(options);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      const where = issue.path.length > 0 ? `misbehaviour option ${issue.path.join('.')}` : 'misbehaviour options';
      throw new MisbehaviourOptionsError(`${where}: ${issue.message}`);
    }
    this.options = parsed.data;
    // A seeded generator: reproducible from the seed alone.
    this.random = seededUniform(String(this.options.seed));
  }

  /** The next connection starts: the per-connection count (spare messages, disconnect) begins again. */
  newConnection(): void {
    this.index = 0;
  }

  decide(message: string): LinkDecision {
    const o = this.options;
    this.index++;
    const index = this.index;
    // Always the same number of draws per message, so one kind of trouble never shifts another's pattern.
    const junkLength = o.garbage?.bytes ?? 8;
    const draws = { late: this.random(), drop: this.random(), garbage: this.random(), junk: Array.from({ length: junkLength }, () => this.random()) };
    const spared = index <= (o.spare ?? 0);
    const answered = containsQuery(lexMessage(message));
    const decision: LinkDecision = { index, delayMs: 0, drop: false, disconnectAfter: false, reboot: false };
    if (!spared && answered) {
      if (o.late && draws.late < o.late.rate) decision.delayMs = o.late.delayMs;
      if (o.drop && draws.drop < o.drop.rate) decision.drop = true;
      if (o.garbage && draws.garbage < o.garbage.rate) {
        decision.corrupt = { mode: o.garbage.mode, junk: Uint8Array.from(draws.junk, (u) => 0x80 + Math.floor(u * 0x80)) };
      }
    }
    if (!spared && o.spuriousError && index % o.spuriousError.every === 0) {
      decision.injectError = { code: o.spuriousError.code ?? -200, detail: o.spuriousError.detail ?? `injected on message ${index}` };
    }
    if (o.disconnectAfter !== undefined && index >= o.disconnectAfter) {
      decision.disconnectAfter = true;
      this.index = 0;
    }
    // Once only: an instrument that rebooted comes back and stays up.
    if (o.rebootAfter !== undefined && !this.rebooted && index >= o.rebootAfter) {
      decision.reboot = decision.disconnectAfter = true;
      this.rebooted = true;
      this.index = 0;
    }
    return decision;
  }
}

/** The bytes to write for an answer under a decision (without the terminator). */
export function answerBytes(answer: string, corrupt: LinkDecision['corrupt']): Uint8Array {
  const clean = Buffer.from(answer, 'latin1');
  if (corrupt === undefined) return new Uint8Array(clean);
  if (corrupt.mode === 'replace') return new Uint8Array(corrupt.junk);
  return new Uint8Array(Buffer.concat([Buffer.from(corrupt.junk), clean]));
}

export interface MisbehaviourEvents {
  /** The link should be dropped now (called before the message's answer is returned). */
  onDisconnect?(decision: LinkDecision): void;
  /** Every decision, for logs and tests. */
  onDecision?(decision: LinkDecision, message: string): void;
}

/**
 * An in-process device that misbehaves like its link would. Junk comes back as a string of the characters
 * U+0080..U+00FF, one per junk byte (encode it as latin1 to get the bytes).
 */
export function withMisbehaviour(device: SimulatedDevice, misbehaviour: Misbehaviour, events: MisbehaviourEvents = {}): SimulatedDevice {
  return {
    get identity() {
      return device.identity;
    },
    async receive(message: string): Promise<string | undefined> {
      const decision = misbehaviour.decide(message);
      events.onDecision?.(decision, message);
      if (decision.injectError) device.injectError?.(decision.injectError.code, decision.injectError.detail);
      const answer = await device.receive(message);
      if (decision.reboot) (device.reboot ?? device.reset).call(device);
      if (decision.disconnectAfter) events.onDisconnect?.(decision);
      if (answer === undefined || decision.drop) return undefined;
      await delay(decision.delayMs);
      return decision.corrupt === undefined ? answer : Buffer.from(answerBytes(answer, decision.corrupt)).toString('latin1');
    },
    reset(): void {
      device.reset();
    },
    reboot(): void {
      (device.reboot ?? device.reset).call(device);
    },
    injectError(code: number, detail?: string): void {
      device.injectError?.(code, detail);
    },
    unterminatedQuery(fragment: string): void {
      device.unterminatedQuery?.(fragment);
    },
  };
}
