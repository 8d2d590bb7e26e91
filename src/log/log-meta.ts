// `<log>.meta.json`: what a log was made with (board snapshot, plan hash, instruments, software) and how
// each run of it went. Replaced atomically (a temporary file beside it, synced, then renamed over it), so
// a reader sees the old meta or the new one, never half of either.
import { closeSync, fsyncSync, openSync, readFileSync, renameSync, writeSync } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { GROUND, type Board } from '../board/types.js';
import { LogError } from './log-error.js';

export const META_FORMAT = 'topoprobe-log-meta/1';

/** `running`: written when a run starts; left so only when the process died without closing the log. */
export type MetaStatus = 'running' | 'complete' | 'interrupted' | 'failed';

const identity = z.object({ maker: z.string(), model: z.string(), serial: z.string(), firmware: z.string(), raw: z.string() });
const instrument = z.object({ profile: z.string(), address: z.string(), identity: identity.nullable() });

const RunRecord = z.object({
  started: z.string(),
  ended: z.string().nullable(),
  status: z.enum(['running', 'complete', 'interrupted', 'failed']),
  /** Readings this run added. */
  readings: z.number().int().min(0),
  reason: z.string().optional(),
  safe: z.boolean().optional(),
});

export const MetaShape = z.object({
  format: z.literal(META_FORMAT),
  log: z.string(),
  software: z.object({ name: z.string(), version: z.string() }),
  plan: z.object({ file: z.string(), sha256: z.string().regex(/^[0-9a-f]{64}$/), created: z.string(), software: z.string() }),
  board: z.object({ name: z.string(), hash: z.string(), snapshot: z.unknown() }),
  mode: z.enum(['switched', 'operator']),
  instruments: z.object({ analyzer: instrument, switch: instrument.nullable() }),
  simulated: z.object({ faults: z.array(z.string()), seed: z.number().int(), timing: z.enum(['instant', 'realistic']) }).nullable(),
  started: z.string(),
  ended: z.string().nullable(),
  status: z.enum(['running', 'complete', 'interrupted', 'failed']),
  readings: z.number().int().min(0),
  deviations: z.number().int().min(0),
  invalid: z.number().int().min(0),
  runs: z.array(RunRecord).min(1),
});

export type LogMeta = Omit<z.infer<typeof MetaShape>, 'board'> & { board: { name: string; hash: string; snapshot: Board } };
export type RunRecord = z.infer<typeof RunRecord>;

export function writeMeta(file: string, meta: LogMeta): void {
  const temp = path.join(path.dirname(file), `.${path.basename(file)}.${process.pid}.tmp`);
  const fd = openSync(temp, 'w');
  try {
    writeSync(fd, JSON.stringify(meta, null, 2) + '\n');
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(temp, file);
  // The rename itself lives in the folder: sync it too where the system allows it.
  try {
    const dir = openSync(path.dirname(file), 'r');
    try {
      fsyncSync(dir);
    } finally {
      closeSync(dir);
    }
  } catch {
    // Some systems cannot sync a folder; the rename is still atomic.
  }
}

export function readMeta(file: string): LogMeta {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new LogError(file, code === 'ENOENT' ? 'no meta file beside the log (it is written when a run starts)' : `cannot read it: ${(error as Error).message}`);
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (error) {
    throw new LogError(file, `is not JSON: ${(error as Error).message}`);
  }
  const parsed = MetaShape.safeParse(data);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new LogError(file, `${issue.path.join('.') || 'the top level'}: ${issue.message}`);
  }
  checkSnapshot(file, parsed.data.board.snapshot);
  return parsed.data as LogMeta;
}

const Positive = z.number().positive().finite();
const SnapshotShape = z.object({
  name: z.string(),
  nodes: z.array(z.object({ name: z.string().min(1), position: z.tuple([z.number(), z.number(), z.number()]) })).min(1),
  parts: z.array(z.object({ ref: z.string().min(1), kind: z.enum(['C', 'L', 'R']), nodes: z.tuple([z.string(), z.string()]), value: Positive, tolerance: z.number().nonnegative().optional(), esr: z.number().nonnegative().optional() })).min(1),
});

/**
 * The analysis verbs compute everything from the snapshot, so it is checked here as far as they rely on it
 * (fields and types, every part between known nodes): a damaged one is one line naming the field, not a
 * failure deep inside a solver.
 */
function checkSnapshot(file: string, snapshot: unknown): void {
  const parsed = SnapshotShape.safeParse(snapshot);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new LogError(file, `${['board', 'snapshot', ...issue.path].join('.')}: ${issue.message}`);
  }
  const nodes = new Set(parsed.data.nodes.map((n) => n.name));
  parsed.data.parts.forEach((part, i) => {
    part.nodes.forEach((node, end) => {
      if (node !== GROUND && !nodes.has(node)) throw new LogError(file, `board.snapshot.parts.${i}.nodes.${end}: no node "${node}" in the snapshot's nodes`);
    });
  });
}
