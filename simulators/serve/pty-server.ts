// A simulated instrument on a pseudo-terminal pair made by socat: the bench holds one end through the
// real serialport stack, the client opens the other end as it would a USB-serial adapter.
import { spawn, type ChildProcess } from 'node:child_process';
import { SerialPort } from 'serialport';
import type { SimulatedDevice } from '../device.js';
import { LinePacer } from './line-pacer.js';
import { serveDevice, type ServeOptions } from './serve-device.js';
import type { RunningServer } from './tcp-server.js';

/** Starts socat and resolves with the two pty paths it made. */
export function ptyPair(): Promise<{ process: ChildProcess; ends: [string, string] }> {
  return new Promise((resolve, reject) => {
    const child = spawn('socat', ['-d', '-d', 'pty,raw,echo=0', 'pty,raw,echo=0'], { stdio: ['ignore', 'ignore', 'pipe'] });
    let text = '';
    const timer = setTimeout(() => {
      child.kill();
      reject(new Error('socat made no pseudo-terminal pair within 5 s'));
    }, 5000);
    child.once('error', (err: NodeJS.ErrnoException) => {
      clearTimeout(timer);
      reject(new Error(err.code === 'ENOENT' ? 'socat is not installed (apt-get install socat); it makes the pseudo-terminal pairs' : `socat: ${err.message}`));
    });
    child.stderr!.on('data', (chunk: Buffer) => {
      text += chunk.toString();
      const paths = [...text.matchAll(/PTY is (\S+)/g)].map((m) => m[1]);
      if (paths.length >= 2) {
        clearTimeout(timer);
        resolve({ process: child, ends: [paths[0], paths[1]] });
      }
    });
  });
}

export interface PtyServeOptions extends ServeOptions {
  baudRate?: number;
  /** Pace both directions at this line rate (a pty has none of its own): see line-pacer.ts. */
  paceBaud?: number;
}

export async function servePty(device: SimulatedDevice, options: PtyServeOptions = {}): Promise<RunningServer> {
  const { process: socat, ends } = await ptyPair();
  const port = new SerialPort({ path: ends[0], baudRate: options.baudRate ?? 115200, autoOpen: false });
  await new Promise<void>((resolve, reject) => port.open((err) => (err ? reject(err) : resolve())));
  const incoming = options.paceBaud !== undefined ? new LinePacer(options.paceBaud) : undefined;
  const outgoing = options.paceBaud !== undefined ? new LinePacer(options.paceBaud) : undefined;
  const writeNow = (bytes: Uint8Array) => {
    if (port.isOpen) port.write(Buffer.from(bytes));
  };
  const feed = serveDevice(
    device,
    {
      write: (bytes) => (outgoing ? outgoing.send(bytes.length, () => writeNow(bytes)) : writeNow(bytes)),
      // An unplugged adapter: the pair disappears, the client's port errors out.
      drop: () => {
        port.close(() => undefined);
        socat.kill();
      },
    },
    options,
  );
  port.on('data', (chunk: Buffer) => (incoming ? incoming.send(chunk.length, () => feed(chunk)) : feed(chunk)));
  port.on('error', () => undefined);
  return {
    endpoint: ends[1],
    close: () =>
      new Promise<void>((done) => {
        const finish = () => {
          socat.kill();
          done();
        };
        if (port.isOpen) port.close(() => finish());
        else finish();
      }),
  };
}
