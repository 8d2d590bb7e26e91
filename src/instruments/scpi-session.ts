// A conversation with one SCPI instrument over any Transport: program messages out, response lines in,
// one query outstanding at a time, a timeout on every command, the IEEE 488.2 common commands, and the
// error queue drained after configuration and after any answer that arrived unasked. Everything said
// can go to a trace file.
//
// Commands queue up in the order they were issued; each waits for the one before it to finish, so an
// answer always belongs to the query that is waiting, and a late answer after a timeout is found and set
// aside (by asking *IDN? and skipping to its answer) instead of being taken for the next one.

import { TransportError, type Transport } from './transport.js';
import { LineSplitter } from './line-splitter.js';
import { TERMINATOR_TEXT, terminatorName, type Terminator } from './terminators.js';
import { badAnswerBytes, garbageHint } from './answer-bytes.js';
import { TrafficTrace } from './traffic-trace.js';
import { formatErrorEntry, parseErrorEntry, type ErrorEntry } from './error-queue.js';
import { looksLikeIdentity, parseIdentity, type Identity } from './identity.js';
import { AnswerError, InstrumentError, InstrumentSettingError, quoteAnswer } from './instrument-errors.js';
import { readInteger } from './answers.js';

export interface SessionOptions {
  /** Appended to every program message; default LF. */
  writeTerminator?: Terminator;
  /** Ends every response message; default LF. */
  readTerminator?: Terminator;
  /** Time allowed for each answer (and each write) unless a command says otherwise; default 2000 ms. */
  timeoutMs?: number;
  /** Append a timestamped record of all traffic to this file. */
  traceFile?: string;
  /** The query that reads one error queue entry; default SYSTem:ERRor? (SCPI-99). */
  errorQuery?: string;
  /** Most entries read in one drain, against a queue that never empties; default 64. */
  errorDrainLimit?: number;
  /** Longest answer accepted, in bytes, before the line is called runaway; default 1 MiB. */
  maxAnswerBytes?: number;
}

export interface QueryOptions {
  timeoutMs?: number;
}

/** Things a caller should know that are not the answer to anything it asked. */
export type SessionNotice =
  /** Lines arrived when no query was waiting; the error queue was drained right after. */
  | { kind: 'unexpected-answer'; lines: string[]; errors: ErrorEntry[] }
  /** After a timeout or a garbled answer the session found its place again, skipping these lines. */
  | { kind: 'resynchronized'; discarded: string[]; errors: ErrorEntry[] }
  /** The trace file could not be written any more; the conversation itself goes on. */
  | { kind: 'trace-failed'; reason: string };

interface Waiter {
  command: string;
  resolve(line: string): void;
  reject(error: Error): void;
  cancel(): void;
}

const IDENTIFY = '*IDN?';
/** Lines skipped at most while finding our place again. */
const RESYNC_LINE_LIMIT = 64;

export class ScpiSession {
  readonly endpoint: string;
  readonly timeoutMs: number;
  readonly writeTerminator: Terminator;
  readonly readTerminator: Terminator;
  private readonly errorQuery: string;
  private readonly errorDrainLimit: number;
  private readonly maxAnswerBytes: number;
  private readonly splitter: LineSplitter;
  private trace?: TrafficTrace;
  private waiter?: Waiter;
  private chain: Promise<unknown> = Promise.resolve();
  private lost?: TransportError;
  private strays: string[] = [];
  /** Set after a timeout or garbled answer: the time to allow when finding our place again. */
  private outOfStep?: number;
  private knownIdentity?: string;
  private readonly listeners = new Set<(notice: SessionNotice) => void>();

  constructor(
    readonly transport: Transport,
    private readonly options: SessionOptions = {},
  ) {
    this.endpoint = transport.endpoint;
    this.timeoutMs = options.timeoutMs ?? 2000;
    this.writeTerminator = options.writeTerminator ?? 'LF';
    this.readTerminator = options.readTerminator ?? 'LF';
    this.errorQuery = options.errorQuery ?? 'SYSTem:ERRor?';
    this.errorDrainLimit = options.errorDrainLimit ?? 64;
    this.maxAnswerBytes = options.maxAnswerBytes ?? 1 << 20;
    this.splitter = new LineSplitter(TERMINATOR_TEXT[this.readTerminator]);
    transport.onData((chunk) => this.receive(chunk));
    transport.onClose((reason) => this.connectionLost(reason));
  }

  /** Opens the transport (again, after a close: that is a reconnect) with a clean slate. */
  async open(): Promise<void> {
    if (this.options.traceFile && !this.trace) {
      this.trace = new TrafficTrace(this.options.traceFile, (reason) => this.notify({ kind: 'trace-failed', reason }));
    }
    await this.transport.open();
    this.lost = undefined;
    this.strays = [];
    this.outOfStep = undefined;
    this.splitter.clear();
    this.trace?.event(`opened ${this.endpoint}`);
  }

  /** Closes the connection; a query still waiting fails with "session closed". Safe to call twice. */
  async close(): Promise<void> {
    const closed = new TransportError(this.endpoint, 'closed', 'session closed');
    this.lost ??= closed;
    this.takeWaiter()?.reject(closed);
    await this.transport.close();
    this.trace?.event(`closed ${this.endpoint}`);
    this.trace?.close();
    this.trace = undefined;
  }

  /** Hears about unasked answers and resynchronisations (nothing is dropped silently). */
  onNotice(listener: (notice: SessionNotice) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  /** Sends a program message that expects no answer. */
  write(command: string): Promise<void> {
    return this.enqueue(async () => {
      await this.prepare();
      await this.send(command);
    });
  }

  /** Sends a query and resolves with its response line (without terminator). */
  query(command: string, options: QueryOptions = {}): Promise<string> {
    return this.enqueue(async () => {
      await this.prepare();
      return this.ask(command, options.timeoutMs ?? this.timeoutMs);
    });
  }

  /** Sends each configuration command, then drains the error queue and returns what it held. */
  configure(commands: readonly string[]): Promise<ErrorEntry[]> {
    return this.enqueue(async () => {
      await this.prepare();
      for (const command of commands) await this.send(command);
      return this.drain();
    });
  }

  /** Reads the error queue until it says 0 ("No error"); the entries read, oldest first. */
  drainErrors(): Promise<ErrorEntry[]> {
    return this.enqueue(async () => {
      await this.prepare();
      return this.drain();
    });
  }

  /** *IDN?: maker, model, serial number and firmware. */
  async identify(): Promise<Identity> {
    const identity = parseIdentity(await this.query(IDENTIFY), IDENTIFY);
    this.knownIdentity = identity.raw;
    return identity;
  }

  /** *RST: the instrument's reset state. */
  reset(): Promise<void> {
    return this.write('*RST');
  }

  /** *CLS: clears the status registers and the error queue. */
  clearStatus(): Promise<void> {
    return this.write('*CLS');
  }

  /** *OPC?: resolves when the instrument has finished every operation it was given. */
  async operationComplete(options: QueryOptions = {}): Promise<void> {
    const answer = await this.query('*OPC?', options);
    if (readInteger(answer, '*OPC?') !== 1) throw new AnswerError('*OPC?', answer, 'is not 1');
  }

  // --- the queue -------------------------------------------------------------------------------------

  private enqueue<T>(job: () => Promise<T>): Promise<T> {
    const run = this.chain.then(job);
    this.chain = run.catch(() => undefined);
    return run;
  }

  /** Before every command: fail fast on a lost line, find our place after a timeout, report strays. */
  private async prepare(): Promise<void> {
    if (this.lost) throw this.lost;
    if (!this.transport.isOpen) throw new TransportError(this.endpoint, 'closed', 'not open');
    if (this.outOfStep !== undefined) await this.findPlace();
    if (this.strays.length > 0) {
      const lines = this.strays;
      this.strays = [];
      const errors = await this.drain();
      this.notify({ kind: 'unexpected-answer', lines, errors });
    }
  }

  // --- sending and receiving -------------------------------------------------------------------------

  private async send(command: string): Promise<void> {
    checkSendable(command, this.endpoint);
    this.trace?.sent(command);
    let timer: NodeJS.Timeout | undefined;
    const stuck = new Promise<never>((_, reject) => {
      timer = setTimeout(
        () => reject(new TransportError(this.endpoint, 'timeout', `could not send "${command}" within ${this.timeoutMs} ms (is flow control holding the line?)`)),
        this.timeoutMs,
      );
    });
    try {
      await Promise.race([this.transport.write(command + TERMINATOR_TEXT[this.writeTerminator]), stuck]);
    } catch (error) {
      this.trace?.event(error instanceof Error ? error.message : String(error));
      throw error;
    } finally {
      clearTimeout(timer);
    }
  }

  private async ask(command: string, timeoutMs: number): Promise<string> {
    const answer = this.awaitLine(command, timeoutMs);
    answer.catch(() => undefined); // a failed send below is the error to report, not this one
    try {
      await this.send(command);
    } catch (error) {
      this.takeWaiter()?.cancel();
      throw error;
    }
    return answer;
  }

  /** The next line, for `command`; rejects after `timeoutMs` and marks the session out of step. */
  private awaitLine(command: string, timeoutMs: number): Promise<string> {
    return new Promise<string>((resolve, reject) => {
      const timer = setTimeout(() => {
        if (this.waiter !== waiter) return;
        this.waiter = undefined;
        this.outOfStep = timeoutMs;
        const error = this.silence(command, timeoutMs);
        this.trace?.event(error.message);
        reject(error);
      }, timeoutMs);
      const waiter: Waiter = {
        command,
        resolve: (line) => {
          clearTimeout(timer);
          resolve(line);
        },
        reject: (error) => {
          clearTimeout(timer);
          reject(error);
        },
        cancel: () => clearTimeout(timer),
      };
      this.waiter = waiter;
    });
  }

  private takeWaiter(): Waiter | undefined {
    const waiter = this.waiter;
    this.waiter = undefined;
    return waiter;
  }

  private receive(chunk: Uint8Array): void {
    for (const line of this.splitter.push(chunk)) this.dispatch(line);
    if (this.splitter.pending.length > this.maxAnswerBytes) {
      const pending = this.splitter.pending;
      this.splitter.clear();
      this.outOfStep = this.timeoutMs;
      const waiter = this.takeWaiter();
      const reason = `answer${waiter ? ` to "${waiter.command}"` : ''} runs past ${this.maxAnswerBytes} bytes without a ${terminatorName(this.readTerminator)}: ${quoteAnswer(pending, 40)}`;
      this.trace?.event(reason);
      waiter?.reject(new TransportError(this.endpoint, 'garbage', reason));
    }
  }

  private dispatch(line: string): void {
    this.trace?.received(line);
    const waiter = this.takeWaiter();
    if (!waiter) {
      this.strays.push(line);
      this.trace?.event('unexpected answer: no query was waiting');
      return;
    }
    const bad = badAnswerBytes(line, this.readTerminator);
    if (bad) {
      this.outOfStep = this.timeoutMs;
      waiter.reject(this.garbage(waiter.command, bad));
      return;
    }
    waiter.resolve(line);
  }

  private garbage(command: string, bad: string): TransportError {
    // A terminator mix-up names its own fix; line noise gets the likely cause.
    const hint = bad.includes('terminator') ? '' : `: ${garbageHint(this.transport.medium, this.readTerminator)}`;
    return new TransportError(this.endpoint, 'garbage', `answer to "${command}" ${bad}${hint}`);
  }

  /** The error for a query that got no complete answer in time, saying what did arrive. */
  private silence(command: string, timeoutMs: number): TransportError {
    const pending = this.splitter.pending;
    const base = `no answer to "${command}" within ${timeoutMs} ms`;
    if (pending === '') return new TransportError(this.endpoint, 'timeout', base);
    const bad = badAnswerBytes(pending.replace(/[\r\n]+$/, ''), this.readTerminator);
    if (bad) {
      this.splitter.clear();
      return this.garbage(command, bad);
    }
    const expected = terminatorName(this.readTerminator);
    let guess = 'check the read terminator';
    if (pending.endsWith('\r')) guess = 'the instrument seems to end its answers with CR: set the read terminator to CR';
    else if (pending.endsWith('\n')) guess = 'the instrument seems to end its answers with LF: set the read terminator to LF';
    return new TransportError(this.endpoint, 'timeout', `${base} (received ${quoteAnswer(pending, 40)} but no ${expected} after it: ${guess})`);
  }

  private connectionLost(reason: string): void {
    this.lost = new TransportError(this.endpoint, 'closed', reason);
    this.trace?.event(reason);
    this.takeWaiter()?.reject(this.lost);
  }

  // --- the error queue and finding our place ---------------------------------------------------------

  private async drain(): Promise<ErrorEntry[]> {
    const entries: ErrorEntry[] = [];
    for (let read = 0; read < this.errorDrainLimit; read++) {
      const answer = await this.ask(this.errorQuery, this.timeoutMs);
      const entry = parseErrorEntry(answer);
      if (!entry) throw new AnswerError(this.errorQuery, answer, 'is not an error queue entry <code>,"<message>"');
      if (entry.code === 0) return entries;
      entries.push(entry);
    }
    const last = entries[entries.length - 1];
    throw new InstrumentError(
      `${this.endpoint}: the error queue did not empty after ${this.errorDrainLimit} reads of "${this.errorQuery}" (last: ${formatErrorEntry(last)})`,
      entries,
    );
  }

  /**
   * After a timeout the answer may still come, and would be taken for the next query's. Ask *IDN?, whose
   * answer cannot be mistaken, and skip every line before it; then drain what the instrument complained of.
   */
  private async findPlace(): Promise<void> {
    const allow = Math.max(this.outOfStep ?? 0, this.timeoutMs);
    this.outOfStep = undefined;
    const discarded = [...this.strays];
    this.strays = [];
    this.splitter.clear();
    this.trace?.event(`finding our place again with ${IDENTIFY}`);
    const first = this.awaitLine(IDENTIFY, allow);
    first.catch(() => undefined); // handled in the loop below, or superseded by a failed send
    await this.send(IDENTIFY).catch((error) => {
      this.takeWaiter()?.cancel();
      throw error;
    });
    for (let seen = 0; seen < RESYNC_LINE_LIMIT; seen++) {
      let line: string;
      try {
        line = seen === 0 ? await first : (this.strays.shift() ?? (await this.awaitLine(IDENTIFY, allow)));
      } catch (error) {
        if (error instanceof TransportError && error.failure === 'garbage') {
          discarded.push('(garbled line)');
          continue;
        }
        this.outOfStep = allow;
        throw new TransportError(this.endpoint, 'timeout', `instrument stopped answering: no answer to "${IDENTIFY}" within ${allow} ms after an earlier answer went missing`);
      }
      const found = this.knownIdentity !== undefined ? line === this.knownIdentity : looksLikeIdentity(line);
      if (found) {
        discarded.push(...this.strays);
        this.strays = [];
        const errors = await this.drain();
        this.trace?.event(`in step again; skipped ${discarded.length} line(s)`);
        this.notify({ kind: 'resynchronized', discarded, errors });
        return;
      }
      discarded.push(line);
    }
    this.outOfStep = allow;
    throw new TransportError(this.endpoint, 'garbage', `could not find our place again: ${RESYNC_LINE_LIMIT} lines without the answer to "${IDENTIFY}"`);
  }

  private notify(notice: SessionNotice): void {
    for (const listener of this.listeners) listener(notice);
  }
}

/** A program message must be one line of printable ASCII: anything else would garble the exchange. */
function checkSendable(command: string, endpoint: string): void {
  if (command === '') throw new InstrumentSettingError(`${endpoint}: refusing to send an empty command`);
  const bad = /[^\x20-\x7e]/.exec(command);
  if (bad) {
    throw new InstrumentSettingError(`${endpoint}: command ${JSON.stringify(command)} holds a character that cannot be sent (${JSON.stringify(bad[0])})`);
  }
}
