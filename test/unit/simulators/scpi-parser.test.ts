// The SCPI program-message parser and command tree against the rules of SCPI-99 and IEEE 488.2, exercised
// through the simulated instruments and through a small tree of our own.

import { describe, expect, it } from 'vitest';
import { SimulatedSwitchMatrix } from '../../../simulators/switch-matrix.js';
import { lexMessage } from '../../../simulators/scpi/lexer.js';
import { ScpiDevice } from '../../../simulators/scpi/scpi-device.js';
import type { SimulatedDevice } from '../../../simulators/device.js';
import { queuedErrors, testAnalyzer } from '../../support/scpi-devices.js';

const analyzer = () => testAnalyzer();
const errors = queuedErrors;

async function codes(device: SimulatedDevice): Promise<number[]> {
  return (await errors(device)).map((e) => Number(e.split(',')[0]));
}

describe('keywords: long and short forms, case, optional nodes (SCPI-99 vol. 1, 6.2.1 and 6.2.3 (from memory))', () => {
  for (const command of ['FREQ 2000', 'frequency 2000', 'FREQuency:CW 2000', 'SOUR:FREQ 2000', 'sour:freq:cw 2000', ':SOURce:FREQuency:CW 2000', 'SoUrCe:FrEq 2000', 'SOUR1:FREQ 2000']) {
    it(`"${command}" sets the source frequency`, async () => {
      const a = analyzer();
      expect(await a.receive(command)).toBeUndefined();
      expect(await a.receive('FREQ?')).toBe('2.0E+03');
      expect(await codes(a)).toEqual([]);
    });
  }

  it('queries take the same forms', async () => {
    const a = analyzer();
    await a.receive('FREQ 2500');
    for (const q of ['FREQ?', 'SOUR:FREQ:CW?', 'source:frequency?', 'FREQ:CW?']) expect(await a.receive(q)).toBe('2.5E+03');
  });

  it('accepts only the exact short or long form: FREQU and FREQUENC are undefined headers (-113)', async () => {
    const a = analyzer();
    await a.receive('FREQU 2000');
    await a.receive('FREQUENC 2000');
    await a.receive('FRQ 2000');
    expect(await codes(a)).toEqual([-113, -113, -113]);
    expect(await a.receive('FREQ?')).toBe('1.0E+03');
  });

  it('optional nodes may be left out anywhere: VOLT, VOLT:LEV, SOUR:VOLT:LEVel; FORM and FORM:ZDAT', async () => {
    const a = analyzer();
    for (const [command, query, expected] of [
      ['VOLT 0.2', 'SOUR:VOLT:LEV?', '2.0E-01'],
      ['VOLT:LEV 0.3', 'VOLT?', '3.0E-01'],
      ['SOUR:VOLT:LEVel 0.4', 'voltage:level?', '4.0E-01'],
      ['FORM:ZDAT POL', 'FORM?', 'POL'],
      ['FORMat RECTangular', 'FORM:ZDATa?', 'RECT'],
      ['SENS:FUNC TRAN', 'FUNC?', 'TRAN'],
      ['AVER:COUN 16', 'SENS:AVER?', '16'],
    ]) {
      await a.receive(command);
      expect(await a.receive(query)).toBe(expected);
    }
    expect(await codes(a)).toEqual([]);
  });

  it('a numeric suffix outside the node\'s range is -114 (SCPI-99 vol. 1, 6.2.5 (from memory))', async () => {
    const a = analyzer();
    await a.receive('SOUR2:FREQ 2000');
    expect(await codes(a)).toEqual([-114]);
    expect(await a.receive('FREQ?')).toBe('1.0E+03');
  });
});

describe('";" chains and the current path (SCPI-99 vol. 1, 6.2.4 (from memory))', () => {
  it('after SOUR:FREQ, a command without ":" continues under SOURce', async () => {
    const a = analyzer();
    await a.receive('SOUR:FREQ 2000;VOLT 0.25');
    expect(await a.receive('VOLT?')).toBe('2.5E-01');
    expect(await codes(a)).toEqual([]);
  });

  it('so SENSe commands are not found there (-113), and the message stops', async () => {
    const a = analyzer();
    await a.receive('SOUR:FREQ 2000;FUNC TRAN;VOLT 0.25');
    expect(await a.receive('FUNC?;VOLT?')).toBe('IMP;1.0E-01');
    const e = await errors(a);
    expect(e).toHaveLength(1);
    expect(e[0]).toMatch(/^-113,"Undefined header; FUNC"$/);
  });

  it('a leading ":" returns to the root', async () => {
    const a = analyzer();
    await a.receive('SOUR:FREQ 2000;:FUNC TRAN;:SOUR:VOLT 0.25');
    expect(await a.receive('FREQ?;FUNC?;VOLT?')).toBe('2.0E+03;TRAN;2.5E-01');
  });

  it('common commands do not change the path', async () => {
    const a = analyzer();
    await a.receive('SOUR:FREQ 2000;*CLS;VOLT 0.25;*OPC;FREQ 3000');
    expect(await a.receive('FREQ?;VOLT?')).toBe('3.0E+03;2.5E-01');
    expect(await codes(a)).toEqual([]);
  });

  it('the path is the level of the last typed keyword: FREQ:CW 2000;CW 3000', async () => {
    const a = analyzer();
    await a.receive('FREQ:CW 2000;CW 3000');
    expect(await a.receive('FREQ?')).toBe('3.0E+03');
    expect(await codes(a)).toEqual([]);
  });

  it('an implied optional node does not narrow the path: FREQ 2000;FUNC TRAN works', async () => {
    const a = analyzer();
    await a.receive('FREQ 2000;FUNC TRAN');
    expect(await a.receive('FREQ?;FUNC?')).toBe('2.0E+03;TRAN');
  });

  it('SYST:ERR?;ERR? reads two entries; SYST:ERR?;SYST:ERR? names SYSTem:SYSTem, which is undefined', async () => {
    const a = analyzer();
    await a.receive('FOO1');
    await a.receive('FOO2');
    await a.receive('FOO3');
    expect(await a.receive('SYST:ERR?;ERR?')).toBe('-113,"Undefined header; FOO1";-113,"Undefined header; FOO2"');
    expect(await a.receive('SYST:ERR?;SYST:ERR?')).toBe('-113,"Undefined header; FOO3"');
    expect(await errors(a)).toEqual(['-113,"Undefined header; SYST:ERR?"']);
  });

  it('answers to several queries form one response message joined by ";" (IEEE 488.2 8.4.1 (from memory))', async () => {
    const a = analyzer();
    expect(await a.receive('FREQ 1500;FREQ?;VOLT?;*OPC?;FUNC?')).toBe('1.5E+03;1.0E-01;1;IMP');
  });

  it('a trailing ";" and surrounding white space are tolerated; an empty command between ";" is -102', async () => {
    const a = analyzer();
    expect(await a.receive('  FREQ 1500 ;  FREQ? ; ')).toBe('1.5E+03');
    expect(await a.receive('FREQ 1600;;FREQ?')).toBeUndefined();
    expect(await codes(a)).toEqual([-102]);
    expect(await a.receive('FREQ?')).toBe('1.6E+03');
  });
});

describe('numeric program data (IEEE 488.2 7.7.2 and SCPI-99 vol. 1, 7.7.3 (from memory))', () => {
  const cases: [string, string][] = [
    ['163000', '1.63E+05'], // NR1
    ['163000.0', '1.63E+05'], // NR2
    ['163.0E3', '1.63E+05'], // NR3
    ['1.63E+05', '1.63E+05'],
    ['+163e3', '1.63E+05'],
    ['.5e6', '5.0E+05'],
    ['163kHz', '1.63E+05'], // multiplier and unit
    ['163 kHz', '1.63E+05'], // white space before the suffix
    ['163KHZ', '1.63E+05'], // case-insensitive
    ['163E3Hz', '1.63E+05'],
    ['0.163MHz', '1.63E+05'], // MHZ is megahertz, the standard's exception
    ['0.163MAHZ', '1.63E+05'], // MA is mega
    ['163k', '1.63E+05'], // a bare multiplier (our convenience)
    ['2.2E1HZ', '2.2E+01'],
    ['#H3E8', '1.0E+03'], // non-decimal numeric, IEEE 488.2 7.7.4
    ['#Q1750', '1.0E+03'],
    ['#B1111101000', '1.0E+03'],
    ['MIN', '1.0E+01'],
    ['MINimum', '1.0E+01'],
    ['max', '1.0E+07'],
    ['DEF', '1.0E+03'],
  ];
  for (const [text, expected] of cases) {
    it(`FREQ ${text} -> ${expected}`, async () => {
      const a = analyzer();
      await a.receive('FREQ 20');
      await a.receive(`FREQ ${text}`);
      expect(await a.receive('FREQ?')).toBe(expected);
      expect(await codes(a)).toEqual([]);
    });
  }

  it('a multiplier is applied in one rounding step: 4.7kHz gives the double nearest 4700 (IEEE 754, common practice)', async () => {
    const a = analyzer();
    await a.receive('FREQ 4.7kHz');
    expect(Number(await a.receive('FREQ?'))).toBe(4700);
    await a.receive('VOLT 33mV');
    expect(Number(await a.receive('VOLT?'))).toBe(0.033);
  });

  it('M is milli whatever the case, so 100MV is 0.1 V (SCPI-99 vol. 1, 7.7.3 (from memory))', async () => {
    const a = analyzer();
    await a.receive('VOLT 100MV');
    expect(await a.receive('VOLT?')).toBe('1.0E-01');
    await a.receive('VOLT 250mV');
    expect(await a.receive('VOLT?')).toBe('2.5E-01');
  });

  it('integer settings round to the nearest integer (IEEE 488.2 7.7.2.4 (from memory))', async () => {
    const a = analyzer();
    await a.receive('AVER 4.4');
    expect(await a.receive('AVER?')).toBe('4');
    await a.receive('AVER 4.6');
    expect(await a.receive('AVER?')).toBe('5');
  });

  it('queries answer MIN, MAX and DEF of a setting', async () => {
    const a = analyzer();
    expect(await a.receive('FREQ? MIN;FREQ? MAX;FREQ? DEF')).toBe('1.0E+01;1.0E+07;1.0E+03');
    expect(await a.receive('VOLT? MIN;VOLT? MAX;AVER? MAX')).toBe('5.0E-03;1.0E+00;256');
  });

  it('INFinity and NAN are numbers, outside every range (-222) (SCPI-99 vol. 1, 7.2.1.5 (from memory))', async () => {
    const a = analyzer();
    await a.receive('FREQ INF');
    await a.receive('FREQ NINF');
    await a.receive('FREQ NAN');
    expect(await codes(a)).toEqual([-222, -222, -222]);
  });
});

describe('channel lists (SCPI-99 vol. 1, 8.3.2 (from memory))', () => {
  it('(@1,3:5) is channels 1, 3, 4 and 5: ranges are inclusive', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@1,3:5)');
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@1,3,4,5)');
    expect([...s.closedChannels()].sort((x, y) => x - y)).toEqual([1, 3, 4, 5]);
  });

  it('a descending range counts down, white space is allowed inside, and answers follow list order', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS ( @ 103 : 101 , 9 )');
    expect(await s.receive('ROUT:CLOS? (@103:101,9,2)')).toBe('1,1,1,1,0');
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@9,101,102,103)');
  });

  it('(@) is the empty list', async () => {
    const s = new SimulatedSwitchMatrix();
    expect(await s.receive('ROUT:CLOS (@);CLOS:LIST?')).toBe('(@)');
    expect(await codes(s)).toEqual([]);
  });

  it('the lexer keeps the ranges as written', () => {
    const lexed = lexMessage('ROUT:CLOS (@101,103:105)');
    expect(lexed.failure).toBeUndefined();
    expect(lexed.units[0].data).toEqual([{ type: 'channels', text: '(@101,103:105)', ranges: [[101, 101], [103, 105]] }]);
  });
});

describe('strings, booleans and numeric suffixes in a tree of our own', () => {
  const seen: { label?: string; state?: boolean; slot?: number }[] = [];
  const device = () =>
    new ScpiDevice({
      identity: 'Topoprobe Lab,SIM-TEST,T1,0',
      resetSettings: () => undefined,
      commands: [
        { header: 'OUTPut#4[:STATe]', set: { params: [{ kind: 'boolean', name: 'the state' }], run: (c) => void seen.push({ slot: c.suffixes[0], state: c.flag(0) }) } },
        { header: 'DISPlay:TEXT', set: { params: [{ kind: 'string', name: 'the text' }], run: (c) => void seen.push({ label: c.text(0) }) } },
        { header: 'FAIL', set: { run: () => { throw new Error('handler bug'); } } },
      ],
    });

  it('booleans: ON, OFF, 1, 0 and numbers that round to non-zero (SCPI-99 vol. 1, 7.3 (from memory))', async () => {
    seen.length = 0;
    const d = device();
    await d.receive('OUTP ON;OUTP OFF;OUTP 1;OUTP 0;OUTP 0.4;OUTP 2;outp:stat on');
    expect(seen.map((s) => s.state)).toEqual([true, false, true, false, false, true, true]);
    await d.receive('OUTP MAYBE');
    await d.receive('OUTP "ON"');
    expect(await codes(d)).toEqual([-224, -104]);
  });

  it('numeric suffixes: OUTP is OUTP1, OUTP3 is slot 3, OUTP5 is beyond #4 (-114)', async () => {
    seen.length = 0;
    const d = device();
    await d.receive('OUTP ON;OUTP3 ON;OUTPUT4:STATE OFF');
    expect(seen.map((s) => s.slot)).toEqual([1, 3, 4]);
    await d.receive('OUTP5 ON');
    await d.receive('OUTP0 ON');
    expect(await codes(d)).toEqual([-114, -114]);
  });

  it('strings in either quote, with the quote doubled inside (IEEE 488.2 7.7.5 (from memory))', async () => {
    seen.length = 0;
    const d = device();
    await d.receive(`DISP:TEXT "say ""hi""";TEXT 'board B-07; row 3';:DISP:TEXT 'it''s'`);
    expect(seen.map((s) => s.label)).toEqual(['say "hi"', 'board B-07; row 3', "it's"]);
    await d.receive('DISP:TEXT "no end');
    expect(await codes(d)).toEqual([-102]);
  });

  it('a handler that throws something unexpected becomes -300, never an exception', async () => {
    const d = device();
    await expect(d.receive('FAIL;*IDN?')).resolves.toBeUndefined();
    const e = await errors(d);
    expect(e).toHaveLength(1);
    expect(e[0]).toMatch(/^-300,"Device-specific error; internal: handler bug"$/);
  });
});
