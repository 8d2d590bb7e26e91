// What the reliability suites need around a real `topoprobe run` process: starting it with its own
// environment (the full-disk seam), the readings it reported on stdout (--json), the rows of its log read
// back by an independent CSV parser (csv-parse), the lost and duplicated readings between the two, and
// asking a simulated instrument over its own line how it was left.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { builtinProfile, parseAddress, sessionFor, transportFor } from '../../../src/instruments/index.js';
import { ROOT } from '../../support/run-cli.js';

export interface RunProcess {
  child: ChildProcess;
  stdout(): string;
  stderr(): string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
}

/** `topoprobe run ARGS` as a child process (the real launcher), with extra environment variables. */
export function spawnRun(args: string[], env: Record<string, string> = {}): RunProcess {
  const child = spawn(process.execPath, [path.join(ROOT, 'bin', 'topoprobe.mjs'), 'run', ...args], {
    cwd: ROOT,
    stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, TOPOPROBE_DEBUG: '', ...env },
  });
  let out = '';
  let err = '';
  child.stdout!.on('data', (c: Buffer) => (out += c.toString()));
  child.stderr!.on('data', (c: Buffer) => (err += c.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.once('close', (code, signal) => resolve({ code, signal })));
  return { child, stdout: () => out, stderr: () => err, exited };
}

export interface ReportedReading {
  step: number;
  point: number;
  time: string;
  re: number | null;
}

/** The `reading` events among the complete JSON lines of a --json run's stdout (a kill may cut the last). */
export function reportedReadings(stdout: string): ReportedReading[] {
  const complete = stdout.slice(0, stdout.lastIndexOf('\n') + 1);
  return complete
    .split('\n')
    .filter((l) => l !== '')
    .map((l) => JSON.parse(l) as { event: string } & ReportedReading)
    .filter((e) => e.event === 'reading')
    .map(({ step, point, time, re }) => ({ step, point, time, re }));
}

export interface LogRowKey {
  step: number;
  point: number;
  time: string;
  re: number | null;
}

/** The whole records of a log (a torn last line left out), by csv-parse rather than our own reader. */
export function logRows(file: string): LogRowKey[] {
  if (!existsSync(file)) return [];
  const text = readFileSync(file, 'utf8');
  const whole = text.slice(0, text.lastIndexOf('\r\n') + 2);
  if (whole === '') return [];
  const records = parse(whole, { columns: true }) as Record<string, string>[];
  return records.map((r) => ({ step: Number(r.step), point: Number(r.point), time: r.time, re: r.re === '' ? null : Number(r.re) }));
}

/** Rows in a log, cheaply (CR LF count less the header): for watching progress. */
export function logLineCount(file: string): number {
  if (!existsSync(file)) return 0;
  const text = readFileSync(file, 'latin1');
  let n = 0;
  for (let i = text.indexOf('\r\n'); i >= 0; i = text.indexOf('\r\n', i + 2)) n++;
  return Math.max(0, n - 1);
}

export const key = (r: { step: number; point: number }): string => `${r.step}:${r.point}`;

export interface Accounting {
  /** Reported readings missing from the log, or present with other values (not the reading that was shown). */
  lost: number;
  /** Reported readings found more than once in the log. */
  duplicated: number;
  /** (step, point) keys the log holds more than once, whoever reported them. */
  duplicateKeys: string[];
}

/** Every reported reading must be in the log exactly once, as reported (same time stamp and value). */
export function account(reported: readonly ReportedReading[], rows: readonly LogRowKey[]): Accounting {
  const byKey = new Map<string, LogRowKey[]>();
  for (const r of rows) byKey.set(key(r), [...(byKey.get(key(r)) ?? []), r]);
  let lost = 0;
  let duplicated = 0;
  for (const r of reported) {
    const found = byKey.get(key(r)) ?? [];
    if (found.length > 1) duplicated++;
    if (!found.some((f) => f.time === r.time && f.re === r.re)) lost++;
  }
  const duplicateKeys = [...byKey].filter(([, list]) => list.length > 1).map(([k]) => k);
  return { lost, duplicated, duplicateKeys };
}

export function readMeta(file: string): { status: string; readings: number; runs: { status: string; safe?: boolean; reason?: string }[] } {
  return JSON.parse(readFileSync(`${file}.meta.json`, 'utf8'));
}

export function planKeys(planFile: string): string[] {
  const plan = JSON.parse(readFileSync(planFile, 'utf8')) as { steps: { step: number; points: unknown[] }[] };
  return plan.steps.flatMap((s) => s.points.map((_, i) => `${s.step}:${i + 1}`));
}

/**
 * Asks a simulated instrument one query over its own line (pty or TCP), as a person at the bench would
 * afterwards. A few tries: the link may still be misbehaving (that is the point of the test).
 */
export async function askInstrument(endpoint: string, which: 'switch' | 'analyzer', query: string, tries = 6): Promise<string> {
  const profile = builtinProfile(which === 'switch' ? 'generic-switch' : 'generic-analyzer');
  let last: unknown;
  for (let i = 0; i < tries; i++) {
    const session = sessionFor(profile, transportFor(parseAddress(endpoint), profile), { timeoutMs: 1500 });
    try {
      await session.open();
      return await session.query(query);
    } catch (error) {
      last = error;
      await new Promise((r) => setTimeout(r, 200));
    } finally {
      await session.close().catch(() => undefined);
    }
  }
  throw last;
}
