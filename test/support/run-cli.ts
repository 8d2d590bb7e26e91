// Runs the real `topoprobe` launcher as a child process, the way a user or an outside script does.
import { spawnSync } from 'node:child_process';
import path from 'node:path';

export const ROOT = path.resolve(import.meta.dirname, '..', '..');

export interface CliResult {
  status: number | null;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[], options: { cwd?: string; input?: string } = {}): CliResult {
  const r = spawnSync(process.execPath, [path.join(ROOT, 'bin', 'topoprobe.mjs'), ...args], {
    cwd: options.cwd ?? ROOT,
    input: options.input ?? '',
    encoding: 'utf8',
    env: { ...process.env, TOPOPROBE_DEBUG: '' },
    timeout: 120_000,
  });
  return { status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** A stack trace has lines like "    at fn (file:line:col)". */
export function hasStackTrace(text: string): boolean {
  return /^\s+at .+(:\d+:\d+\)?|\(node:)/m.test(text);
}
