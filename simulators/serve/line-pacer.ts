// A serial line's speed for a pseudo-terminal, which has none: bytes cross at `baud / bitsPerByte` bytes
// per second (10 bits a byte for 8N1: start bit, eight data bits, stop bit; common practice), one chunk
// after another, and are handed on only when their last byte would have arrived. Timers alone are too
// coarse for 20-byte messages at 115200 baud (1.7 ms), so the last stretch is waited out with setImmediate.
export class LinePacer {
  private freeAt = 0;
  private readonly queue: { at: number; deliver: () => void }[] = [];
  private waiting = false;

  constructor(
    readonly baud: number,
    readonly bitsPerByte = 10,
  ) {
    if (!(baud > 0) || !Number.isFinite(baud)) throw new RangeError(`line pacer: baud must be a positive number, got ${baud}`);
  }

  /** Milliseconds `bytes` take on the line. */
  durationMs(bytes: number): number {
    return (bytes * this.bitsPerByte * 1000) / this.baud;
  }

  /** Calls `deliver` once `bytes` have crossed the line after everything sent before them. */
  send(bytes: number, deliver: () => void): void {
    const start = Math.max(performance.now(), this.freeAt);
    this.freeAt = start + this.durationMs(bytes);
    this.queue.push({ at: this.freeAt, deliver });
    if (!this.waiting) this.wait();
  }

  private wait(): void {
    const head = this.queue[0];
    if (!head) {
      this.waiting = false;
      return;
    }
    this.waiting = true;
    const left = head.at - performance.now();
    if (left > 2) {
      setTimeout(() => this.wait(), left - 1.5);
      return;
    }
    if (left > 0) {
      setImmediate(() => this.wait());
      return;
    }
    this.queue.shift();
    head.deliver();
    this.wait();
  }
}
