// The error/event queue of SCPI-99 (vol. 2, 21.8 (from memory)): first in, first out, bounded. When it is
// full, the newest entry is replaced by -350 Queue overflow and later errors are discarded, so the oldest
// ones, usually the cause, survive.

import { standardText } from './error-codes.js';

export interface QueuedError {
  code: number;
  /** Standard text, then "; " and the device-dependent detail when there is one. */
  text: string;
}

/** SCPI-99 caps the whole error string at 255 characters (from memory). */
const MAX_TEXT = 255;

export class ErrorQueue {
  private readonly entries: QueuedError[] = [];

  constructor(readonly capacity = 16) {
    if (!Number.isInteger(capacity) || capacity < 2) throw new RangeError(`error queue capacity must be an integer of at least 2, got ${capacity}`);
  }

  /** Queues an entry; says whether it went in, overflowed the queue just now, or was discarded. */
  push(code: number, detail?: string): 'queued' | 'overflow' | 'discarded' {
    if (this.entries.length < this.capacity) {
      this.entries.push({ code, text: composeText(code, detail) });
      return 'queued';
    }
    const last = this.entries.length - 1;
    if (this.entries[last].code === -350) return 'discarded';
    this.entries[last] = { code: -350, text: standardText(-350) };
    return 'overflow';
  }

  /** Removes and returns the oldest entry; 0,"No error" when empty. */
  next(): QueuedError {
    return this.entries.shift() ?? { code: 0, text: standardText(0) };
  }

  get length(): number {
    return this.entries.length;
  }

  clear(): void {
    this.entries.length = 0;
  }
}

/** The SYSTem:ERRor? answer: `<code>,"<text>"` with quotes doubled as IEEE 488.2 string data (from memory). */
export function formatQueuedError(entry: QueuedError): string {
  return `${entry.code},"${entry.text.replace(/"/g, '""')}"`;
}

function composeText(code: number, detail: string | undefined): string {
  const text = detail === undefined || detail === '' ? standardText(code) : `${standardText(code)}; ${printable(detail)}`;
  return text.length <= MAX_TEXT ? text : `${text.slice(0, MAX_TEXT - 3)}...`;
}

/** Responses are 7-bit ASCII (IEEE 488.2): anything else in echoed input, a line feed above all, becomes "?". */
function printable(text: string): string {
  return text.replace(/[^\x20-\x7e]/g, '?');
}
