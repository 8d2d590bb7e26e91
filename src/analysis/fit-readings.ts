// Readings as the fit uses them: checked against the board, grouped by frequency (one factorization of J
// serves every reading at that frequency), with the measured value in the log form the residuals use.
// Readings flagged invalid, or whose value is zero or not finite, are left out and listed, never dropped
// silently; a reading that names a node the board does not have is an input error.
import { isGroundName } from '../board/node-names.js';
import { GROUND, type Board } from '../board/types.js';
import type { NodeIndex } from '../circuit/node-index.js';
import { FitError } from './fit-errors.js';
import type { Reading } from './readings.js';
import type { Probe } from './sensitivity.js';

export interface PreparedReading {
  /** Position in the readings given to the fit. */
  index: number;
  reading: Reading;
  probe: Probe;
  /** |measured| (ohms), for the noise floor. */
  magnitude: number;
  /** The measured value, for log(Z / measured). */
  re: number;
  im: number;
}

export interface FrequencyGroup {
  frequencyHz: number;
  readings: PreparedReading[];
  /** Rows whose J⁻¹ column the readings at this frequency need. */
  rows: number[];
}

export interface SkippedReading {
  index: number;
  step: number;
  point: number;
  why: string;
}

export interface PreparedReadings {
  groups: FrequencyGroup[];
  /** Readings used, in residual order (by frequency, then as given). */
  used: PreparedReading[];
  skipped: SkippedReading[];
}

export function prepareReadings(readings: readonly Reading[], index: NodeIndex, board: Board): PreparedReadings {
  const skipped: SkippedReading[] = [];
  const byFrequency = new Map<number, PreparedReading[]>();
  readings.forEach((reading, i) => {
    const where = `reading ${i + 1} (step ${reading.step}, point ${reading.point})`;
    const skip = (why: string) => skipped.push({ index: i, step: reading.step, point: reading.point, why });
    if (!(reading.frequency_hz > 0) || !Number.isFinite(reading.frequency_hz)) {
      throw new FitError(`${where}: frequency_hz must be a frequency above zero, got ${reading.frequency_hz}`);
    }
    const probe = probeOf(reading, index, board, where);
    if (reading.flag === 'invalid') return skip('flagged invalid');
    const magnitude = Math.hypot(reading.re, reading.im);
    if (!Number.isFinite(magnitude)) return skip('value is not finite');
    if (magnitude === 0) return skip('value is zero (log |Z| undefined)');
    const prepared: PreparedReading = { index: i, reading, probe, magnitude, re: reading.re, im: reading.im };
    const list = byFrequency.get(reading.frequency_hz);
    if (list) list.push(prepared);
    else byFrequency.set(reading.frequency_hz, [prepared]);
  });
  const groups = [...byFrequency.entries()]
    .sort(([a], [b]) => a - b)
    .map(([frequencyHz, list]): FrequencyGroup => {
      const rows = new Set<number>();
      for (const { probe } of list) for (const row of [probe.hi, probe.lo, probe.sense]) if (row >= 0) rows.add(row);
      return { frequencyHz, readings: list, rows: [...rows] };
    });
  return { groups, used: groups.flatMap((g) => g.readings), skipped };
}

function probeOf(reading: Reading, index: NodeIndex, board: Board, where: string): Probe {
  const row = (field: 'hi' | 'lo' | 'sense', name: string | undefined): number => {
    if (name === undefined || name === '') throw new FitError(`${where}: ${field} names no node`);
    const node = isGroundName(name) ? GROUND : name;
    if (!index.has(node)) throw new FitError(`${where}: ${field}: node ${JSON.stringify(name)} is not on board ${board.name}`);
    return index.row(node);
  };
  const hi = row('hi', reading.hi);
  const lo = row('lo', reading.lo);
  if (hi < 0) throw new FitError(`${where}: hi is ground; the current must be driven into a board node`);
  switch (reading.kind) {
    case 'to-ground':
      if (lo >= 0) throw new FitError(`${where}: a to-ground reading needs lo = gnd, got ${JSON.stringify(reading.lo)}`);
      return { hi, lo, sense: hi };
    case 'two-point':
      if (lo === hi) throw new FitError(`${where}: hi and lo are the same node ${JSON.stringify(reading.hi)}`);
      return { hi, lo, sense: hi };
    case 'transfer': {
      const sense = row('sense', reading.sense);
      if (sense === lo) throw new FitError(`${where}: sense is the lo node, so the reading is always zero`);
      if (lo === hi) throw new FitError(`${where}: hi and lo are the same node ${JSON.stringify(reading.hi)}`);
      return { hi, lo, sense };
    }
    default:
      throw new FitError(`${where}: kind must be to-ground, two-point or transfer, got ${JSON.stringify((reading as { kind: unknown }).kind)}`);
  }
}
