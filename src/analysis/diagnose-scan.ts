// Readings made ready for the diagnosis: checked against the board, grouped by frequency (one
// factorization each), and each written as the bilinear form qᵀ Z p it measures.
import { GROUND, type Board } from '../board/types.js';
import { NodeIndex } from '../circuit/node-index.js';
import type { Reading } from './readings.js';
import type { NodePair } from './rank-one.js';
import { DiagnoseError } from './diagnose-error.js';

export interface PreparedReading {
  source: Reading;
  /** Index into PreparedScan.groups. */
  group: number;
  /** Current in at p.plus, out at p.minus. */
  p: NodePair;
  /** Voltage of q.plus against q.minus. */
  q: NodePair;
  measured: { re: number; im: number };
}

export interface FrequencyGroup {
  frequencyHz: number;
  omega: number;
  /** Indices into PreparedScan.readings. */
  members: number[];
}

export interface PreparedScan {
  index: NodeIndex;
  readings: PreparedReading[];
  groups: FrequencyGroup[];
  /** Readings flagged invalid, left out. */
  skipped: number;
}

/** Checks and groups the readings. Throws DiagnoseError naming the first bad reading and field. */
export function prepareScan(board: Board, readings: readonly Reading[]): PreparedScan {
  const index = new NodeIndex(board);
  const prepared: PreparedReading[] = [];
  const groups: FrequencyGroup[] = [];
  const groupOf = new Map<number, number>();
  let skipped = 0;
  readings.forEach((reading, position) => {
    if (reading.flag === 'invalid') {
      skipped++;
      return;
    }
    const where = `reading ${readingPlace(reading, position)}`;
    const f = reading.frequency_hz;
    if (typeof f !== 'number' || !(f > 0) || !Number.isFinite(f)) {
      throw new DiagnoseError(`${where}: frequency_hz must be a positive number of hertz, got ${String(f)}`);
    }
    for (const field of ['re', 'im'] as const) {
      if (typeof reading[field] !== 'number' || !Number.isFinite(reading[field])) {
        throw new DiagnoseError(`${where}: ${field} must be a finite number, got ${String(reading[field])} (flag it invalid to leave it out)`);
      }
    }
    const { p, q } = terminals(reading, where, board, index);
    let g = groupOf.get(f);
    if (g === undefined) {
      g = groups.length;
      groupOf.set(f, g);
      groups.push({ frequencyHz: f, omega: 2 * Math.PI * f, members: [] });
    }
    groups[g].members.push(prepared.length);
    prepared.push({ source: reading, group: g, p, q, measured: { re: reading.re, im: reading.im } });
  });
  if (prepared.length === 0) {
    throw new DiagnoseError(
      readings.length === 0 ? 'no readings to diagnose' : `no readings to diagnose: all ${readings.length} readings are flagged invalid`,
    );
  }
  return { index, readings: prepared, groups, skipped };
}

function terminals(reading: Reading, where: string, board: Board, index: NodeIndex): { p: NodePair; q: NodePair } {
  const row = (field: 'hi' | 'lo' | 'sense'): number => {
    const name = reading[field];
    if (typeof name !== 'string' || !index.has(name)) {
      throw new DiagnoseError(`${where}: ${field} ${JSON.stringify(name)} is not a node of board ${board.name}`);
    }
    return index.row(name);
  };
  const hi = row('hi');
  const lo = row('lo');
  switch (reading.kind) {
    case 'to-ground': {
      if (lo !== -1) throw new DiagnoseError(`${where}: a to-ground reading must have lo ${GROUND}, got ${JSON.stringify(reading.lo)}`);
      if (hi === -1) throw new DiagnoseError(`${where}: a to-ground reading needs a board node as hi, got ${GROUND}`);
      const pair = { plus: hi, minus: -1 };
      return { p: pair, q: pair };
    }
    case 'two-point': {
      if (hi === lo) throw new DiagnoseError(`${where}: a two-point reading needs two different nodes, got ${reading.hi} twice`);
      const pair = { plus: hi, minus: lo };
      return { p: pair, q: pair };
    }
    case 'transfer': {
      if (reading.sense === undefined) throw new DiagnoseError(`${where}: a transfer reading needs a sense node`);
      if (hi === lo) throw new DiagnoseError(`${where}: a transfer reading needs hi and lo on different nodes, got ${reading.hi} twice`);
      return { p: { plus: hi, minus: lo }, q: { plus: row('sense'), minus: lo } };
    }
    default:
      throw new DiagnoseError(`${where}: kind must be to-ground, two-point or transfer, got ${JSON.stringify((reading as { kind: unknown }).kind)}`);
  }
}

function readingPlace(reading: Reading, position: number): string {
  return Number.isInteger(reading.step) && Number.isInteger(reading.point)
    ? `step ${reading.step} point ${reading.point}`
    : `#${position + 1}`;
}
