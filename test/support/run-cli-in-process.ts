// Runs the whole `topoprobe` program in this process and captures what it writes, so that a corpus of
// hundreds of bad inputs costs milliseconds each instead of a Node start-up each. The spawned launcher
// (run-cli.ts) stays the reference for how a user sees the program; this is the same code path after argv.
import { main } from '../../src/cli/program.js';
import type { CliResult } from './run-cli.js';

let busy = false;

export async function runCliInProcess(args: string[]): Promise<CliResult> {
  if (busy) throw new Error('runCliInProcess is not re-entrant');
  busy = true;
  const out: string[] = [];
  const err: string[] = [];
  const realOut = process.stdout.write.bind(process.stdout);
  const realErr = process.stderr.write.bind(process.stderr);
  const capture = (sink: string[]) =>
    ((chunk: string | Uint8Array, ...rest: unknown[]) => {
      sink.push(typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8'));
      const cb = rest.find((r) => typeof r === 'function') as (() => void) | undefined;
      cb?.();
      return true;
    }) as typeof process.stdout.write;
  const savedExitCode = process.exitCode;
  const savedDebug = process.env.TOPOPROBE_DEBUG;
  delete process.env.TOPOPROBE_DEBUG;
  process.exitCode = undefined;
  process.stdout.write = capture(out);
  process.stderr.write = capture(err);
  try {
    const status = await main(args);
    return { status, stdout: out.join(''), stderr: err.join('') };
  } finally {
    process.stdout.write = realOut;
    process.stderr.write = realErr;
    process.exitCode = savedExitCode;
    if (savedDebug !== undefined) process.env.TOPOPROBE_DEBUG = savedDebug;
    busy = false;
  }
}
