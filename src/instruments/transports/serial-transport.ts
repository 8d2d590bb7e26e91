// A serial port (RS-232, USB CDC/ACM, USB-serial adapter) behind the Transport interface, through the
// serialport library. The port object is made afresh on every open, so close and reopen (a reconnect)
// start from a clean state.

import { realpathSync } from 'node:fs';
import { SerialPort } from 'serialport';
import { TransportError, type Transport } from '../transport.js';
import { openFailure } from './serial-failures.js';

export type Parity = 'none' | 'even' | 'odd' | 'mark' | 'space';
export type FlowControl = 'none' | 'rtscts' | 'xonxoff';
export type DataBits = 5 | 6 | 7 | 8;
export type StopBits = 1 | 1.5 | 2;

export interface SerialSettings {
  /** Device path: /dev/ttyUSB0, /dev/serial/by-id/..., COM3. */
  path: string;
  baudRate: number;
  dataBits?: DataBits;
  parity?: Parity;
  stopBits?: StopBits;
  /** Hardware (RTS/CTS) or software (XON/XOFF) flow control; default none. */
  flowControl?: FlowControl;
}

/**
 * How often the device node is looked at while the port is open. An unplugged adapter (or a pseudo-terminal
 * whose other side closed) takes its node away; the library's hang-up report is the usual way to hear of it,
 * but a busy machine can be late with it, and a query would then wait out its timeout on a dead line.
 */
const DEVICE_WATCH_MS = 500;

export const DISCONNECTED_REASON = 'closed by peer: the port went away (cable or adapter unplugged, or the instrument switched off)';

export class SerialTransport implements Transport {
  readonly medium = 'serial' as const;
  readonly endpoint: string;
  private port?: SerialPort;
  private receiver?: (chunk: Uint8Array) => void;
  private closeListener?: (reason: string) => void;
  private watch?: NodeJS.Timeout;

  constructor(readonly settings: SerialSettings) {
    this.endpoint = settings.path;
  }

  get isOpen(): boolean {
    return this.port?.isOpen ?? false;
  }

  async open(): Promise<void> {
    if (this.isOpen) return;
    const s = this.settings;
    let port: SerialPort;
    try {
      port = new SerialPort({
        path: s.path,
        baudRate: s.baudRate,
        dataBits: s.dataBits ?? 8,
        parity: s.parity ?? 'none',
        stopBits: s.stopBits ?? 1,
        rtscts: s.flowControl === 'rtscts',
        xon: s.flowControl === 'xonxoff',
        xoff: s.flowControl === 'xonxoff',
        autoOpen: false,
      });
    } catch (error) {
      // The constructor throws on settings it cannot use (a baud rate of 0, an unknown parity).
      throw new TransportError(s.path, 'other', `serial settings not accepted: ${(error as Error).message}`);
    }
    await new Promise<void>((resolve, reject) => port.open((err) => (err ? reject(openFailure(s.path, err)) : resolve())));
    port.on('data', (chunk: Buffer) => this.receiver?.(chunk));
    // Failures reach us through callbacks and the close event; an 'error' event without a listener would
    // throw out of the event loop and end the process, losing the readings in memory.
    port.on('error', () => undefined);
    port.on('close', (err: (Error & { disconnected?: boolean }) | null) => {
      if (this.port !== port) return; // our own close(): not news to anyone
      this.lost(err?.disconnected ? DISCONNECTED_REASON : `closed: ${err?.message ?? 'the port closed'}`);
    });
    this.port = port;
    this.watchDevice(port);
    // Bytes an instrument sent before we listened (a power-on banner, a late answer to the last session)
    // would otherwise become the answer to our first query.
    await new Promise<void>((resolve) => port.flush(() => resolve()));
  }

  write(data: Uint8Array | string): Promise<void> {
    const port = this.port;
    if (!port?.isOpen) return Promise.reject(new TransportError(this.endpoint, 'closed', 'not open'));
    return new Promise((resolve, reject) => {
      port.write(typeof data === 'string' ? Buffer.from(data, 'latin1') : Buffer.from(data), (err) =>
        err ? reject(new TransportError(this.endpoint, 'closed', `write failed: ${err.message}`)) : resolve(),
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
    const port = this.port;
    this.port = undefined;
    clearInterval(this.watch);
    if (!port?.isOpen) return;
    await new Promise<void>((resolve) => port.close(() => resolve()));
  }

  private lost(reason: string): void {
    this.port = undefined;
    clearInterval(this.watch);
    this.closeListener?.(reason);
  }

  /** A device path (POSIX) whose node goes away, or comes to name another device, is a disconnect. */
  private watchDevice(port: SerialPort): void {
    clearInterval(this.watch);
    const device = resolved(this.settings.path);
    if (device === undefined || !this.settings.path.startsWith('/')) return;
    this.watch = setInterval(() => {
      if (this.port !== port) return clearInterval(this.watch);
      if (resolved(this.settings.path) === device) return;
      this.lost(DISCONNECTED_REASON);
      port.close(() => undefined);
    }, DEVICE_WATCH_MS);
    this.watch.unref();
  }
}

function resolved(path: string): string | undefined {
  try {
    return realpathSync(path);
  } catch {
    return undefined;
  }
}
