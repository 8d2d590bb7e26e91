// Starts `topoprobe sim` as a child process, reads its one JSON line of endpoints, and stops it.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { ROOT } from './run-cli.js';

export interface SimEndpoints {
  analyzer: string;
  switch: string;
  fixture: string;
  board: string;
  transport: string;
  faults: string[];
}

export interface SimProcess {
  endpoints: SimEndpoints;
  child: ChildProcess;
  stderr(): string;
  /** Sends SIGINT and resolves with the exit code. */
  stop(): Promise<number | null>;
}

export function startSim(args: string[]): Promise<SimProcess> {
  const child = spawn(process.execPath, [path.join(ROOT, 'bin', 'topoprobe.mjs'), 'sim', ...args], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  let err = '';
  child.stderr!.on('data', (c: Buffer) => (err += c.toString()));
  const exited = new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`topoprobe sim printed no endpoints in 30 s; stderr: ${err}`));
    }, 30_000);
    child.stdout!.on('data', (c: Buffer) => {
      out += c.toString();
      const nl = out.indexOf('\n');
      if (nl >= 0) {
        clearTimeout(timer);
        resolve({
          endpoints: JSON.parse(out.slice(0, nl)),
          child,
          stderr: () => err,
          stop: () => {
            child.kill('SIGINT');
            return exited;
          },
        });
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`topoprobe sim exited with ${code} before printing endpoints: ${err}`));
    });
  });
}
