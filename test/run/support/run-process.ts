// `topoprobe run` as a child process that a test can watch and signal (Ctrl-C, SIGTERM, kill -9), and
// small helpers around its log. The synchronous runCli (test/support/run-cli.ts) serves the rest.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { ROOT } from '../../support/run-cli.js';

export interface RunningRun {
  child: ChildProcess;
  stdout(): string;
  stderr(): string;
  /** Resolves with the exit code, or the signal that ended the process. */
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  /** Resolves once stdout holds `count` lines (with --json: events). */
  lines(count: number, timeoutMs?: number): Promise<string[]>;
}

export function startRun(args: string[], options: { cwd?: string; input?: string } = {}): RunningRun {
  const child = spawn(process.execPath, [path.join(ROOT, 'bin', 'topoprobe.mjs'), 'run', ...args], {
    cwd: options.cwd ?? ROOT,
    stdio: ['pipe', 'pipe', 'pipe'],
    env: { ...process.env, TOPOPROBE_DEBUG: '' },
  });
  let out = '';
  let err = '';
  const waiters: { count: number; resolve(lines: string[]): void }[] = [];
  child.stdout!.on('data', (c: Buffer) => {
    out += c.toString();
    const lines = out.split('\n').filter((l) => l !== '');
    for (const w of waiters.splice(0)) {
      if (lines.length >= w.count) w.resolve(lines);
      else waiters.push(w);
    }
  });
  child.stderr!.on('data', (c: Buffer) => (err += c.toString()));
  if (options.input !== undefined) child.stdin!.end(options.input);
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once('exit', (code, signal) => resolve({ code, signal })));
  return {
    child,
    stdout: () => out,
    stderr: () => err,
    exited,
    lines: (count, timeoutMs = 60_000) =>
      new Promise((resolve, reject) => {
        const lines = out.split('\n').filter((l) => l !== '');
        if (lines.length >= count) return resolve(lines);
        const timer = setTimeout(() => reject(new Error(`run printed ${lines.length} of ${count} lines in ${timeoutMs} ms; stderr: ${err}`)), timeoutMs);
        waiters.push({ count, resolve: (l) => (clearTimeout(timer), resolve(l)) });
        void exited.then(() => setTimeout(() => reject(new Error(`run exited before printing ${count} lines; stderr: ${err}`)), 50));
      }),
  };
}

export interface LoggedRow {
  step: number;
  point: number;
  hi: string;
  lo: string;
  sense: string;
  flag: string;
}

/** The rows of a log read with csv-parse, whole records only (a torn last line is left out). */
export function loggedRows(file: string): LoggedRow[] {
  if (!existsSync(file)) return [];
  const text = readFileSync(file, 'utf8');
  const whole = text.slice(0, text.lastIndexOf('\r\n') + 2);
  if (whole === '') return [];
  const records = parse(whole, { columns: true }) as Record<string, string>[];
  return records.map((r) => ({ step: Number(r.step), point: Number(r.point), hi: r.hi, lo: r.lo, sense: r.sense, flag: r.flag }));
}

export function readMetaFile(file: string): { status: string; readings: number; runs: { status: string }[] } {
  return JSON.parse(readFileSync(`${file}.meta.json`, 'utf8'));
}

export function planKeys(planFile: string): string[] {
  const plan = JSON.parse(readFileSync(planFile, 'utf8')) as { steps: { step: number; points: unknown[] }[] };
  return plan.steps.flatMap((s) => s.points.map((_, i) => `${s.step}:${i + 1}`));
}
