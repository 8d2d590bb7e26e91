// Reads a scan log back for a resume: the complete records (checked, column by column), the length in
// bytes of what ends in a complete record, and a torn last line, if a kill left one, to be cut off. A log
// that is damaged anywhere else is refused, never "repaired": its readings are the lab's.
import { readFileSync } from 'node:fs';
import { parse } from 'csv-parse/sync';
import type { ReadingFlag } from '../run/run-events.js';
import { GROUND } from '../board/types.js';
import { LOG_COLUMNS, type LogRow } from './log-columns.js';
import { LogError } from './log-error.js';
import { CSV_RECORD_END } from './log-writer.js';

export interface LogContents {
  rows: LogRow[];
  /** Bytes up to and including the last complete record's CR LF (0: not even a whole header). */
  goodBytes: number;
  /** The bytes after the last complete record, when there are any. */
  torn?: string;
}

const KINDS = new Set(['to-ground', 'two-point', 'transfer']);
const FLAGS = new Set<ReadingFlag>(['ok', 'deviation', 'invalid']);

export function readLog(file: string): LogContents {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new LogError(file, code === 'ENOENT' ? 'no such log' : `cannot read it: ${(error as Error).message}`);
  }
  const text = bytes.toString('utf8');
  const end = text.lastIndexOf(CSV_RECORD_END);
  const goodText = end < 0 ? '' : text.slice(0, end + CSV_RECORD_END.length);
  const tornText = text.slice(goodText.length);
  // Only the last write can be torn, and a row is one line: a tail holding a line break is not a torn row.
  if (/[\r\n]/.test(tornText)) throw new LogError(file, 'does not end in CR LF records as a topoprobe log does; refusing to touch it');
  const goodBytes = Buffer.byteLength(goodText, 'utf8');
  if (goodText === '') return { rows: [], goodBytes: 0, ...(tornText ? { torn: tornText } : {}) };

  let records: string[][];
  try {
    records = parse(goodText, { record_delimiter: CSV_RECORD_END, relax_column_count: false });
  } catch (error) {
    throw new LogError(file, `is not valid CSV: ${(error as Error).message}`);
  }
  const [header, ...body] = records;
  if (header.join(',') !== LOG_COLUMNS.join(',')) {
    throw new LogError(file, `has the columns ${header.join(',')}, expected ${LOG_COLUMNS.join(',')}`);
  }
  const rows = body.map((cells, i) => readRow(file, cells, i + 2));
  return { rows, goodBytes, ...(tornText ? { torn: tornText } : {}) };
}

function readRow(file: string, cells: string[], line: number): LogRow {
  const at = (column: string, why: string) => new LogError(file, `line ${line}, column ${column}: ${why}`);
  const cell = (name: (typeof LOG_COLUMNS)[number]) => cells[LOG_COLUMNS.indexOf(name)];
  const whole = (name: 'step' | 'point') => {
    const v = Number(cell(name));
    if (!/^\d+$/.test(cell(name)) || v < 1) throw at(name, `${JSON.stringify(cell(name))} is not a whole number from 1`);
    return v;
  };
  const real = (name: 'frequency_hz' | 're' | 'im' | 'pred_re' | 'pred_im', optional = false) => {
    const text = cell(name);
    if (optional && text === '') return null;
    const v = Number(text);
    if (text.trim() === '' || !Number.isFinite(v)) throw at(name, `${JSON.stringify(text)} is not a number`);
    return v;
  };
  const kind = cell('kind');
  if (!KINDS.has(kind)) throw at('kind', `${JSON.stringify(kind)} is not to-ground, two-point or transfer`);
  const flag = cell('flag') as ReadingFlag;
  if (!FLAGS.has(flag)) throw at('flag', `${JSON.stringify(flag)} is not ok, deviation or invalid`);
  const invalid = flag === 'invalid';
  const row: LogRow = {
    step: whole('step'),
    point: whole('point'),
    kind: kind as LogRow['kind'],
    hi: cell('hi'),
    lo: cell('lo'),
    frequency_hz: real('frequency_hz')!,
    re: real('re', invalid),
    im: real('im', invalid),
    pred_re: real('pred_re')!,
    pred_im: real('pred_im')!,
    flag,
    time: cell('time'),
  };
  if (cell('sense') !== '') row.sense = cell('sense');
  if (cell('note') !== '') row.note = cell('note');
  checkTerminals(row, at);
  return row;
}

/** What every plan step guarantees (plan-checks.ts), so a row breaking it was edited or damaged. */
function checkTerminals(row: LogRow, at: (column: string, why: string) => LogError): void {
  if (!(row.frequency_hz > 0)) throw at('frequency_hz', `${row.frequency_hz} is not a frequency above zero`);
  if (row.hi === '' || row.hi === GROUND) throw at('hi', `${JSON.stringify(row.hi)} is not a board node`);
  if (row.kind === 'two-point') {
    if (row.lo === '' || row.lo === GROUND || row.lo === row.hi) throw at('lo', `${JSON.stringify(row.lo)}: a two-point reading needs a second board node`);
  } else if (row.lo !== GROUND) {
    throw at('lo', `${JSON.stringify(row.lo)}: a ${row.kind} reading has lo "${GROUND}"`);
  }
  if (row.kind === 'transfer' && (row.sense === undefined || row.sense === GROUND)) throw at('sense', 'a transfer reading names the board node it senses');
  if (row.kind !== 'transfer' && row.sense !== undefined) throw at('sense', `only transfer readings sense a node; this is a ${row.kind} reading`);
}
