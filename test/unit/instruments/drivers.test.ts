// The drivers built from both profile pairs: the exact command strings they send (the shared SCPI command
// set of our simulated instruments), answer conversion (polar checked against mathjs), the limits that
// stop a request before it is sent, and the error queue after refused commands and bad answers.
import { describe, expect, it } from 'vitest';
import { complex } from 'mathjs';
import { builtinProfile, parseProfileText } from '../../../src/instruments/profile.js';
import type { AnalyzerProfile, SwitchProfile } from '../../../src/instruments/profile-types.js';
import { analyzerDriver } from '../../../src/instruments/analyzer-driver.js';
import { switchDriver } from '../../../src/instruments/switch-driver.js';
import { sessionFor } from '../../../src/instruments/connect.js';
import { INVALID } from '../../../src/instruments/answers.js';
import { AnswerError, InstrumentError, InstrumentSettingError, LimitError } from '../../../src/instruments/instrument-errors.js';
import { deviceOnPair, type FakeDevice, type Handler } from './fake-device.js';

const ANALYZER_IDN = 'Topoprobe Lab,SIM-ZA100,ZA-0042,1.3.0';
const SWITCH_IDN = 'Topoprobe Lab,SIM-SW256,SW-0007,2.0.1';

function answering(idn: string, answers: Record<string, string> = {}): Handler {
  return (m) => (m === '*IDN?' ? idn : answers[m]);
}

async function rig<P extends AnalyzerProfile | SwitchProfile>(profileName: string, handler: Handler) {
  const profile = builtinProfile(profileName) as P;
  const crlf = profile.terminators.write === 'CRLF';
  const { transport, device } = await deviceOnPair(handler, { readTerminator: crlf ? '\r\n' : '\n', writeTerminator: crlf ? '\r\n' : '\n' });
  const session = sessionFor(profile, transport);
  await session.open();
  const slept: number[] = [];
  const sleep = async (ms: number) => {
    slept.push(ms);
  };
  return { profile, device, session, slept, sleep };
}

async function analyzer(profileName: string, handler: Handler) {
  const r = await rig<AnalyzerProfile>(profileName, handler);
  return { ...r, driver: analyzerDriver(r.profile, r.session, { sleep: r.sleep }) };
}

async function matrix(profileName: string, handler: Handler) {
  const r = await rig<SwitchProfile>(profileName, handler);
  return { ...r, driver: switchDriver(r.profile, r.session, { sleep: r.sleep }) };
}

async function failureOf(promise: Promise<unknown>): Promise<Error> {
  try {
    await promise;
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected a failure');
}

/** Messages heard, without the error queue reads in between. */
const commands = (device: FakeDevice) => device.heard.filter((m) => !/ERR/.test(m));

describe('generic-analyzer (long forms, LF, rectangular answers)', () => {
  it('starts with the identity check and the setup, then the error queue', async () => {
    const { driver, device, session } = await analyzer('generic-analyzer', answering(ANALYZER_IDN));
    expect((await driver.start()).model).toBe('SIM-ZA100');
    expect(device.heard).toEqual(['*IDN?', '*CLS', 'FORMat:ZDATa RECTangular', 'SYSTem:ERRor:NEXT?']);
    await session.close();
  });

  it('renders every setting from the shared command set and reads the error queue after each', async () => {
    const { driver, device, session, slept } = await analyzer('generic-analyzer', answering(ANALYZER_IDN, { 'READ?': '1.25E+02,-3.5E+01' }));
    await driver.setFrequency(163.6e3);
    await driver.setLevel(0.1);
    await driver.setFunction('impedance');
    await driver.setFunction('transfer');
    await driver.setAveraging(16);
    expect(await driver.measure()).toEqual({ re: 125, im: -35 });
    expect(device.heard).toEqual([
      'SOURce:FREQuency:CW 163600',
      'SYSTem:ERRor:NEXT?',
      'SOURce:VOLTage:LEVel 0.1',
      'SYSTem:ERRor:NEXT?',
      'SENSe:FUNCtion IMPedance',
      'SYSTem:ERRor:NEXT?',
      'SENSe:FUNCtion TRANsfer',
      'SYSTem:ERRor:NEXT?',
      'SENSe:AVERage:COUNt 16',
      'SYSTem:ERRor:NEXT?',
      'READ?',
    ]);
    // The profile's settling time after a frequency change (1 ms).
    expect(slept).toEqual([1]);
    await session.close();
  });

  it('an overload answer is an invalid reading (SCPI-99 9.9E37, from memory)', async () => {
    const { driver, session } = await analyzer('generic-analyzer', answering(ANALYZER_IDN, { 'READ?': '9.9E37,9.9E37' }));
    expect(await driver.measure()).toBe(INVALID);
    await session.close();
  });

  it('a refused setting fails with the command and the error queue entries', async () => {
    const handler: Handler = (m, d) => {
      if (m.startsWith('SOURce:FREQuency')) d.errors.push('-222,"Data out of range"');
      return undefined;
    };
    const { driver, session } = await analyzer('generic-analyzer', handler);
    const error = (await failureOf(driver.setFrequency(5e6))) as InstrumentError;
    expect(error).toBeInstanceOf(InstrumentError);
    expect(error.exitCode).toBe(3);
    expect(error.message).toBe('memory:bench: "SOURce:FREQuency:CW 5000000" was refused: -222,"Data out of range"');
    expect(error.entries).toEqual([{ code: -222, message: 'Data out of range' }]);
    await session.close();
  });

  it('a malformed measurement answer names the command, quotes the answer and adds the error queue', async () => {
    const handler: Handler = (m, d) => {
      if (m !== 'READ?') return undefined;
      d.errors.push('-200,"Execution error"');
      return '1.25E+02';
    };
    const { driver, session } = await analyzer('generic-analyzer', handler);
    const error = await failureOf(driver.measure());
    expect(error).toBeInstanceOf(AnswerError);
    expect(error.message).toBe('answer to "READ?" has 1 field, expected 2: "1.25E+02" (instrument error queue: -200,"Execution error")');
    await session.close();
  });

  it('refuses an instrument whose identity does not match', async () => {
    const { driver, device, session } = await analyzer('generic-analyzer', answering(SWITCH_IDN));
    const error = await failureOf(driver.start());
    expect(error).toBeInstanceOf(InstrumentError);
    expect(error.message).toMatch(/^memory:bench: the instrument answers \*IDN\? with "Topoprobe Lab,SIM-SW256,SW-0007,2.0.1", which does not match the identity \/\^Topoprobe Lab,SIM-ZA\\d\+,\/ of profile generic-analyzer/);
    expect(device.heard).toEqual(['*IDN?']); // no setup sent to the wrong instrument
    await session.close();
  });
});

describe('sim-polar-analyzer (short forms, CR LF, polar answers)', () => {
  it('renders the short forms, sends INIT before the fetch, and converts |Z|,deg like mathjs', async () => {
    const { driver, device, session } = await analyzer('sim-polar-analyzer', answering(ANALYZER_IDN, { '*WAI;:FETC?': '1.30E+02,-1.5E+01' }));
    await driver.start();
    await driver.setFrequency(117.3e3);
    await driver.setLevel(0.05);
    await driver.setFunction('impedance');
    await driver.setAveraging(4);
    const z = await driver.measure();
    expect(commands(device)).toEqual(['*IDN?', '*CLS', 'FORM POL', 'FREQ 117300', 'VOLT 0.05', 'FUNC IMP', 'AVER 4', 'INIT', '*WAI;:FETC?']);
    expect(device.heard.filter((m) => /ERR/.test(m)).every((m) => m === 'SYST:ERR?')).toBe(true);
    // Reference: mathjs complex from magnitude and argument (radians).
    const ref = complex({ r: 130, phi: (-15 * Math.PI) / 180 });
    expect(z).not.toBe(INVALID);
    if (z !== INVALID) {
      expect(z.re).toBeCloseTo(ref.re, 10);
      expect(z.im).toBeCloseTo(ref.im, 10);
    }
    await session.close();
  });
});

describe('analyzer limits, checked before sending', () => {
  it('refuses a frequency outside limits.frequency, naming the limit and the file', async () => {
    const { driver, device, session, profile } = await analyzer('generic-analyzer', answering(ANALYZER_IDN));
    const high = (await failureOf(driver.setFrequency(20e6))) as LimitError;
    expect(high).toBeInstanceOf(LimitError);
    expect(high.exitCode).toBe(2);
    expect(high.limit).toBe('limits.frequency.max');
    expect(high.message).toBe(`generic-analyzer: frequency 20 MHz is above limits.frequency.max = 10 MHz of ${profile.file}; nothing was sent`);
    const low = (await failureOf(driver.setFrequency(5))) as LimitError;
    expect(low.message).toBe(`generic-analyzer: frequency 5 Hz is below limits.frequency.min = 10 Hz of ${profile.file}; nothing was sent`);
    expect((await failureOf(driver.setFrequency(Number.NaN))).message).toBe('generic-analyzer: frequency NaN is not a finite number; nothing was sent');
    expect(device.heard).toEqual([]);
    await session.close();
  });

  it('refuses a level above limits.level and an averaging count outside limits.averaging', async () => {
    const { driver, device, session } = await analyzer('generic-analyzer', answering(ANALYZER_IDN));
    expect(((await failureOf(driver.setLevel(1.5))) as LimitError).limit).toBe('limits.level.max');
    expect(((await failureOf(driver.setLevel(0.001))) as LimitError).limit).toBe('limits.level.min');
    expect(((await failureOf(driver.setAveraging(512))) as LimitError).limit).toBe('limits.averaging.max');
    expect((await failureOf(driver.setAveraging(2.5))).message).toBe('generic-analyzer: averaging count 2.5 is not a whole number; nothing was sent');
    expect(device.heard).toEqual([]);
    await session.close();
  });

  it('refuses a level that could drive more than limits.current into a short (Ohm\'s law, I = V / R)', async () => {
    const text = `
kind: analyzer
identity: '^Topoprobe Lab,'
commands:
  set_frequency: 'FREQ {hz}'
  set_level: 'VOLT {volts}'
  set_function: { impedance: 'FUNC IMP' }
  measure: { query: 'READ?', response: rect }
limits:
  frequency: { min: 10 Hz, max: 10 MHz }
  level: { max: 1 V }
  current: 10 mA
  source_resistance: 50 ohm
`;
    const profile = parseProfileText(text, 'bench-za.yaml') as AnalyzerProfile;
    const { transport, device } = await deviceOnPair(answering(ANALYZER_IDN));
    const session = sessionFor(profile, transport);
    await session.open();
    const driver = analyzerDriver(profile, session);
    await driver.setLevel(0.5); // 10 mA: at the limit, allowed
    const error = (await failureOf(driver.setLevel(0.8))) as LimitError;
    expect(error.limit).toBe('limits.current');
    expect(error.message).toBe('bench-za: level 800 mV can drive 16 mA into a short through the 50 Ω source, above limits.current = 10 mA of bench-za.yaml; nothing was sent');
    expect(commands(device)).toEqual(['VOLT 0.5']);
    const noTransfer = await failureOf(driver.setFunction('transfer'));
    expect(noTransfer).toBeInstanceOf(InstrumentSettingError);
    expect(noTransfer.message).toBe('bench-za: the profile has no commands.set_function.transfer (bench-za.yaml); nothing was sent');
    await session.close();
  });
});

describe('generic-switch (plain channel lists with ranges)', () => {
  it('renders close, open, open all and the closed-state query', async () => {
    const { driver, device, session, slept } = await matrix('generic-switch', answering(SWITCH_IDN, { 'ROUTe:CLOSe? (@1001,2005,3001)': '1,1,0' }));
    await driver.start();
    await driver.close([1001, 1002, 1003, 2005]);
    expect(await driver.closedStates([1001, 2005, 3001])).toEqual([true, true, false]);
    await driver.open([1001, 1002, 1003, 2005]);
    await driver.openAll();
    await driver.close([]); // nothing to do, nothing sent
    expect(commands(device)).toEqual([
      '*IDN?',
      '*CLS',
      'ROUTe:OPEN:ALL',
      'ROUTe:CLOSe (@1001:1003,2005)',
      'ROUTe:CLOSe? (@1001,2005,3001)',
      'ROUTe:OPEN (@1001:1003,2005)',
      'ROUTe:OPEN:ALL',
    ]);
    // The profile's settling time after every relay operation (5 ms).
    expect(slept).toEqual([5, 5, 5]);
    await session.close();
  });

  it('a closed-state answer with the wrong number of flags is an AnswerError', async () => {
    const { driver, session } = await matrix('generic-switch', answering(SWITCH_IDN, { 'ROUTe:CLOSe? (@101,102)': '1' }));
    const error = await failureOf(driver.closedStates([101, 102]));
    expect(error).toBeInstanceOf(AnswerError);
    expect(error.message).toBe('answer to "ROUTe:CLOSe? (@101,102)" has 1 flag, expected 2: "1"');
    await session.close();
  });

  it('refuses channels outside limits.channels or not whole', async () => {
    const { driver, device, session, profile } = await matrix('generic-switch', answering(SWITCH_IDN));
    expect((await failureOf(driver.close([101, 12000]))).message).toBe(`generic-switch: channel 12000 is above limits.channels.max = 9999 of ${profile.file}; nothing was sent`);
    expect((await failureOf(driver.open([0]))).message).toBe(`generic-switch: channel 0 is below limits.channels.min = 1 of ${profile.file}; nothing was sent`);
    expect((await failureOf(driver.close([101.5]))).message).toBe('generic-switch: channel 101.5 is not a whole number; nothing was sent');
    expect(device.heard).toEqual([]);
    await session.close();
  });
});

describe('sim-slot-switch (slot and channel, no ranges, short forms)', () => {
  it('writes each channel as slot and two-digit channel, one by one', async () => {
    const { driver, device, session } = await matrix('sim-slot-switch', answering(SWITCH_IDN, { 'ROUT:CLOS? (@1203,1204,1205)': '1,0,1' }));
    await driver.start();
    await driver.close([1203, 1204, 1205]);
    expect(await driver.closedStates([1203, 1204, 1205])).toEqual([true, false, true]);
    await driver.openAll();
    expect(commands(device)).toEqual(['*IDN?', '*CLS', 'ROUT:OPEN:ALL', 'ROUT:CLOS (@1203,1204,1205)', 'ROUT:CLOS? (@1203,1204,1205)', 'ROUT:OPEN:ALL']);
    expect(device.heard.filter((m) => /ERR/.test(m)).every((m) => m === 'SYST:ERR?')).toBe(true);
    await session.close();
  });

  it('refuses a channel below slot 1', async () => {
    const { driver, profile, session } = await matrix('sim-slot-switch', answering(SWITCH_IDN));
    expect((await failureOf(driver.close([42]))).message).toBe(`sim-slot-switch: channel 42 is below limits.channels.min = 100 of ${profile.file}; nothing was sent`);
    await session.close();
  });
});
