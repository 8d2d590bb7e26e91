// Two transports joined back to back in the same process: what one writes, the other receives. For unit
// tests and for serving a simulated instrument without a socket. Delivery is asynchronous, as on a real
// line, and can be cut into small chunks to exercise answer reassembly.

import { TransportError, type Transport } from '../transport.js';

export interface MemoryPairOptions {
  /** Endpoint names of the two ends; default "memory:a" and "memory:b". */
  names?: [string, string];
  /** Deliver writes in pieces of at most this many bytes (default: whole writes). */
  chunkSize?: number;
}

export const MEMORY_PEER_CLOSED = 'closed by peer: the other end closed';

class MemoryEnd implements Transport {
  readonly medium = 'memory' as const;
  peer!: MemoryEnd;
  private opened = false;
  /** Counts opens, so a close notice meant for an earlier connection does not end a newer one. */
  private generation = 0;
  private receiver?: (chunk: Uint8Array) => void;
  private closeListener?: (reason: string) => void;

  constructor(
    readonly endpoint: string,
    private readonly chunkSize: number | undefined,
  ) {}

  get isOpen(): boolean {
    return this.opened;
  }

  async open(): Promise<void> {
    if (this.opened) return;
    this.opened = true;
    this.generation++;
  }

  async write(data: Uint8Array | string): Promise<void> {
    if (!this.opened) throw new TransportError(this.endpoint, 'closed', 'not open');
    const bytes = typeof data === 'string' ? Buffer.from(data, 'latin1') : Uint8Array.from(data);
    const size = this.chunkSize ?? Math.max(bytes.length, 1);
    for (let at = 0; at < bytes.length; at += size) {
      const piece = bytes.subarray(at, at + size);
      // Bytes sent to an end nobody has open are lost, as on a line with nothing listening.
      setImmediate(() => this.peer.deliver(piece));
    }
  }

  onData(receiver: (chunk: Uint8Array) => void): void {
    this.receiver = receiver;
  }

  onClose(listener: (reason: string) => void): void {
    this.closeListener = listener;
  }

  async close(): Promise<void> {
    if (!this.opened) return;
    this.opened = false;
    const peerGeneration = this.peer.generation;
    setImmediate(() => this.peer.peerClosed(peerGeneration));
  }

  private deliver(piece: Uint8Array): void {
    if (this.opened) this.receiver?.(piece);
  }

  private peerClosed(generation: number): void {
    if (!this.opened || generation !== this.generation) return;
    this.opened = false;
    this.closeListener?.(MEMORY_PEER_CLOSED);
  }
}

/** Two connected transports; open each end before use. Closing one end closes the other "by peer". */
export function memoryPair(options: MemoryPairOptions = {}): [Transport, Transport] {
  const [nameA, nameB] = options.names ?? ['memory:a', 'memory:b'];
  const a = new MemoryEnd(nameA, options.chunkSize);
  const b = new MemoryEnd(nameB, options.chunkSize);
  a.peer = b;
  b.peer = a;
  return [a, b];
}
