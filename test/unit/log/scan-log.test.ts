// The scan log: RFC 4180 records read back by an independent parser (csv-parse), rows on disk the moment
// they are written, a torn last line found and cut on resume, the meta file replaced atomically, and a
// resume refused for another plan, another board, a complete log or a damaged one.
import { appendFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import { beforeEach, describe, expect, it } from 'vitest';
import { LOG_COLUMNS } from '../../../src/log/log-columns.js';
import { LogError } from '../../../src/log/log-error.js';
import { readMeta, writeMeta } from '../../../src/log/log-meta.js';
import { metaPathOf } from '../../../src/log/log-paths.js';
import { readLog } from '../../../src/log/log-reader.js';
import { csvLine, LogWriter } from '../../../src/log/log-writer.js';
import { checkResume, ScanLog, type LogSetting } from '../../../src/log/scan-log.js';
import type { ReadingTaken } from '../../../src/run/run-events.js';
import { makeBoard } from '../../support/make-board.js';

let dir: string;
beforeEach(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-log-'));
});

function reading(step: number, point: number, extra: Partial<ReadingTaken> = {}): ReadingTaken {
  return {
    event: 'reading',
    time: new Date(Date.UTC(2025, 0, 1, 0, 0, step, point)).toISOString(),
    step,
    point,
    kind: 'to-ground',
    hi: `n${step}`,
    lo: 'gnd',
    frequency_hz: 100e3 + point,
    re: 1 / 3 + step,
    im: -Math.PI * point,
    pred_re: 0.1 + step,
    pred_im: -3 * point,
    flag: 'ok',
    ...extra,
  };
}

const board = makeBoard('tiny', [['C', 'a', 'gnd', 1e-9], ['L', 'a', 'gnd', 1e-6]]);
const setting: LogSetting = {
  plan: { file: '/plans/tiny.json', sha256: 'a'.repeat(64), created: '2025-01-01T00:00:00Z', software: 'test' },
  board: { name: 'tiny', hash: 'b'.repeat(64), snapshot: board },
  mode: 'switched',
  instruments: { analyzer: { profile: 'generic-analyzer', address: 'memory:analyzer', identity: null }, switch: null },
  simulated: { faults: [], seed: 1, timing: 'instant' },
};
const expectPlan = { planSha256: 'a'.repeat(64), boardHash: 'b'.repeat(64), hasReading: (s: number, p: number) => s >= 1 && s <= 9 && p >= 1 && p <= 9 };

describe('the CSV', () => {
  it('is RFC 4180: a header, CR LF record ends, quoting of commas, quotes and line breaks', () => {
    // RFC 4180 section 2 (from memory): CRLF ends records; fields with commas, quotes or breaks are quoted,
    // an embedded quote is doubled.
    const line = csvLine(['plain', 'a,b', 'say "hi"', 'two\nlines', 42]);
    expect(line.endsWith('\r\n')).toBe(true);
    const [fields] = parse(line) as string[][];
    expect(fields).toEqual(['plain', 'a,b', 'say "hi"', 'two lines', '42']);
    expect(line).toContain('"say ""hi"""');
  });

  it('writes every reading as a row an independent parser reads back exactly', () => {
    const file = path.join(dir, 'scan.csv');
    const writer = LogWriter.create(file);
    const rows = [reading(1, 1), reading(1, 2, { flag: 'deviation' }), reading(2, 1, { flag: 'invalid', re: null, im: null, note: 'overload' }), reading(3, 1, { kind: 'transfer', sense: 'n5' })];
    for (const r of rows) writer.write(r);
    // Written through before close: what a kill -9 at this moment would leave on disk.
    const records = parse(readFileSync(file, 'utf8'), { columns: true }) as Record<string, string>[];
    writer.close();
    expect(Object.keys(records[0])).toEqual([...LOG_COLUMNS]);
    expect(records.length).toBe(rows.length);
    records.forEach((rec, i) => {
      const r = rows[i];
      expect(Number(rec.step)).toBe(r.step);
      expect(Number(rec.point)).toBe(r.point);
      expect(rec.flag).toBe(r.flag);
      // Numbers in shortest round-trip form: read back bit for bit.
      expect(rec.re === '' ? null : Number(rec.re)).toBe(r.re);
      expect(rec.im === '' ? null : Number(rec.im)).toBe(r.im);
      expect(Number(rec.frequency_hz)).toBe(r.frequency_hz);
      expect(rec.sense).toBe(r.sense ?? '');
    });
    expect(readLog(file).rows.map((r) => [r.step, r.point, r.flag, r.re])).toEqual(rows.map((r) => [r.step, r.point, r.flag, r.re]));
  });
});

describe('a torn last line', () => {
  it('is found, cut off on resume, and the log goes on cleanly after the last whole record', () => {
    const file = path.join(dir, 'scan.csv');
    const writer = LogWriter.create(file);
    for (let p = 1; p <= 3; p++) writer.write(reading(1, p));
    writer.close();
    const whole = readFileSync(file).length;
    const next = csvLine(['1', '4', 'to-ground', 'n1', 'gnd', '', '100004']);
    appendFileSync(file, next.slice(0, 17)); // a kill in the middle of a write
    const contents = readLog(file);
    expect(contents.rows.length).toBe(3);
    expect(contents.goodBytes).toBe(whole);
    expect(contents.torn).toBe(next.slice(0, 17));

    const resumed = LogWriter.resume(file, contents.goodBytes);
    resumed.write(reading(1, 4));
    resumed.close();
    const after = readLog(file);
    expect(after.torn).toBeUndefined();
    expect(after.rows.map((r) => r.point)).toEqual([1, 2, 3, 4]);
  });

  it('a file that is not CR LF records is refused rather than cut', () => {
    const file = path.join(dir, 'other.csv');
    writeFileSync(file, `${LOG_COLUMNS.join(',')}\n1,1,to-ground\n`);
    expect(() => readLog(file)).toThrow(LogError);
    expect(() => readLog(file)).toThrow(/refusing to touch it/);
  });

  it('a damaged cell names its line and column', () => {
    const file = path.join(dir, 'bad.csv');
    const writer = LogWriter.create(file);
    writer.write(reading(1, 1));
    writer.close();
    appendFileSync(file, csvLine(['x', '2', 'to-ground', 'n1', 'gnd', '', '1', '1', '1', '1', '1', 'ok', '', 't']));
    expect(() => readLog(file)).toThrow(/line 3, column step/);
  });
});

describe('the meta file', () => {
  it('is replaced atomically: no temporary file left, the new content read back whole', () => {
    const file = path.join(dir, 'scan.csv');
    const log = ScanLog.create(file, setting);
    const before = readMeta(metaPathOf(file));
    expect(before.status).toBe('running');
    log.record(reading(1, 1));
    log.record(reading(1, 2, { flag: 'deviation' }));
    log.finish({ status: 'interrupted', reason: 'test', safe: true });
    const meta = readMeta(metaPathOf(file));
    expect(meta).toMatchObject({ status: 'interrupted', readings: 2, deviations: 1, invalid: 0 });
    expect(meta.runs).toHaveLength(1);
    expect(meta.runs[0]).toMatchObject({ status: 'interrupted', readings: 2, reason: 'test', safe: true });
    expect(meta.board.snapshot.parts.length).toBe(board.parts.length);
    expect(readdirSync(dir).sort()).toEqual(['scan.csv', 'scan.csv.meta.json']);
  });

  it('a meta file that is not ours is one line naming the file and field', () => {
    const file = path.join(dir, 'm.json');
    writeMeta(file, { ...readyMeta(), status: 'complete' });
    const text = JSON.parse(readFileSync(file, 'utf8'));
    text.plan.sha256 = 'short';
    writeFileSync(file, JSON.stringify(text));
    expect(() => readMeta(file)).toThrow(/m\.json: plan\.sha256/);
  });
});

function readyMeta() {
  const file = path.join(dir, 'seed.csv');
  ScanLog.create(file, setting).finish({ status: 'complete', safe: true });
  return readMeta(metaPathOf(file));
}

describe('resuming', () => {
  function interruptedLog(rows: ReadingTaken[]): string {
    const file = path.join(dir, 'scan.csv');
    const log = ScanLog.create(file, setting);
    for (const r of rows) log.record(r);
    log.finish({ status: 'interrupted', safe: true });
    return file;
  }

  it('knows every logged reading and its counts, and adds a run to the meta', () => {
    const file = interruptedLog([reading(1, 1), reading(1, 2, { flag: 'invalid', re: null, im: null }), reading(2, 1, { flag: 'deviation' })]);
    const point = checkResume(file, expectPlan);
    expect([...point.done].sort()).toEqual(['1:1', '1:2', '2:1']);
    expect(point.tally).toEqual({ readings: 3, deviations: 1, invalid: 1 });
    const log = ScanLog.resume(point, setting);
    log.record(reading(2, 2));
    log.finish({ status: 'complete', safe: true });
    const meta = readMeta(metaPathOf(file));
    expect(meta.runs.map((r) => [r.status, r.readings])).toEqual([['interrupted', 3], ['complete', 1]]);
    expect(meta.readings).toBe(4);
    expect(readLog(file).rows.map((r) => `${r.step}:${r.point}`)).toEqual(['1:1', '1:2', '2:1', '2:2']);
  });

  it('treats a meta left "running" (the process was killed) as interrupted', () => {
    const file = path.join(dir, 'killed.csv');
    const log = ScanLog.create(file, setting);
    log.record(reading(1, 1));
    // no finish: as after kill -9
    const point = checkResume(file, expectPlan);
    ScanLog.resume(point, setting).finish({ status: 'complete', safe: true });
    expect(readMeta(metaPathOf(file)).runs[0]).toMatchObject({ status: 'interrupted' });
  });

  it('refuses another plan, another board, a complete log, and a reading logged twice', () => {
    const file = interruptedLog([reading(1, 1)]);
    expect(() => checkResume(file, { ...expectPlan, planSha256: 'c'.repeat(64) })).toThrow(/another plan/);
    expect(() => checkResume(file, { ...expectPlan, boardHash: 'd'.repeat(64) })).toThrow(/was made for board tiny/);
    expect(() => checkResume(file, { ...expectPlan, hasReading: () => false })).toThrow(/is not in the plan/);
    appendFileSync(file, csvLine(['1', '1', 'to-ground', 'n1', 'gnd', '', '1', '1', '1', '1', '1', 'ok', '', 't']));
    expect(() => checkResume(file, expectPlan)).toThrow(/logged twice/);
    const complete = path.join(dir, 'done.csv');
    ScanLog.create(complete, setting).finish({ status: 'complete', safe: true });
    expect(() => checkResume(complete, expectPlan)).toThrow(/complete already/);
    expect(() => checkResume(path.join(dir, 'none.csv'), expectPlan)).toThrow(/no meta file/);
  });

  it('never replaces an existing log when asked for a new one', () => {
    const file = interruptedLog([reading(1, 1)]);
    const before = readFileSync(file);
    expect(() => ScanLog.create(file, setting)).toThrow(/exists already/);
    expect(readFileSync(file).equals(before)).toBe(true);
    expect(existsSync(metaPathOf(file))).toBe(true);
  });
});
