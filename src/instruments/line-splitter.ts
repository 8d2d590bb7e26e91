// Cuts a byte stream into response lines at one terminator. serialport's own parsers are streams bound to
// a port; this one is a pure function plus a tiny holder of the unfinished tail, so it works the same over
// serial, TCP and the in-process pair. Bytes are kept one to one as latin1 characters, so a wrong baud
// rate's stray high bytes survive to be recognised, not turned into U+FFFD.

export interface Split {
  lines: string[];
  /** Text after the last terminator: the start of a line still arriving. */
  rest: string;
}

/** Splits `text` at every `terminator`; the text after the last one is the rest. */
export function splitLines(text: string, terminator: string): Split {
  const parts = text.split(terminator);
  const rest = parts.pop() as string;
  return { lines: parts, rest };
}

/** Holds the unfinished line between chunks. */
export class LineSplitter {
  private tail = '';

  constructor(private readonly terminator: string) {}

  /** The complete lines this chunk finishes, without their terminators. */
  push(chunk: Uint8Array | string): string[] {
    const text = typeof chunk === 'string' ? chunk : Buffer.from(chunk.buffer, chunk.byteOffset, chunk.byteLength).toString('latin1');
    const { lines, rest } = splitLines(this.tail + text, this.terminator);
    this.tail = rest;
    return lines;
  }

  /** What has arrived since the last terminator. */
  get pending(): string {
    return this.tail;
  }

  clear(): void {
    this.tail = '';
  }
}
