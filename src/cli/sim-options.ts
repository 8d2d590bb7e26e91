// Parsing of the `topoprobe sim` flags that describe trouble: misbehaving links and stuck relays.
import { closeSync, openSync, writeSync } from 'node:fs';
import type { MisbehaviourOptions } from '../../simulators/misbehaviour.js';
import type { StuckState } from '../../simulators/switch-matrix.js';
import { UsageError } from './exit-codes.js';

export type MisbehaviourTarget = 'analyzer' | 'switch';

const KINDS = 'late=RATE:MS, drop=RATE, garbage=RATE[:replace|prefix], disconnect=N, reboot=N, errors=EVERY[:CODE], spare=N';

/** `--misbehave analyzer:late=0.1:3000` (TARGET is analyzer, switch or both); returns options per target. */
export function parseMisbehaviour(specs: readonly string[], seed: number): Partial<Record<MisbehaviourTarget, MisbehaviourOptions>> {
  const out: Partial<Record<MisbehaviourTarget, MisbehaviourOptions>> = {};
  for (const spec of specs) {
    const bad = (why: string) => new UsageError(`--misbehave ${spec}: ${why}`);
    const m = /^(analyzer|switch|both):(\w+)(?:=(.*))?$/.exec(spec);
    if (!m) throw bad(`expected TARGET:KIND[=ARGS] with TARGET analyzer, switch or both and KIND one of ${KINDS}`);
    const [, target, kind, args = ''] = m;
    const fields = args === '' ? [] : args.split(':');
    const num = (i: number, what: string, integer = false) => {
      const v = Number(fields[i]);
      if (fields[i] === undefined || !Number.isFinite(v) || (integer && !Number.isInteger(v))) throw bad(`${what} must be ${integer ? 'a whole number' : 'a number'}`);
      return v;
    };
    const rate = (i: number) => {
      const v = num(i, 'RATE');
      if (v < 0 || v > 1) throw bad('RATE is a fraction of messages, from 0 to 1');
      return v;
    };
    const patch: Partial<MisbehaviourOptions> = {};
    switch (kind) {
      case 'late':
        patch.late = { rate: rate(0), delayMs: num(1, 'MS') };
        break;
      case 'drop':
        patch.drop = { rate: rate(0) };
        break;
      case 'garbage': {
        const mode = fields[1] ?? 'replace';
        if (mode !== 'replace' && mode !== 'prefix') throw bad('the garbage mode is replace or prefix');
        patch.garbage = { rate: rate(0), mode };
        break;
      }
      case 'disconnect':
        patch.disconnectAfter = num(0, 'N', true);
        break;
      case 'reboot':
        patch.rebootAfter = num(0, 'N', true);
        break;
      case 'errors':
        patch.spuriousError = { every: num(0, 'EVERY', true), ...(fields[1] !== undefined ? { code: num(1, 'CODE', true) } : {}) };
        break;
      case 'spare':
        patch.spare = num(0, 'N', true);
        break;
      default:
        throw bad(`unknown kind "${kind}"; kinds: ${KINDS}`);
    }
    for (const t of target === 'both' ? (['analyzer', 'switch'] as const) : [target as MisbehaviourTarget]) {
      out[t] = { seed, ...out[t], ...patch };
    }
  }
  return out;
}

/** `--stuck 105=closed` */
export function parseStuck(specs: readonly string[]): Map<number, StuckState> {
  const out = new Map<number, StuckState>();
  for (const spec of specs) {
    const m = /^(\d+)=(open|closed)$/.exec(spec);
    if (!m) throw new UsageError(`--stuck ${spec}: expected CHANNEL=open or CHANNEL=closed, e.g. 105=closed`);
    const ch = Number(m[1]);
    if (ch < 1 || ch > 9999) throw new UsageError(`--stuck ${spec}: channels run from 1 to 9999`);
    out.set(ch, m[2] as StuckState);
  }
  return out;
}

export function parseTerminator(text: string): string {
  const t = { lf: '\n', crlf: '\r\n', cr: '\r' }[text.toLowerCase()];
  if (t === undefined) throw new UsageError(`--terminator ${text}: expected lf, crlf or cr`);
  return t;
}

/** `--closed 1003,2000`: relays closed before any client speaks. */
export function parseClosed(text: string): number[] {
  const fields = text.split(',').map((f) => f.trim());
  const out: number[] = [];
  for (const f of fields) {
    if (!/^\d+$/.test(f) || Number(f) < 1 || Number(f) > 9999) throw new UsageError(`--closed ${text}: "${f}" is not a channel from 1 to 9999; expected CH,CH.., e.g. 1003,2000`);
    out.push(Number(f));
  }
  return out;
}

/** A recorder per instrument, and the closing of the file. */
export interface TrafficRecord {
  recorder(instrument: 'analyzer' | 'switch'): (direction: 'in' | 'out', text: string) => void;
  close(): void;
}

/**
 * `--traffic FILE`: the simulated instruments' own record of what reached them and what they answered,
 * one line each ("<ISO time> <instrument> in|out <message>"), written at once so a kill loses nothing.
 */
export function openTraffic(file: string): TrafficRecord {
  let fd: number | undefined;
  try {
    fd = openSync(file, 'a');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new UsageError(`--traffic ${file}: cannot open it (${code === 'ENOENT' ? 'its folder does not exist' : code === 'EACCES' ? 'permission denied' : (error as Error).message})`);
  }
  return {
    recorder: (instrument) => (direction, text) => {
      if (fd === undefined) return;
      try {
        writeSync(fd, `${new Date().toISOString()} ${instrument} ${direction} ${text}\n`);
      } catch {
        // A record that cannot be written (disk full) must not stop the bench; it ends here.
        fd = undefined;
      }
    },
    close: () => {
      if (fd !== undefined) closeSync(fd);
      fd = undefined;
    },
  };
}
