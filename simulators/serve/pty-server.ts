// A simulated instrument on a pseudo-terminal pair made by socat: the bench holds one end through the
// real serialport stack, the client opens the other end as it would a USB-serial adapter. The client's end
// is a symbolic link with a fixed name (as /dev/serial/by-id/... is for an adapter), so that when the link
// is dropped (the adapter unplugged, the instrument rebooting) and comes back, it comes back where it was.
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { SerialPort } from 'serialport';
import type { SimulatedDevice } from '../device.js';
import { LinePacer } from './line-pacer.js';
import { serveDevice, type ServeOptions } from './serve-device.js';
import type { RunningServer } from './tcp-server.js';

/** How long an unplugged link stays away before it is plugged in again, ms. */
export const REPLUG_AFTER_MS = 150;

/** Starts socat and resolves with the two pty paths it made (the second also reachable as `clientLink`). */
export function ptyPair(clientLink?: string): Promise<{ process: ChildProcess; ends: [string, string] }> {
  return new Promise((resolve, reject) => {
    const second = clientLink === undefined ? 'pty,raw,echo=0' : `pty,raw,echo=0,link=${clientLink}`;
    const child = spawn('socat', ['-d', '-d', 'pty,raw,echo=0', second], { stdio: ['ignore', 'ignore', 'pipe'] });
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
      // socat makes the link right after announcing the pty; "starting data transfer" comes after both.
      if (paths.length >= 2 && (clientLink === undefined || /starting data transfer/.test(text))) {
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
  /** Name of the client's link, e.g. "analyzer"; default "port". */
  name?: string;
}

interface Plugged {
  socat: ChildProcess;
  port: SerialPort;
}

export async function servePty(device: SimulatedDevice, options: PtyServeOptions = {}): Promise<RunningServer> {
  const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-pty-'));
  const endpoint = path.join(dir, options.name ?? 'port');
  let current: Plugged | undefined;
  let closed = false;
  let replug: NodeJS.Timeout | undefined;

  const plugIn = async (): Promise<void> => {
    const { process: socat, ends } = await ptyPair(endpoint);
    const port = new SerialPort({ path: ends[0], baudRate: options.baudRate ?? 115200, autoOpen: false });
    await new Promise<void>((resolve, reject) => port.open((err) => (err ? reject(err) : resolve())));
    if (closed) {
      port.close(() => socat.kill());
      return;
    }
    const incoming = options.paceBaud !== undefined ? new LinePacer(options.paceBaud) : undefined;
    const outgoing = options.paceBaud !== undefined ? new LinePacer(options.paceBaud) : undefined;
    const writeNow = (bytes: Uint8Array) => {
      if (port.isOpen) port.write(Buffer.from(bytes));
    };
    const feed = serveDevice(
      device,
      {
        write: (bytes) => (outgoing ? outgoing.send(bytes.length, () => writeNow(bytes)) : writeNow(bytes)),
        // An unplugged adapter: the pair disappears and the client's port errors out; a moment later it is
        // plugged in again under the same name, a fresh connection.
        drop: () => {
          const gone = unplug(current);
          current = undefined;
          // Only after the old socat has gone (and removed its link) may the new one make it again.
          void gone.then(() => {
            if (!closed) replug = setTimeout(() => void plugIn().catch(() => undefined), REPLUG_AFTER_MS);
          });
        },
      },
      options,
    );
    port.on('data', (chunk: Buffer) => (incoming ? incoming.send(chunk.length, () => feed(chunk)) : feed(chunk)));
    port.on('error', () => undefined);
    current = { socat, port };
  };

  await plugIn();
  return {
    endpoint,
    close: async () => {
      closed = true;
      clearTimeout(replug);
      const plugged = current;
      current = undefined;
      if (plugged) await new Promise<void>((done) => (plugged.port.isOpen ? plugged.port.close(() => done()) : done()));
      await unplug(plugged);
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Closes our end and stops socat; resolves once socat has exited (SIGTERM: it removes its link first). */
function unplug(plugged: Plugged | undefined): Promise<void> {
  if (!plugged) return Promise.resolve();
  const { socat, port } = plugged;
  if (port.isOpen) port.close(() => undefined);
  if (socat.exitCode !== null || socat.signalCode !== null) return Promise.resolve();
  const exited = new Promise<void>((done) => socat.once('exit', () => done()));
  socat.kill();
  return exited;
}
