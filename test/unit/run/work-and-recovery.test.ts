// What is left to read after a resume (every planned reading exactly once between the log and the run),
// the running counts, and how trouble is sorted and paced (exponential backoff, common practice).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { AnswerError, InstrumentError, LimitError, TransportError } from '../../../src/instruments/index.js';
import { loadBoard } from '../../../src/board/index.js';
import { backoffMs, classifyTrouble, DEFAULT_RETRY } from '../../../src/run/recovery.js';
import { addEvent, EMPTY_TALLY, flagged } from '../../../src/run/run-tally.js';
import { pendingWork, readingKey, totalReadings } from '../../../src/run/work-list.js';
import { RelayStateError } from '../../../src/run/bench-control.js';
import { testPlan } from '../../run/support/test-plan.js';
import type { ReadingTaken } from '../../../src/run/run-events.js';

const board = loadBoard('shared/boards/chain-24.yaml');
const plan = testPlan(board, { frequencies: [100e3, 120e3, 220e3], steps: ['n1', 'n2', 'n3', 'n4'].map((hi) => ({ hi })) });
const all = plan.steps.flatMap((s) => s.points.map((_, i) => readingKey(s.step, i + 1)));

describe('the work left', () => {
  it('is every planned reading not yet logged, each once, in plan order', () => {
    fc.assert(
      fc.property(fc.subarray(all), (logged) => {
        const done = new Set(logged);
        const left = pendingWork(plan, done).flatMap((w) => w.points.map((p) => readingKey(w.step.step, p.point)));
        expect(new Set(left).size).toBe(left.length);
        expect(left.filter((k) => done.has(k))).toEqual([]);
        expect(left.length + done.size).toBe(totalReadings(plan));
        expect(left).toEqual(all.filter((k) => !done.has(k)));
      }),
    );
  });
});

describe('the tally', () => {
  it('counts readings, deviations and invalid readings; both of the latter are flagged', () => {
    const r = (flag: ReadingTaken['flag']) => ({ event: 'reading', flag }) as ReadingTaken;
    const t = [r('ok'), r('deviation'), r('invalid'), r('ok'), r('deviation')].reduce(addEvent, EMPTY_TALLY);
    expect(t).toEqual({ readings: 5, deviations: 2, invalid: 1 });
    expect(flagged(t)).toBe(3);
  });
});

describe('trouble', () => {
  it('rides out late, garbled and refused answers and dropped lines; anything else stops the run', () => {
    expect(classifyTrouble(new TransportError('x', 'timeout', 'late'))).toBe('late');
    expect(classifyTrouble(new TransportError('x', 'garbage', 'noise'))).toBe('garbled');
    expect(classifyTrouble(new TransportError('x', 'closed', 'gone'))).toBe('line-lost');
    expect(classifyTrouble(new AnswerError('READ?', 'xyz', 'is not a number'))).toBe('garbled');
    // SCPI-99 vol. 2 (from memory): -222 Data out of range, a refusal that left an entry behind.
    expect(classifyTrouble(new InstrumentError('refused', [{ code: -222, message: 'Data out of range' }]))).toBe('refused');
    expect(classifyTrouble(new InstrumentError('identity does not match'))).toBe('fatal');
    expect(classifyTrouble(new RelayStateError('relay stuck'))).toBe('fatal');
    expect(classifyTrouble(new LimitError('too high', 'limits.level.max'))).toBe('fatal');
    expect(classifyTrouble(new TransportError('x', 'no-such-port', 'no port'))).toBe('fatal');
  });

  it('waits twice as long each time, up to a cap', () => {
    const waits = [1, 2, 3, 4, 5, 6, 7, 8].map((n) => backoffMs(DEFAULT_RETRY, n));
    for (let i = 1; i < waits.length; i++) expect(waits[i]).toBe(Math.min(DEFAULT_RETRY.maxDelayMs, 2 * waits[i - 1]));
    expect(waits[0]).toBe(DEFAULT_RETRY.baseDelayMs);
    expect(Math.max(...waits)).toBe(DEFAULT_RETRY.maxDelayMs);
  });
});
