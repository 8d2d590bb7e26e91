// A raw TCP socket to an instrument's SCPI port (port 5025 on most LAN instruments, common practice)
// behind the Transport interface. Every open makes a new socket, so close and reopen is a reconnect.

import { Socket } from 'node:net';
import { TransportError, type TransportFailure } from '../transport.js';
import type { Transport } from '../transport.js';

export interface TcpSettings {
  host: string;
  port: number;
  /** How long to wait for the connection to be accepted; default 3000 ms. */
  connectTimeoutMs?: number;
  /** TCP keep-alive probe delay, so a silently dead peer is found during a long run; default 10 000 ms. */
  keepAliveMs?: number;
  /** Makes the socket; tests give one that never connects. */
  socketFactory?: () => Socket;
}

export const PEER_CLOSED_REASON = 'closed by peer: the instrument ended the connection';

export class TcpTransport implements Transport {
  readonly medium = 'tcp' as const;
  readonly endpoint: string;
  private socket?: Socket;
  private receiver?: (chunk: Uint8Array) => void;
  private closeListener?: (reason: string) => void;

  constructor(readonly settings: TcpSettings) {
    this.endpoint = `${settings.host}:${settings.port}`;
  }

  get isOpen(): boolean {
    return this.socket !== undefined;
  }

  async open(): Promise<void> {
    if (this.socket) return;
    const { host, port } = this.settings;
    const timeoutMs = this.settings.connectTimeoutMs ?? 3000;
    const socket = this.settings.socketFactory?.() ?? new Socket();
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => {
        socket.destroy();
        reject(new TransportError(this.endpoint, 'timeout', `no answer to the connection request within ${timeoutMs} ms (wrong address, instrument off, or a firewall drops it)`));
      }, timeoutMs);
      socket.once('connect', () => {
        clearTimeout(timer);
        socket.removeAllListeners('error');
        resolve();
      });
      socket.once('error', (err: NodeJS.ErrnoException) => {
        clearTimeout(timer);
        socket.destroy();
        reject(this.failure(err));
      });
      socket.connect({ host, port });
    });
    socket.setNoDelay(true);
    socket.setKeepAlive(true, this.settings.keepAliveMs ?? 10_000);
    let lastError: NodeJS.ErrnoException | undefined;
    socket.on('data', (chunk: Buffer) => this.receiver?.(chunk));
    socket.on('error', (err: NodeJS.ErrnoException) => {
      lastError = err;
    });
    socket.on('close', () => {
      if (this.socket !== socket) return; // our own close()
      this.socket = undefined;
      this.closeListener?.(lostReason(lastError, port));
    });
    this.socket = socket;
  }

  write(data: Uint8Array | string): Promise<void> {
    const socket = this.socket;
    if (!socket || socket.destroyed) return Promise.reject(new TransportError(this.endpoint, 'closed', 'not open'));
    return new Promise((resolve, reject) => {
      socket.write(typeof data === 'string' ? Buffer.from(data, 'latin1') : data, (err) =>
        err ? reject(this.failure(err as NodeJS.ErrnoException)) : resolve(),
      );
    });
  }

  onData(receiver: (chunk: Uint8Array) => void): void {
    this.receiver = receiver;
  }

  onClose(listener: (reason: string) => void): void {
    this.closeListener = listener;
  }

  async close(): Promise<void> {
    const socket = this.socket;
    this.socket = undefined;
    if (!socket) return;
    await new Promise<void>((resolve) => {
      if (socket.destroyed) return resolve();
      socket.once('close', () => resolve());
      socket.end();
      // A peer that never answers our FIN must not hold the close up.
      setTimeout(() => socket.destroy(), 1000).unref();
    });
  }

  private failure(err: NodeJS.ErrnoException): TransportError {
    const [failure, reason] = describeSocketError(err, this.settings.port);
    return new TransportError(this.endpoint, failure, reason);
  }
}

/** errno codes of node:net (libuv names, common practice) to our failure kinds and reasons. */
export function describeSocketError(err: NodeJS.ErrnoException, port: number): [TransportFailure, string] {
  switch (err.code) {
    case 'ECONNREFUSED':
      return ['refused', `connection refused: nothing listens on port ${port} there (instrument off, or its LAN/SCPI socket disabled)`];
    case 'ETIMEDOUT':
      return ['timeout', 'no answer to the connection request (wrong address, or a firewall drops it)'];
    case 'ENOTFOUND':
    case 'EAI_AGAIN':
      return ['no-such-port', 'no such host (check the name or the address)'];
    case 'EHOSTUNREACH':
    case 'ENETUNREACH':
      return ['refused', 'host unreachable (check the address and the network cable)'];
    case 'ECONNRESET':
    case 'EPIPE':
      return ['closed', 'closed by peer: the connection was reset'];
    default:
      return ['other', `connection failed: ${err.message}`];
  }
}

/** Why an open connection ended: the peer closed or reset it, or the network failed under it. */
function lostReason(err: NodeJS.ErrnoException | undefined, port: number): string {
  if (!err) return PEER_CLOSED_REASON;
  const [failure, reason] = describeSocketError(err, port);
  return failure === 'closed' ? reason : `connection lost: ${err.code ?? err.message}`;
}
