// The error/event queue and status reporting against SCPI-99 vol. 2, chapter 21 and IEEE 488.2 chapters 10
// and 11 (all from memory): every listed code from a real bad input, FIFO order, overflow, ESR bits.

import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { SimulatedSwitchMatrix } from '../../../simulators/switch-matrix.js';
import { queuedErrors, testAnalyzer } from '../../support/scpi-devices.js';

const analyzer = testAnalyzer;
const errors = queuedErrors;

describe('every listed error code, from a real bad input, read back in FIFO order ending in 0,"No error"', () => {
  it('command, execution and query errors on the analyzer (SCPI-99 vol. 2, 21.8 (from memory))', async () => {
    const a = analyzer({ timeScale: 1, baseTimeMs: 1, perAverageMs: 0 });
    const inputs: [string, number][] = [
      ['FETCh', -100], // a query-only header sent as a command
      ['FREQ 1.2.3', -102], // not a number
      ['FREQ "fast"', -104], // a string where a number belongs
      ['FREQ 1kHz,2kHz', -108], // one parameter too many
      ['FREQ', -109], // the parameter is missing
      ['FREQUENCYFREQUENCY 1k', -112], // a mnemonic over 12 characters
      ['FREQU 1k', -113], // neither the short nor the long form
      ['SOUR2:FREQ 1k', -114], // the analyzer has one source
      ['FREQ 1kV', -131], // volts for a frequency
      ['AVER 4Hz', -138], // a count takes no unit
      ['FREQ 5', -222], // below 10 Hz
      ['FUNC RESistance', -224], // not one of IMPedance, TRANsfer
    ];
    for (const [input] of inputs) await a.receive(input);
    await a.receive('INIT;INIT'); // -213 Init ignored: a measurement is already running
    await a.receive('*OPC?');
    expect(await a.receive('*RST;FETCh?')).toBeUndefined(); // -200: nothing measured
    const e = await errors(a);
    expect(e.map((x) => Number(x.split(',')[0]))).toEqual([...inputs.map(([, code]) => code), -213, -200]);
    // Each entry: the standard text, then "; " and what went wrong, naming the command.
    expect(e[0]).toBe('-100,"Command error; FETCh: is a query only; add ""?"""');
    expect(e[6]).toBe('-113,"Undefined header; FREQU"');
    expect(e[10]).toBe('-222,"Data out of range; FREQ: the frequency 5.0E+00 Hz is outside 1.0E+01 to 1.0E+07 Hz"');
    expect(await a.receive('SYST:ERR?')).toBe('0,"No error"');
    expect(await a.receive('SYSTem:ERRor:NEXT?')).toBe('0,"No error"');
  });

  it('-171 for a channel list that is not one, -222 for a channel outside 1..9999 (switch matrix)', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@101,abc)');
    await s.receive('ROUT:CLOS (@1!2)');
    await s.receive('ROUT:CLOS (@0)');
    await s.receive('ROUT:CLOS (@101:10000)');
    await s.receive('ROUT:CLOS 101');
    expect((await errors(s)).map((x) => Number(x.split(',')[0]))).toEqual([-171, -171, -222, -222, -104]);
    expect(s.closedChannels().size).toBe(0);
  });

  it('-410: a message arriving while the answer to an earlier query is still owed (IEEE 488.2 6.3.2.3 (from memory))', async () => {
    const a = analyzer();
    const first = a.receive('*IDN?');
    const second = a.receive('FREQ?');
    expect(await first).toBeUndefined();
    expect(await second).toBe('1.0E+03');
    const e = await errors(a);
    expect(e).toHaveLength(1);
    expect(e[0]).toBe('-410,"Query INTERRUPTED; the answer to ""*IDN?"" was not read before ""FREQ?"" arrived"');
  });

  it('no -410 when the earlier message had no query, or its answer was read first', async () => {
    const a = analyzer();
    const first = a.receive('FREQ 2000');
    const second = a.receive('FREQ?');
    expect(await first).toBeUndefined();
    expect(await second).toBe('2.0E+03');
    expect(await a.receive('*IDN?')).toMatch(/^Topoprobe Lab,/);
    expect(await a.receive('*IDN?')).toMatch(/^Topoprobe Lab,/);
    expect(await errors(a)).toEqual([]);
  });

  it('-420: the client waits for an answer to a query without terminator (IEEE 488.2 6.3.2.2 (from memory))', async () => {
    const a = analyzer();
    a.unterminatedQuery('*IDN?');
    expect(await errors(a)).toEqual(['-420,"Query UNTERMINATED; ""*IDN?"" has no terminator"']);
  });

  it('a command error ends the message; an execution error does not (IEEE 488.2 6.1.6 (from memory))', async () => {
    const a = analyzer();
    expect(await a.receive('FREQ 2000;BOGUS;FREQ 3000;FREQ?')).toBeUndefined();
    expect(await a.receive('FREQ?')).toBe('2.0E+03');
    expect(await a.receive('FREQ 5;FREQ 4000;FREQ?')).toBe('4.0E+03');
    expect((await errors(a)).map((x) => Number(x.split(',')[0]))).toEqual([-113, -222]);
  });

  it('input echoed in an error is made printable ASCII, so no line feed can break the response (IEEE 488.2 8.7.1)', async () => {
    const a = analyzer();
    await a.receive('FREQ 1k,\n2k\u00e9');
    const [e] = await errors(a);
    expect(e).toMatch(/^-10[28],"[\x20-\x7e]*"$/);
  });
});

describe('the bounded queue (SCPI-99 vol. 2, 21.8.2 (from memory))', () => {
  it('when full, the newest entry becomes -350 Queue overflow and later errors are discarded', async () => {
    const a = analyzer({ errorQueueSize: 4 });
    for (let i = 1; i <= 7; i++) await a.receive(`NOPE${i}`);
    expect(await errors(a)).toEqual(['-113,"Undefined header; NOPE1"', '-113,"Undefined header; NOPE2"', '-113,"Undefined header; NOPE3"', '-350,"Queue overflow"']);
  });

  it('*CLS empties it; SYST:ERR:COUN? counts it', async () => {
    const a = analyzer();
    await a.receive('NOPE1');
    await a.receive('NOPE2');
    expect(await a.receive('SYST:ERR:COUN?')).toBe('2');
    await a.receive('*CLS');
    expect(await a.receive('SYST:ERR:COUN?;:SYST:ERR?')).toBe('0;0,"No error"');
  });
});

describe('IEEE 488.2 common commands and status registers (from memory)', () => {
  it('*IDN? answers four comma-separated fields: maker, model, serial, firmware (10.14)', async () => {
    for (const device of [analyzer({ serial: 'ZA-0417' }), new SimulatedSwitchMatrix({ serial: 'SW-0093' })]) {
      const idn = await device.receive('*IDN?');
      expect(idn).toBe(device.identity);
      const fields = (idn ?? '').split(',');
      expect(fields).toHaveLength(4);
      expect(fields[0]).toBe('Topoprobe Lab');
      expect(fields.every((f) => f.trim() !== '')).toBe(true);
    }
    expect(await analyzer({ serial: 'ZA-0417' }).receive('*idn?')).toMatch(/^Topoprobe Lab,SIM-ZA100,ZA-0417,/);
    expect(await new SimulatedSwitchMatrix({ serial: 'SW-0093' }).receive('*IDN?')).toMatch(/^Topoprobe Lab,SIM-SW256,SW-0093,/);
  });

  it('ESR bits: PON 128 at power-on, CME 32, EXE 16, DDE 8, QYE 4, OPC 1; *ESR? reads and clears (11.5.1)', async () => {
    const a = analyzer({ errorQueueSize: 2 });
    expect(await a.receive('*ESR?')).toBe('128');
    expect(await a.receive('*ESR?')).toBe('0');
    await a.receive('BOGUS');
    expect(await a.receive('*ESR?')).toBe('32');
    await a.receive('FREQ 5');
    expect(await a.receive('*ESR?')).toBe('16');
    await a.receive('*CLS');
    const first = a.receive('*IDN?');
    await a.receive('FREQ 1000');
    await first;
    expect(await a.receive('*ESR?')).toBe('4');
    await a.receive('*CLS');
    for (let i = 0; i < 3; i++) await a.receive('BOGUS');
    expect(await a.receive('*ESR?')).toBe(String(32 + 8)); // the overflow is a device-dependent event
    await a.receive('*OPC');
    expect(await a.receive('*ESR?')).toBe('1');
  });

  it('*STB?: bit 2 while errors are queued, ESB (32) when an enabled ESR bit is set, MSS (64) per *SRE (11.2)', async () => {
    const a = analyzer();
    await a.receive('*CLS');
    expect(await a.receive('*STB?')).toBe('0');
    await a.receive('*ESE 32;*SRE 32;BOGUS');
    expect(await a.receive('*STB?')).toBe(String(4 + 32 + 64));
    expect(await a.receive('*ESE?;*SRE?')).toBe('32;32');
    await a.receive('*CLS');
    expect(await a.receive('*STB?')).toBe('0');
    expect(await a.receive('*IDN?;*STB?')).toMatch(/;16$/); // MAV: an answer is waiting in the same message
  });

  it('*RST restores settings but keeps the error queue; reset() (power-on) clears it and sets PON', async () => {
    const a = analyzer();
    await a.receive('*CLS;FREQ 2000;BOGUS');
    await a.receive('*RST');
    expect(await a.receive('FREQ?')).toBe('1.0E+03');
    expect(await a.receive('SYST:ERR:COUN?')).toBe('1');
    a.reset();
    expect(await a.receive('SYST:ERR:COUN?;*ESR?')).toBe('0;128');
  });

  it('*OPC? answers 1, *TST? answers 0 (passed), SYST:VERS? the SCPI version 1999.0', async () => {
    const a = analyzer();
    expect(await a.receive('*OPC?;*TST?;SYST:VERS?')).toBe('1;0;1999.0');
  });

  it('common commands take no unexpected parameters: *IDN? 1 is -108, *ESE 256 is -222', async () => {
    const a = analyzer();
    await a.receive('*IDN? 1');
    await a.receive('*ESE 256');
    expect((await errors(a)).map((x) => Number(x.split(',')[0]))).toEqual([-108, -222]);
  });
});

describe('total on any input: never throws, every failure is an error-queue entry', () => {
  it('random strings (fast-check) resolve; answers and error entries stay one printable line', async () => {
    const a = analyzer();
    const s = new SimulatedSwitchMatrix({ routes: (c) => ({ bus: 'hi', node: `n${c % 7}` }) });
    const pieces = fc.constantFrom('FREQ', 'SOUR', ':', ';', '?', '*IDN', '*OPC?', ' ', ',', '1k', 'HZ', '(@', ')', '1:3', '"', "'", 'MAX', 'ROUT:CLOS', 'READ?', 'FORM POL', '#H1F', '#3', 'E9', '\u00e9', '\t');
    const message = fc.oneof(fc.string({ unit: 'binary', maxLength: 40 }), fc.array(pieces, { maxLength: 12 }).map((p) => p.join('')));
    await fc.assert(
      fc.asyncProperty(message, async (m) => {
        for (const device of [a, s]) {
          const answer = await device.receive(m);
          if (answer !== undefined && !/^[\x20-\x7e]*$/.test(answer)) return false;
          const e = await device.receive('*CLS;:SYST:ERR?');
          if (e !== '0,"No error"') return false;
        }
        return true;
      }),
      { numRuns: 400 },
    );
  });

  it('a few hand-picked nasties', async () => {
    const a = analyzer();
    for (const m of ['', ';', ':', '*', '?', '(@', '"', '#', '#H', 'FREQ #HZZ', 'FREQ 1e999', 'FREQ -', 'A'.repeat(5000), ';'.repeat(50), 'FREQ (1+2)', 'ROUT:CLOS (@1:99999999999999999999)']) {
      await expect(a.receive(m)).resolves.not.toBe(Symbol('never'));
    }
    const e = await errors(a);
    expect(e.length).toBeGreaterThan(0);
    expect(e.every((x) => /^-\d{3},"[\x20-\x7e]*"$/.test(x))).toBe(true);
  });
});
