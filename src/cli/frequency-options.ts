// Parsing of the frequency flags shared by verbs: --freq F[,F..] and --sweep START:STOP:POINTS[:log].
import { parseQuantity } from '../units/quantity.js';
import { linearGrid, logGrid } from '../predict/frequency-grid.js';
import { UsageError } from './exit-codes.js';

export function parseFrequency(text: string, flag: string): number {
  try {
    return parseQuantity(text.trim(), 'Hz');
  } catch (err) {
    throw new UsageError(`${flag} ${text}: ${(err as Error).message}`);
  }
}

export function parseFrequencyList(text: string): number[] {
  const items = text.split(',').filter((s) => s.trim() !== '');
  if (items.length === 0) throw new UsageError(`--freq "${text}": expected one or more frequencies, e.g. 163k,170kHz`);
  return items.map((s) => parseFrequency(s, '--freq'));
}

export const MAX_SWEEP_POINTS = 100_000;

export function parseSweep(text: string): number[] {
  const fields = text.split(':');
  const shape = 'expected START:STOP:POINTS[:log], e.g. 100k:200k:201 or 1k:1M:61:log';
  if (fields.length < 3 || fields.length > 4) throw new UsageError(`--sweep ${text}: ${shape}`);
  const start = parseFrequency(fields[0], '--sweep');
  const stop = parseFrequency(fields[1], '--sweep');
  const points = Number(fields[2]);
  if (!Number.isInteger(points) || points < 1 || points > MAX_SWEEP_POINTS) {
    throw new UsageError(`--sweep ${text}: POINTS must be a whole number from 1 to ${MAX_SWEEP_POINTS}`);
  }
  if (fields.length === 4 && fields[3].toLowerCase() !== 'log' && fields[3].toLowerCase() !== 'lin') {
    throw new UsageError(`--sweep ${text}: the fourth field may only be "log" or "lin"`);
  }
  if (stop < start) throw new UsageError(`--sweep ${text}: STOP is below START`);
  return fields[3]?.toLowerCase() === 'log' ? logGrid(start, stop, points) : linearGrid(start, stop, points);
}

export function parseCount(text: string, flag: string, max = 1_000_000): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < 1 || n > max) throw new UsageError(`${flag} ${text}: expected a whole number from 1 to ${max}`);
  return n;
}
