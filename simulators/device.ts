// What a simulated instrument is to the code that serves it (in process, over TCP or on a pty):
// program messages in, response messages out. Terminators and bytes are the server's business.

export interface SimulatedDevice {
  /** The *IDN? answer, four comma-separated fields (IEEE 488.2). */
  readonly identity: string;
  /**
   * Handles one program message (a line without its terminator, possibly several `;`-separated commands).
   * Resolves after the simulated execution time with the response message to send, or undefined when the
   * message contained no query.
   */
  receive(message: string): Promise<string | undefined>;
  /** Device clear / power-on reset of the simulated state (as on a reboot). */
  reset(): void;
  /** A power cycle that comes back with a changed identity (other firmware), everything reset. */
  reboot?(): void;
  /** Queues an error as if a command had failed (misbehaviour tests: spurious error-queue entries). */
  injectError?(code: number, detail?: string): void;
  /**
   * The client waits for an answer to `fragment`, bytes that never got a terminator: queues -420 Query
   * UNTERMINATED (IEEE 488.2). The server decides when that is (e.g. a partial line left idle).
   */
  unterminatedQuery?(fragment: string): void;
}
