// Two connected pseudo-terminals from socat ("socat -d -d pty,raw,echo=0 pty,raw,echo=0"): a real tty on
// each end, so the serial transport runs through the operating system's serial path as with a USB adapter.
import { spawn, type ChildProcess } from 'node:child_process';
import { SerialPort } from 'serialport';

export interface PtyPair {
  /** The end the transport under test opens. */
  near: string;
  /** The end the responder opens. */
  far: string;
  socat: ChildProcess;
  stop(): Promise<void>;
}

export function startPtyPair(): Promise<PtyPair> {
  const socat = spawn('socat', ['-d', '-d', 'pty,raw,echo=0', 'pty,raw,echo=0'], { stdio: ['ignore', 'ignore', 'pipe'] });
  let log = '';
  return new Promise((resolve, reject) => {
    const fail = (why: string) => reject(new Error(`socat did not start: ${why}\n${log}`));
    const early = (code: number | null) => fail(`exited with ${code}`);
    socat.once('error', (e) => fail(e.message));
    socat.once('exit', early);
    socat.stderr!.on('data', (chunk: Buffer) => {
      log += chunk.toString();
      // socat logs "N PTY is /dev/pts/3" for each end, then "starting data transfer loop".
      const paths = [...log.matchAll(/PTY is (\/dev\/pts\/\d+)/g)].map((m) => m[1]);
      if (paths.length === 2 && /starting data transfer loop/.test(log)) {
        socat.removeListener('exit', early);
        resolve({
          near: paths[0],
          far: paths[1],
          socat,
          stop: () =>
            new Promise((done) => {
              if (socat.exitCode !== null || socat.signalCode !== null) return done();
              socat.once('exit', () => done());
              socat.kill('SIGTERM');
            }),
        });
      }
    });
  });
}

export type Reply = (line: string) => string | Uint8Array | undefined;

/** A tiny instrument on the far end: reads lines ending in LF (a CR before it is kept off), replies. */
export async function startResponder(path: string, reply: Reply): Promise<{ port: SerialPort; heard: string[]; close(): Promise<void> }> {
  const port = new SerialPort({ path, baudRate: 115200, autoOpen: false });
  await new Promise<void>((resolve, reject) => port.open((e) => (e ? reject(e) : resolve())));
  const heard: string[] = [];
  let buffer = '';
  port.on('error', () => undefined);
  port.on('data', (chunk: Buffer) => {
    buffer += chunk.toString('latin1');
    let at: number;
    while ((at = buffer.indexOf('\n')) >= 0) {
      const raw = buffer.slice(0, at);
      buffer = buffer.slice(at + 1);
      heard.push(raw);
      const answer = reply(raw.replace(/\r$/, ''));
      if (answer !== undefined) port.write(typeof answer === 'string' ? Buffer.from(answer, 'latin1') : Buffer.from(answer));
    }
  });
  return {
    port,
    heard,
    close: () => new Promise((resolve) => (port.isOpen ? port.close(() => resolve()) : resolve())),
  };
}
