// Misbehaviour decisions: reproducible from the seed, at the configured rates, and carried out by the
// in-process wrapper. Rates are checked against the binomial spread (common practice): n = 2000 draws at
// p = 0.3 have a standard deviation of sqrt(n p (1 - p)) ~ 20.5, so 600 +- 100 is about five sigma.

import { describe, expect, it } from 'vitest';
import { SimulatedAnalyzer } from '../../../simulators/analyzer.js';
import { Misbehaviour, MisbehaviourOptionsError, answerBytes, withMisbehaviour, type LinkDecision, type MisbehaviourOptions } from '../../../simulators/misbehaviour.js';

const analyzer = () => new SimulatedAnalyzer({ source: { measure: () => ({ re: 50, im: -20 }) }, timeScale: 0 });

const everything: Omit<MisbehaviourOptions, 'seed'> = {
  late: { rate: 0.2, delayMs: 3000 },
  drop: { rate: 0.1 },
  garbage: { rate: 0.15, mode: 'prefix', bytes: 6 },
  disconnectAfter: 37,
  spuriousError: { every: 11 },
};

function run(seed: number, count: number, options = everything): LinkDecision[] {
  const m = new Misbehaviour({ seed, ...options });
  return Array.from({ length: count }, (_, i) => m.decide(i % 3 === 0 ? 'FREQ 1k' : 'READ?'));
}

describe('decisions are deterministic per seed', () => {
  it('the same seed gives the same decisions, byte for byte', () => {
    expect(run(20240611, 300)).toEqual(run(20240611, 300));
  });

  it('another seed gives another pattern', () => {
    const pattern = (d: LinkDecision[]) => d.map((x) => `${x.delayMs > 0 ? 'L' : '-'}${x.drop ? 'D' : '-'}${x.corrupt ? 'G' : '-'}`).join('');
    expect(pattern(run(1, 300))).not.toBe(pattern(run(2, 300)));
  });

  it('one kind of trouble does not shift another: adding garbage leaves the late answers where they were', () => {
    const late = (d: LinkDecision[]) => d.map((x) => x.delayMs);
    expect(late(run(5, 200, { late: { rate: 0.3, delayMs: 100 } }))).toEqual(late(run(5, 200, { late: { rate: 0.3, delayMs: 100 }, garbage: { rate: 0.5, mode: 'replace' } })));
  });
});

describe('rates and counts', () => {
  it('a rate of 0.3 hits about 30 % of the queries (binomial, five sigma)', () => {
    const m = new Misbehaviour({ seed: 9, drop: { rate: 0.3 } });
    const dropped = Array.from({ length: 2000 }, () => m.decide('FETC?')).filter((d) => d.drop).length;
    expect(dropped).toBeGreaterThan(500);
    expect(dropped).toBeLessThan(700);
  });

  it('rate 0 never, rate 1 always; only messages with a query are touched', () => {
    const never = new Misbehaviour({ seed: 3, late: { rate: 0, delayMs: 500 } });
    expect(Array.from({ length: 100 }, () => never.decide('*IDN?')).some((d) => d.delayMs > 0)).toBe(false);
    const always = new Misbehaviour({ seed: 3, late: { rate: 1, delayMs: 500 }, drop: { rate: 1 } });
    expect(always.decide('*IDN?')).toMatchObject({ delayMs: 500, drop: true });
    expect(always.decide('FREQ 1k;VOLT 0.1')).toMatchObject({ delayMs: 0, drop: false });
  });

  it('spare messages at the start of a connection are left alone', () => {
    const m = new Misbehaviour({ seed: 4, spare: 2, drop: { rate: 1 }, spuriousError: { every: 1 } });
    const d = [m.decide('*IDN?'), m.decide('*IDN?'), m.decide('*IDN?')];
    expect(d.map((x) => x.drop)).toEqual([false, false, true]);
    expect(d.map((x) => x.injectError !== undefined)).toEqual([false, false, true]);
  });

  it('disconnect after N messages, counted again on the next connection', () => {
    const m = new Misbehaviour({ seed: 4, disconnectAfter: 3 });
    const flags = Array.from({ length: 7 }, () => m.decide('*IDN?').disconnectAfter);
    expect(flags).toEqual([false, false, true, false, false, true, false]);
    m.newConnection();
    expect([m.decide('X').disconnectAfter, m.decide('X').disconnectAfter, m.decide('X').disconnectAfter]).toEqual([false, false, true]);
  });

  it('garbage is non-ASCII (0x80..0xFF), replacing or prefixing the answer', () => {
    const replace = new Misbehaviour({ seed: 8, garbage: { rate: 1, mode: 'replace', bytes: 12 } }).decide('*IDN?');
    expect(replace.corrupt?.junk).toHaveLength(12);
    expect([...replace.corrupt!.junk].every((b) => b >= 0x80 && b <= 0xff)).toBe(true);
    expect([...answerBytes('1.0E+02,-3.0E+00', replace.corrupt)]).toEqual([...replace.corrupt!.junk]);
    const prefix = new Misbehaviour({ seed: 8, garbage: { rate: 1, mode: 'prefix', bytes: 4 } }).decide('*IDN?');
    const bytes = answerBytes('1,0', prefix.corrupt);
    expect(Buffer.from(bytes.slice(4)).toString('ascii')).toBe('1,0');
    expect([...bytes.slice(0, 4)]).toEqual([...prefix.corrupt!.junk]);
    expect(Buffer.from(answerBytes('1,0', undefined)).toString('ascii')).toBe('1,0');
  });
});

describe('the in-process wrapper', () => {
  it('queues a spurious -200 every Nth message, read back with SYST:ERR? (SCPI-99 vol. 2, 21.8 (from memory))', async () => {
    const device = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 1, spuriousError: { every: 3 } }));
    await device.receive('FREQ 2k'); // 1
    await device.receive('FREQ 3k'); // 2
    await device.receive('FREQ 4k'); // 3: error queued
    expect(await device.receive('SYST:ERR?')).toBe('-200,"Execution error; injected on message 3"'); // 4
    expect(await device.receive('SYST:ERR?')).toBe('0,"No error"'); // 5
  });

  it('drops answers, corrupts them, and says when to disconnect', async () => {
    const disconnects: number[] = [];
    const dropping = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 1, drop: { rate: 1 } }));
    expect(await dropping.receive('*IDN?')).toBeUndefined();
    const garbled = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 1, garbage: { rate: 1, mode: 'prefix', bytes: 3 } }));
    const answer = await garbled.receive('FREQ?');
    expect(answer?.slice(3)).toBe('1.0E+03');
    expect([...answer!.slice(0, 3)].every((c) => c.charCodeAt(0) >= 0x80 && c.charCodeAt(0) <= 0xff)).toBe(true);
    const leaving = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 1, disconnectAfter: 2 }), { onDisconnect: (d) => disconnects.push(d.index) });
    expect(await leaving.receive('*IDN?')).toMatch(/^Topoprobe Lab/);
    expect(await leaving.receive('*IDN?')).toMatch(/^Topoprobe Lab/);
    expect(disconnects).toEqual([2]);
  });

  it('a late answer arrives after its delay with its text intact', async () => {
    const device = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 1, late: { rate: 1, delayMs: 1 } }));
    expect(await device.receive('FREQ?')).toBe('1.0E+03');
  });
});

describe('bad options', () => {
  it('are refused with one line naming the option', () => {
    const attempt = (o: unknown) => () => new Misbehaviour(o as MisbehaviourOptions);
    expect(attempt({ seed: 1, drop: { rate: 1.5 } })).toThrow(MisbehaviourOptionsError);
    expect(attempt({ seed: 1, drop: { rate: 1.5 } })).toThrow(/^misbehaviour option drop\.rate: [^\n]+$/);
    expect(attempt({ seed: 1.5 })).toThrow(/^misbehaviour option seed: /);
    expect(attempt({ seed: 1, garbage: { rate: 0.1, mode: 'sideways' } })).toThrow(/^misbehaviour option garbage\.mode: /);
    expect(attempt({ seed: 1, dissconnectAfter: 3 })).toThrow(/^misbehaviour options: Unrecognized key: "dissconnectAfter"$/);
  });
});
