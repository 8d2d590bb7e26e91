// The message engine both simulated instruments share: executes program messages against a command tree,
// answers the IEEE 488.2 common commands and SYSTem:ERRor?, keeps the error queue and status registers, and
// tracks overlapped operations for *OPC, *OPC? and *WAI.
//
// Message handling (IEEE 488.2 (from memory), with our choices marked):
// - Messages execute one at a time in arrival order; commands in a message execute left to right.
// - A command error (-1xx) ends the message: the rest is not executed (our choice, so that a misspelt setting
//   never lets a later READ? run with the old one). Execution errors (-2xx) do not.
// - Answers to the queries of one message are joined with ";" into one response message.
// - -410 Query INTERRUPTED: when a message arrives while an earlier message that contains a query has not been
//   answered yet (its `receive` promise has not resolved), the earlier answer is discarded (that promise
//   resolves undefined) and -410 is queued. A server that waits for each answer before passing on the next
//   line never sees this; one that passes lines on as they arrive gets the instrument's behaviour.
// - -420 Query UNTERMINATED: the server calls `unterminatedQuery` when the client waits for an answer to bytes
//   that never got a terminator.

import type { SimulatedDevice } from '../device.js';
import { errorClass, type ScpiErrorCode } from './error-codes.js';
import { ErrorQueue, formatQueuedError } from './error-queue.js';
import { buildTree, makeCall, resolveHeader, type CommandSpec, type TreeNode } from './command-tree.js';
import { containsQuery, lexMessage, type LexedMessage, type ProgramUnit } from './lexer.js';
import { nr1 } from './response-format.js';
import { ScpiError } from './scpi-error.js';
import { ESR, StatusRegisters } from './status.js';

export interface InstrumentSpec {
  /** The *IDN? answer: maker, model, serial, firmware (IEEE 488.2 10.14 (from memory)). */
  identity: string;
  commands: readonly CommandSpec[];
  /** *RST: the instrument's settings back to their reset values; pending operations are abandoned. */
  resetSettings(): void;
  /** Power-on (`reset()`); defaults to resetSettings. */
  powerOn?(): void;
}

export interface ScpiDeviceOptions {
  /** Error queue length (SCPI-99 asks for at least 2); default 16. */
  errorQueueSize?: number;
}

/** Hands a handler the means to run an overlapped operation (IEEE 488.2 12.5 (from memory)). */
export interface OperationTracker {
  /** Registers work that continues after the command returns; *OPC?, *WAI and *OPC wait for it. */
  overlap(work: Promise<unknown>): void;
}

interface InFlight {
  message: string;
  owesAnswer: boolean;
  interrupted: boolean;
}

export class ScpiDevice implements SimulatedDevice, OperationTracker {
  private currentIdentity: string;
  private boots = 0;
  private readonly tree: TreeNode;
  private readonly common: TreeNode;
  private readonly errors: ErrorQueue;
  private readonly status = new StatusRegisters();
  private readonly pending = new Set<Promise<unknown>>();
  private readonly inFlight = new Set<InFlight>();
  private chain: Promise<unknown> = Promise.resolve();
  /** Bumped by reset(): work queued before a device clear is dropped. */
  private epoch = 0;
  /** Answers gathered so far in the message being executed (for MAV in *STB?). */
  private answers: string[] = [];

  constructor(
    private readonly spec: InstrumentSpec,
    options: ScpiDeviceOptions = {},
  ) {
    this.currentIdentity = spec.identity;
    this.errors = new ErrorQueue(options.errorQueueSize ?? 16);
    this.tree = buildTree([...this.systemCommands(), ...spec.commands]);
    this.common = buildTree(this.commonCommands());
  }

  receive(message: string): Promise<string | undefined> {
    try {
      const lexed = lexMessage(String(message));
      for (const earlier of this.inFlight) {
        if (!earlier.owesAnswer || earlier.interrupted) continue;
        earlier.interrupted = true;
        this.pushError(-410, `the answer to "${clip(earlier.message)}" was not read before "${clip(message)}" arrived`);
      }
      const entry: InFlight = { message: String(message), owesAnswer: containsQuery(lexed), interrupted: false };
      this.inFlight.add(entry);
      const epoch = this.epoch;
      const run = this.chain.then(() => (epoch === this.epoch ? this.execute(lexed, epoch) : undefined));
      this.chain = run.catch(() => undefined);
      return run.then(
        (answer) => this.settle(entry, epoch, answer),
        (error: unknown) => {
          this.internalFailure(error);
          return this.settle(entry, epoch, undefined);
        },
      );
    } catch (error) {
      this.internalFailure(error);
      return Promise.resolve(undefined);
    }
  }

  get identity(): string {
    return this.currentIdentity;
  }

  /**
   * A power cycle that comes back with other firmware (reliability tests: an instrument that rebooted and
   * updated itself mid-scan). Everything resets as at power-on; *IDN? reports the new firmware field.
   */
  reboot(): void {
    this.boots++;
    const fields = this.spec.identity.split(',');
    fields[3] = `${fields[3]}-boot${this.boots}`;
    this.currentIdentity = fields.join(',');
    this.reset();
  }

  reset(): void {
    this.epoch++;
    this.inFlight.clear();
    this.pending.clear();
    this.errors.clear();
    this.status.powerOn();
    (this.spec.powerOn ?? this.spec.resetSettings).call(this.spec);
  }

  /** Error injection (misbehaviour tests): queues an entry as if a command had failed. */
  injectError(code: number, detail?: string): void {
    this.pushError(code, detail);
  }

  /** The client waits for an answer to `fragment`, which never got its terminator: -420. */
  unterminatedQuery(fragment: string): void {
    this.pushError(-420, `"${clip(fragment)}" has no terminator`);
  }

  overlap(work: Promise<unknown>): void {
    const tracked = work.then(
      () => undefined,
      (error: unknown) => this.internalFailure(error),
    );
    this.pending.add(tracked);
    void tracked.then(() => this.pending.delete(tracked));
  }

  /** Resolves once no overlapped operation is running (those started meanwhile included). */
  async allOperationsDone(): Promise<void> {
    while (this.pending.size > 0) await Promise.all([...this.pending]);
  }

  private settle(entry: InFlight, epoch: number, answer: string | undefined): string | undefined {
    this.inFlight.delete(entry);
    return entry.interrupted || epoch !== this.epoch ? undefined : answer;
  }

  private pushError(code: number, detail?: string): void {
    this.status.noteError(code);
    // -350 is a device-dependent event of its own (SCPI-99 vol. 2, 21.8 (from memory)).
    if (this.errors.push(code, detail) === 'overflow') this.status.noteError(-350);
  }

  private internalFailure(error: unknown): void {
    const text = error instanceof Error ? error.message : String(error);
    this.pushError(-300, `internal: ${text}`);
  }

  private async execute(lexed: LexedMessage, epoch: number): Promise<string | undefined> {
    this.answers = [];
    const answers = this.answers;
    let path = this.tree;
    for (const unit of lexed.units) {
      // A device clear in the middle of a message ends it.
      if (epoch !== this.epoch) return undefined;
      const outcome = await this.executeUnit(unit, path, answers);
      if (outcome === 'stop') return joined(answers);
      path = outcome;
    }
    if (lexed.failure) this.pushError(lexed.failure.code, lexed.failure.detail);
    return joined(answers);
  }

  /** Runs one command; returns the path for the next one, or 'stop' after a command error. */
  private async executeUnit(unit: ProgramUnit, path: TreeNode, answers: string[]): Promise<TreeNode | 'stop'> {
    const { header } = unit;
    // Common commands leave the path alone (SCPI-99 vol. 1, 6.2.4 (from memory)).
    let nextPath = path;
    try {
      const resolved = resolveHeader(header.common ? this.common : this.tree, header.common ? this.common : path, header);
      if (!header.common) nextPath = resolved.nextPath;
      const handler = header.query ? resolved.node.query : resolved.node.set;
      if (handler === undefined) throw new ScpiError(-100, `${header.text}: ${header.query ? 'has no query form' : 'is a query only; add "?"'}`);
      const call = makeCall(header, handler, resolved.suffixes, unit.data);
      const result = await handler.run(call);
      if (header.query && typeof result === 'string') answers.push(result);
      return nextPath;
    } catch (error) {
      if (!(error instanceof ScpiError)) {
        this.internalFailure(error);
        return 'stop';
      }
      this.pushError(error.code, error.detail);
      return errorClass(error.code) === 'command' ? 'stop' : nextPath;
    }
  }

  /** SCPI-99 vol. 2, 21 (from memory): the SYSTem commands every SCPI instrument has. */
  private systemCommands(): CommandSpec[] {
    return [
      { header: 'SYSTem:ERRor[:NEXT]', query: { run: () => formatQueuedError(this.errors.next()) } },
      { header: 'SYSTem:ERRor:COUNt', query: { run: () => nr1(this.errors.length) } },
      { header: 'SYSTem:VERSion', query: { run: () => '1999.0' } },
    ];
  }

  /** The IEEE 488.2 mandatory common commands (10.x (from memory)). */
  private commonCommands(): CommandSpec[] {
    const mask = (name: string) => [{ kind: 'numeric' as const, name, min: 0, max: 255, default: 0, integer: true }];
    return [
      { header: 'IDN', query: { run: () => this.identity } },
      {
        header: 'RST',
        set: {
          run: () => {
            this.pending.clear();
            this.spec.resetSettings();
          },
        },
      },
      {
        header: 'CLS',
        set: {
          run: () => {
            this.errors.clear();
            this.status.readEsr();
          },
        },
      },
      {
        header: 'OPC',
        set: {
          run: () => {
            const epoch = this.epoch;
            void this.allOperationsDone().then(() => {
              if (epoch === this.epoch) this.status.esr |= ESR.operationComplete;
            });
          },
        },
        query: {
          run: async () => {
            await this.allOperationsDone();
            return '1';
          },
        },
      },
      { header: 'WAI', set: { run: () => this.allOperationsDone() } },
      { header: 'ESR', query: { run: () => nr1(this.status.readEsr()) } },
      {
        header: 'ESE',
        set: { params: mask('the event status enable mask'), run: (c) => void (this.status.ese = c.number(0)) },
        query: { run: () => nr1(this.status.ese) },
      },
      {
        header: 'SRE',
        // Bit 6 (MSS) cannot be enabled (IEEE 488.2 11.3.2 (from memory)).
        set: { params: mask('the service request enable mask'), run: (c) => void (this.status.sre = c.number(0) & ~0x40) },
        query: { run: () => nr1(this.status.sre) },
      },
      { header: 'STB', query: { run: () => nr1(this.status.statusByte(this.errors.length > 0, this.answers.length > 0)) } },
      { header: 'TST', query: { run: () => '0' } },
    ];
  }
}

function joined(answers: string[]): string | undefined {
  return answers.length > 0 ? answers.join(';') : undefined;
}

function clip(text: string): string {
  return text.length > 40 ? `${text.slice(0, 40)}...` : text;
}

export type { ScpiErrorCode };
