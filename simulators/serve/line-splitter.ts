// Splits a byte stream into program messages at LF, CR or CRLF (an instrument accepts any of them).
// Pure and incremental: feed chunks, get the complete lines; a partial line waits for the next chunk.

export class LineSplitter {
  private pending = '';
  private lastWasCr = false;

  /** Returns the complete lines in this chunk, without terminators. */
  push(chunk: string): string[] {
    const lines: string[] = [];
    for (const ch of chunk) {
      if (ch === '\n') {
        if (this.lastWasCr) {
          this.lastWasCr = false; // the LF of a CRLF: its line was already emitted at the CR
          continue;
        }
        lines.push(this.pending);
        this.pending = '';
      } else if (ch === '\r') {
        lines.push(this.pending);
        this.pending = '';
        this.lastWasCr = true;
        continue;
      } else {
        this.pending += ch;
      }
      this.lastWasCr = false;
    }
    return lines;
  }

  /** What is buffered without a terminator yet. */
  get partial(): string {
    return this.pending;
  }
}
