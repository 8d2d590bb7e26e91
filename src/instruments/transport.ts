// The narrow byte interface every instrument connection sits behind (serial port, TCP socket, in-process
// pair). The SCPI session above it knows nothing of which one it has.

export interface Transport {
  /** Human-readable endpoint for messages: "/dev/ttyUSB0", "127.0.0.1:5025", "memory:analyzer". */
  readonly endpoint: string;
  /** Opens the connection; rejects with a TransportError naming the endpoint and the reason. */
  open(): Promise<void>;
  /** Writes bytes; rejects with a TransportError if the connection is gone. */
  write(data: Uint8Array | string): Promise<void>;
  /** Registers the receiver of incoming bytes (one receiver; a later call replaces it). */
  onData(receiver: (chunk: Uint8Array) => void): void;
  /** Registers a listener for an unexpected close (cable pulled, peer gone). */
  onClose(listener: (reason: string) => void): void;
  /** Closes the connection; safe to call twice. */
  close(): Promise<void>;
  readonly isOpen: boolean;
  /** What carries the bytes; lets messages give the hint that fits (baud rate for serial, port for TCP). */
  readonly medium?: TransportMedium;
}

export type TransportMedium = 'serial' | 'tcp' | 'memory';

export type TransportFailure = 'no-such-port' | 'permission-denied' | 'port-busy' | 'refused' | 'timeout' | 'closed' | 'garbage' | 'other';

/** Every transport failure, one line: endpoint and reason (exit code 3 at the CLI). */
export class TransportError extends Error {
  readonly exitCode = 3;
  constructor(
    readonly endpoint: string,
    readonly failure: TransportFailure,
    reason: string,
  ) {
    super(`${endpoint}: ${reason}`);
    this.name = 'TransportError';
  }
}
