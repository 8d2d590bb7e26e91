// A record of everything said to and by an instrument, for finding out afterwards what happened at 3 a.m.
// One line per message: ISO time, ">" sent, "<" received, "!" an event. Each line goes straight to the
// file with a synchronous write, so a crash loses nothing that was already said.

import { closeSync, openSync, writeSync } from 'node:fs';
import { InstrumentSettingError } from './instrument-errors.js';

export class TrafficTrace {
  private fd?: number;

  /**
   * Opens (appends to) `file`; a file that cannot be opened is a one-line error naming it. A write that
   * fails later (disk full) stops the trace and calls `onFailure` instead of stopping the measurement.
   */
  constructor(
    readonly file: string,
    private readonly onFailure: (reason: string) => void = () => undefined,
    private readonly now: () => Date = () => new Date(),
  ) {
    try {
      this.fd = openSync(file, 'a');
    } catch (error) {
      const code = (error as NodeJS.ErrnoException).code;
      const why = code === 'ENOENT' ? 'its folder does not exist' : code === 'EACCES' ? 'permission denied' : (error as Error).message;
      throw new InstrumentSettingError(`trace file ${file}: cannot open it (${why})`);
    }
  }

  sent(message: string): void {
    this.line('>', message);
  }

  received(message: string): void {
    this.line('<', message);
  }

  event(text: string): void {
    this.line('!', text);
  }

  close(): void {
    if (this.fd === undefined) return;
    closeSync(this.fd);
    this.fd = undefined;
  }

  private line(mark: string, text: string): void {
    if (this.fd === undefined) return;
    try {
      writeSync(this.fd, `${this.now().toISOString()} ${mark} ${visible(text)}\n`);
    } catch (error) {
      const fd = this.fd;
      this.fd = undefined;
      try {
        closeSync(fd);
      } catch {
        // already unusable
      }
      this.onFailure(`trace file ${this.file}: writing failed (${(error as Error).message}); tracing stopped, the session goes on`);
    }
  }
}

/** Control and non-ASCII bytes (and the backslash itself) as \xNN: a garbled answer shows what arrived, on one line. */
export function visible(text: string): string {
  return text.replace(/[^\x20-\x5b\x5d-\x7e]/g, (c) => `\\x${c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')}`);
}
