// Channel lists in the styles of the built-in switch profiles, and the command templates behind them.
import { describe, expect, it } from 'vitest';
import { renderChannelList, type ChannelListStyle } from '../../../src/instruments/channel-list.js';
import { isTemplate, parseTemplate, programNumber, renderTemplate, type Template } from '../../../src/instruments/profile-templates.js';

function template(source: string, allowed: string[]): Template {
  const t = parseTemplate(source, allowed);
  if (!isTemplate(t)) throw new Error(t.problem);
  return t;
}

const plain: ChannelListStyle = { form: template('(@{list})', ['list']), channel: template('{n}', ['n']), separator: ',', range: ':' };
const slotted: ChannelListStyle = {
  form: template('(@{list})', ['list']),
  channel: template('{slot}{ch:02}', ['slot', 'ch']),
  slotSize: 100,
  separator: ',',
  range: undefined,
};

describe('channel lists (SCPI-99 vol. 1, 8.3.2, from memory: "(@101,103:105)", ranges inclusive)', () => {
  it('writes runs of three or more consecutive channels as ranges, in the given order', () => {
    expect(renderChannelList([101, 103, 104, 105], plain)).toBe('(@101,103:105)');
    expect(renderChannelList([1001, 1002], plain)).toBe('(@1001,1002)');
    expect(renderChannelList([3005, 1001, 1002, 1003, 2001], plain)).toBe('(@3005,1001:1003,2001)');
  });

  it('keeps descending or repeated channels as they are (ROUTe:CLOSe? answers in list order)', () => {
    expect(renderChannelList([105, 104, 103], plain)).toBe('(@105,104,103)');
    expect(renderChannelList([101, 101], plain)).toBe('(@101,101)');
  });

  it('writes slot and two-digit channel, one by one, for the slotted style', () => {
    expect(renderChannelList([1203, 1204, 1205, 100], slotted)).toBe('(@1203,1204,1205,100)');
    expect(renderChannelList([101, 1100], slotted)).toBe('(@101,1100)');
  });

  it('never runs a range across a slot boundary', () => {
    const ranged = { ...slotted, range: ':' };
    expect(renderChannelList([1197, 1198, 1199, 1200, 1201, 1202], ranged)).toBe('(@1197:1199,1200:1202)');
  });
});

describe('command templates', () => {
  it('fills numbers so they read back to the same double, with an upper-case E', () => {
    expect(renderTemplate(template('FREQ {hz}', ['hz']), { hz: 163.6e3 })).toBe('FREQ 163600');
    expect(renderTemplate(template('VOLT {volts}', ['volts']), { volts: 0.005 })).toBe('VOLT 0.005');
    expect(programNumber(1e-7)).toBe('1E-7');
    expect(programNumber(2.5e21)).toBe('2.5E+21');
    // Round trip: the text sent reads back to the very same double.
    for (const x of [163636.36363636365, 1 / 3, 9.99e-9]) expect(Number(programNumber(x))).toBe(x);
  });

  it('refuses unknown placeholders and stray braces', () => {
    expect(parseTemplate('VOLT {voltage}', ['volts'])).toEqual({ problem: 'unknown placeholder {voltage}; allowed here: {volts}' });
    expect(parseTemplate('FREQ {hz', ['hz'])).toEqual({ problem: 'has a brace that is not part of a placeholder {name}: "FREQ {hz"' });
    expect(parseTemplate('OUTP {x}', [])).toEqual({ problem: 'unknown placeholder {x}; this command takes none' });
  });
});
