// A tiny instrument written for the tests: it sits on the far end of a memoryPair, cuts what it hears
// into program messages at its own terminator, records them, and answers through a handler. It keeps an
// IEEE 488.2 style error queue for SYSTem:ERRor? so the session's draining can be checked.
import { memoryPair, type MemoryPairOptions } from '../../../src/instruments/transports/memory-pair.js';
import type { Transport } from '../../../src/instruments/transport.js';

export type Handler = (message: string, device: FakeDevice) => string | undefined | Promise<string | undefined>;

export interface FakeDeviceOptions {
  /** What ends the messages it reads; default "\n". */
  readTerminator?: string;
  /** What it puts after its answers; default "\n". */
  writeTerminator?: string;
  pair?: MemoryPairOptions;
  /** Answer SYSTem:ERRor? from `errors` (default true); false leaves it to the handler. */
  errorQueue?: boolean;
}

export class FakeDevice {
  /** Every program message received, in order. */
  readonly heard: string[] = [];
  /** SCPI error queue: entries "<code>,\"<message>\"". */
  readonly errors: string[] = [];
  /** Set when a message arrived while the answer to an earlier query was still being prepared. */
  overlapped = false;
  private busy = false;
  private buffer = '';

  constructor(
    readonly end: Transport,
    private readonly handler: Handler,
    private readonly options: FakeDeviceOptions,
  ) {
    end.onData((chunk) => this.hear(Buffer.from(chunk).toString('latin1')));
  }

  /** Sends raw text to the session, as an instrument speaking out of turn. */
  say(text: string): Promise<void> {
    return this.end.write(text);
  }

  answerText(answer: string): string {
    return answer + (this.options.writeTerminator ?? '\n');
  }

  private hear(text: string): void {
    this.buffer += text;
    const terminator = this.options.readTerminator ?? '\n';
    let at: number;
    while ((at = this.buffer.indexOf(terminator)) >= 0) {
      const message = this.buffer.slice(0, at);
      this.buffer = this.buffer.slice(at + terminator.length);
      void this.handle(message);
    }
  }

  private async handle(message: string): Promise<void> {
    this.heard.push(message);
    if (this.busy) this.overlapped = true;
    this.busy = true;
    try {
      let answer: string | undefined;
      if (this.options.errorQueue !== false && /^SYST(em)?:ERR(or)?(:NEXT)?\?$/i.test(message)) answer = this.errors.shift() ?? '0,"No error"';
      else answer = await this.handler(message, this);
      if (answer !== undefined) await this.end.write(this.answerText(answer));
    } finally {
      this.busy = false;
    }
  }
}

/** A session-side transport and a fake device on the other end, both open. */
export async function deviceOnPair(handler: Handler, options: FakeDeviceOptions = {}): Promise<{ transport: Transport; device: FakeDevice }> {
  const [near, far] = memoryPair({ names: ['memory:bench', 'memory:device'], ...options.pair });
  await far.open();
  const device = new FakeDevice(far, handler, options);
  return { transport: near, device };
}

/** Answers like our simulated analyzer: a fixed identity and a few queries. */
export const IDENTITY = 'Topoprobe Lab,SIM-ZA100,ZA-0042,1.3.0';

export function simpleHandler(answers: Record<string, string> = {}): Handler {
  return (message) => {
    if (message === '*IDN?') return IDENTITY;
    if (message === '*OPC?') return '1';
    if (message in answers) return answers[message];
    return message.includes('?') ? '0' : undefined;
  };
}
