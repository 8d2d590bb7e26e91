// The runner on the simulated bench in process, through the real session, driver and SCPI parser code:
// the order of relay and excitation commands (the safety rules of the README, common practice for relay
// matrices), every planned reading once, retries, reconnects, error-queue warnings, stops and relays that
// do not do what they are told.
import { afterEach, describe, expect, it } from 'vitest';
import { lastValueFrom, toArray } from 'rxjs';
import { PassThrough } from 'node:stream';
import { loadBoard } from '../../../src/board/index.js';
import { GROUND } from '../../../src/board/types.js';
import { noWaits, realWaits } from '../../../src/run/bench-control.js';
import { operatorPrompt } from '../../../src/run/probe-guide.js';
import type { ReadingTaken, RunEvent, ScanDone } from '../../../src/run/run-events.js';
import { runScanJob, type JobOutcome } from '../../../src/run/scan-job.js';
import { StopSignal } from '../../../src/run/stop-signal.js';
import { simulatedProbeHands } from '../../../src/run/bench/simulated-probes.js';
import { readingKey } from '../../../src/run/work-list.js';
import { testPlan } from '../../run/support/test-plan.js';
import { benchUnderTest, quickProfile, type BenchUnderTest } from './support/bench-under-test.js';
import type { ScanPlan } from '../../../src/plan/types.js';

const board = loadBoard('shared/boards/chain-24.yaml');
// 100 kHz and 220 kHz: below and above the bulk bands' troubled middle, where the fixture's strays are small.
const FREQUENCIES = [100e3, 220e3];
const NODES = ['n1', 'n2', 'n3', 'n12', 'n13', 'n24'];
const plan = testPlan(board, { frequencies: FREQUENCIES, steps: NODES.map((hi) => ({ hi })) });
const RETRY = { retries: 3, reconnects: 4, baseDelayMs: 5, maxDelayMs: 20 };

let open: BenchUnderTest | undefined;
afterEach(async () => {
  await open?.close();
  open = undefined;
});

async function run(b: BenchUnderTest, p: ScanPlan = plan, extra: Partial<Parameters<typeof runScanJob>[0]> = {}) {
  open = b;
  await b.start();
  let outcome: JobOutcome | undefined;
  const events = await lastValueFrom(
    runScanJob({ plan: p, planName: 'test plan', analyzer: b.analyzer, switchMatrix: b.switchMatrix, stop: new StopSignal(), waits: noWaits, retry: RETRY, onOutcome: (o) => (outcome = o), ...extra }).pipe(toArray()),
  );
  return { events, outcome: outcome!, readings: events.filter((e): e is ReadingTaken => e.event === 'reading'), done: events.at(-1) as ScanDone };
}

const keys = (readings: ReadingTaken[]) => readings.map((r) => readingKey(r.step, r.point));
const everyKey = (p: ScanPlan) => p.steps.flatMap((s) => s.points.map((_, i) => readingKey(s.step, i + 1)));

describe('a clean run', () => {
  it('reads every planned point once, in plan order, all within ±5 % of the engine on a fault-free board', async () => {
    const { readings, done } = await run(benchUnderTest(board, plan));
    expect(keys(readings)).toEqual(everyKey(plan));
    expect(readings.every((r) => r.flag === 'ok')).toBe(true);
    expect(done).toMatchObject({ status: 'complete', readings: plan.steps.length * FREQUENCIES.length, deviations: 0, invalid: 0, safe: true });
  });

  it('switches break before make with the excitation at its minimum, and ties no two nodes to one bus', async () => {
    const b = benchUnderTest(board, plan);
    const changes: number[][] = [];
    b.bench.switchMatrix.onChange((closed) => changes.push([...closed].sort((x, y) => x - y)));
    await run(b);
    // README, Safety (common practice): relays switch only with the excitation at its minimum, open before close.
    const minimum = b.analyzer.profile.limits.levelV.min;
    let level: number | undefined;
    let lastOpenConfirmed = true;
    for (const { who, message } of b.heard) {
      const volts = /^SOURce:VOLTage:LEVel (\S+)$/.exec(message);
      if (volts) level = Number(volts[1]);
      if (who === 'switch' && /^ROUTe:(CLOSe|OPEN)( |:ALL)/.test(message)) expect(level).toBe(minimum);
      if (who === 'switch' && /^ROUTe:OPEN /.test(message)) lastOpenConfirmed = false;
      if (who === 'switch' && /^ROUTe:CLOSe\? /.test(message)) lastOpenConfirmed = true;
      if (who === 'switch' && /^ROUTe:CLOSe \(/.test(message)) expect(lastOpenConfirmed).toBe(true);
    }
    expect(b.bench.switchMatrix.conflicts()).toEqual([]);
    // Never more than one node on HI: each contact state holds at most one HI channel (1001..1999).
    for (const closed of changes) expect(closed.filter((c) => c > 1000 && c < 2000).length).toBeLessThanOrEqual(1);
    // The LO channel of ground is shared by every step: it stays closed instead of cycling (relay life).
    expect(b.bench.switchMatrix.cycles(b.bench.fixture.channel(GROUND, 'lo')!)).toBe(2);
    // And at the end every relay is open.
    expect([...b.bench.switchMatrix.closedChannels()]).toEqual([]);
  });

  it('sends a frequency only when it changes', async () => {
    const single = testPlan(board, { frequencies: [150e3], steps: [{ hi: 'n1' }, { hi: 'n2' }, { hi: 'n3' }] });
    const b = benchUnderTest(board, single);
    await run(b, single);
    expect(b.heard.filter((h) => h.message.startsWith('SOURce:FREQuency')).length).toBe(1);
  });
});

describe('a seeded fault', () => {
  it('is flagged at the nodes around the open part (C_intra_0, between n1 and n2) and not at the far end', async () => {
    const { readings, done } = await run(benchUnderTest(board, plan, { faults: ['C_intra_0=open'] }));
    const flaggedAt = new Set(readings.filter((r) => r.flag === 'deviation').map((r) => r.hi));
    expect(flaggedAt.has('n1')).toBe(true);
    expect(flaggedAt.has('n2')).toBe(true);
    for (const far of ['n12', 'n13', 'n24']) expect(flaggedAt.has(far)).toBe(false);
    expect(done.status).toBe('complete');
    expect(done.deviations).toBeGreaterThan(0);
  });

  it('follows every deviation with its deviation event naming what lies outside', async () => {
    const { events } = await run(benchUnderTest(board, plan, { faults: ['C_intra_0=open'] }));
    events.forEach((e, i) => {
      if (e.event === 'reading' && e.flag === 'deviation') {
        const next = events[i + 1] as RunEvent;
        expect(next.event).toBe('deviation');
        if (next.event !== 'deviation') return;
        expect([next.step, next.point]).toEqual([e.step, e.point]);
        const mag = Math.hypot(e.re!, e.im!);
        expect(next.magnitude_ohm).toBeCloseTo(mag, 9);
        const outsideMagnitude = mag < next.band.mag_lo_ohm || mag > next.band.mag_hi_ohm;
        expect(next.outside.includes('magnitude')).toBe(outsideMagnitude);
      }
    });
  });
});

describe('resuming', () => {
  it('reads exactly the points not yet logged', async () => {
    const all = everyKey(plan);
    const done = new Set(all.filter((_, i) => i % 3 === 0));
    const { readings } = await run(benchUnderTest(board, plan), plan, { done });
    const read = keys(readings);
    expect(read.filter((k) => done.has(k))).toEqual([]);
    expect(new Set([...read, ...done])).toEqual(new Set(all));
    expect(read.length + done.size).toBe(all.length);
  });
});

describe('trouble on the line', () => {
  it('asks again after late answers, with no reading twice or missing', async () => {
    const b = benchUnderTest(board, plan, { analyzerProfile: quickProfile('generic-analyzer'), analyzerMisbehaviour: { late: { rate: 0.1, delayMs: 250 }, spare: 4 } });
    const { readings, done, events } = await run(b);
    expect(done.status).toBe('complete');
    expect(keys(readings)).toEqual(everyKey(plan));
    expect(events.some((e) => e.event === 'warning' && /trying again/.test(e.message))).toBe(true);
  });

  it('reconnects a dropped line and continues where it stopped', async () => {
    const b = benchUnderTest(board, plan, { analyzerMisbehaviour: { disconnectAfter: 25 } });
    const { readings, done, events } = await run(b);
    expect(done.status).toBe('complete');
    expect(keys(readings)).toEqual(everyKey(plan));
    expect(events.filter((e) => e.event === 'warning' && /reconnected/.test(e.message)).length).toBeGreaterThan(0);
  });

  it('turns error-queue entries into warnings and keeps going', async () => {
    const b = benchUnderTest(board, plan, { analyzerMisbehaviour: { spuriousError: { every: 9, code: -200, detail: 'spurious' } } });
    const { done, events, readings } = await run(b);
    expect(done.status).toBe('complete');
    expect(keys(readings)).toEqual(everyKey(plan));
    // SCPI-99 vol. 2 (from memory): -200 is "Execution error".
    expect(events.some((e) => e.event === 'warning' && /-200/.test(e.message))).toBe(true);
  });

  it('asks once more after an unreadable answer and logs the reading invalid, with the reason, if it stays so', async () => {
    // IEEE 488.2 numeric response data (from memory): "abc" is no NR1, NR2 or NR3 number.
    let reads = 0;
    const b = benchUnderTest(board, plan, {
      wrapAnalyzer: (device) => ({
        get identity() {
          return device.identity;
        },
        async receive(message) {
          const answer = await device.receive(message);
          if (message !== 'READ?') return answer;
          reads++;
          // Step 1 reads garbled for good; elsewhere only the first try of each point is garbled.
          return reads <= 4 || reads % 2 === 1 ? 'abc,1' : answer;
        },
        reset: () => device.reset(),
        injectError: (code, detail) => device.injectError?.(code, detail),
      }),
    });
    const { readings, done } = await run(b);
    expect(keys(readings)).toEqual(everyKey(plan));
    const invalid = readings.filter((r) => r.flag === 'invalid');
    expect(invalid.map((r) => r.step)).toEqual([1, 1]);
    for (const r of invalid) expect(r.note).toMatch(/^unreadable: answer to "READ\?"/);
    expect(readings.filter((r) => r.step > 1).every((r) => r.flag === 'ok')).toBe(true);
    expect(done).toMatchObject({ status: 'complete', invalid: 2 });
  });

  it('stops with an instrument failure when a relay does not report what it was told', async () => {
    // A matrix that always says "open": the close it was given is never confirmed.
    const b = benchUnderTest(board, plan, {
      wrapSwitch: (device) => ({
        get identity() {
          return device.identity;
        },
        async receive(message) {
          const answer = await device.receive(message);
          return /^ROUTe:CLOSe\? /.test(message) && answer ? answer.replace(/1/g, '0') : answer;
        },
        reset: () => device.reset(),
      }),
    });
    const { done, outcome, readings } = await run(b);
    expect(readings).toEqual([]);
    expect(done.status).toBe('failed');
    expect(outcome.cause).toBe('instrument');
    expect(done.reason).toMatch(/still open/);
  });
});

describe('stopping', () => {
  it('finishes the reading in hand, opens every relay and sets the excitation to its minimum', async () => {
    const b = benchUnderTest(board, plan);
    const stop = new StopSignal();
    open = b;
    await b.start();
    const events: RunEvent[] = [];
    await new Promise<void>((resolve) => {
      runScanJob({ plan, planName: 'test plan', analyzer: b.analyzer, switchMatrix: b.switchMatrix, stop, waits: realWaits, retry: RETRY }).subscribe({
        next: (e) => {
          events.push(e);
          if (e.event === 'reading' && e.point === 1 && e.step === 3) stop.request('test stop');
        },
        complete: resolve,
      });
    });
    const done = events.at(-1) as ScanDone;
    expect(done).toMatchObject({ status: 'interrupted', safe: true, reason: 'test stop' });
    const readings = events.filter((e): e is ReadingTaken => e.event === 'reading');
    expect(keys(readings)).toEqual(everyKey(plan).slice(0, readings.length));
    expect(readings.length).toBeLessThan(everyKey(plan).length);
    expect([...b.bench.switchMatrix.closedChannels()]).toEqual([]);
    expect(Number(await b.analyzer.session.query('SOURce:VOLTage:LEVel?'))).toBe(b.analyzer.profile.limits.levelV.min);
  });
});

describe('operator-probed mode', () => {
  it('asks for each placement on stderr, waits for Enter, then measures', async () => {
    const b = benchUnderTest(board, plan);
    open = b;
    await b.start();
    const answers = new PassThrough();
    const prompts = new PassThrough();
    let said = '';
    prompts.on('data', (c: Buffer) => {
      said += c.toString();
      // Enter for every prompt, as an operator would once the probes sit.
      if (/press Enter\n$/.test(said)) answers.write('\n');
    });
    const probes = operatorPrompt(answers, prompts, simulatedProbeHands(b.bench));
    const events = await lastValueFrom(runScanJob({ plan, planName: 'test plan', analyzer: b.analyzer, probes, stop: new StopSignal(), waits: noWaits, retry: RETRY }).pipe(toArray()));
    probes.close();
    const readings = events.filter((e): e is ReadingTaken => e.event === 'reading');
    expect(keys(readings)).toEqual(everyKey(plan));
    expect(readings.every((r) => r.flag === 'ok')).toBe(true);
    for (const node of NODES) expect(said).toContain(`HI to ${node}, LO to gnd`);
    expect(said).toMatch(/probes may come off/);
    expect(events.at(-1)).toMatchObject({ event: 'done', status: 'complete' });
  });

  it('ends as interrupted when stdin closes while waiting', async () => {
    const b = benchUnderTest(board, plan);
    open = b;
    await b.start();
    const answers = new PassThrough();
    const probes = operatorPrompt(answers, new PassThrough(), simulatedProbeHands(b.bench));
    answers.end();
    const events = await lastValueFrom(runScanJob({ plan, planName: 'test plan', analyzer: b.analyzer, probes, stop: new StopSignal(), waits: noWaits, retry: RETRY }).pipe(toArray()));
    expect(events.at(-1)).toMatchObject({ event: 'done', status: 'interrupted', readings: 0 });
  });
});
