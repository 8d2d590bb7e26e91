// The everyday form "number, SI prefix, unit symbol" is read without mathjs (to keep it out of the runner);
// mathjs is the outside reference it must agree with, for every prefix and unit we read.
import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { parseQuantity } from '../../../src/units/quantity.js';
import { UNITS, UNIT_NAMES } from '../../../src/units/unit-names.js';

const PREFIXES = ['p', 'n', 'u', 'm', '', 'k', 'M', 'G'];
const NUMBERS = ['1', '2.2', '33', '4.7e1', '0.15', '680'];

describe('number + SI prefix + unit symbol', () => {
  it('gives what mathjs gives, to the last bit or one rounding step, for each unit and prefix (mathjs 15 as reference)', () => {
    let checked = 0;
    for (const name of UNIT_NAMES) {
      for (const prefix of PREFIXES) {
        for (const n of NUMBERS) {
          for (const gap of ['', ' ']) {
            const text = `${n}${gap}${prefix}${UNITS[name].mathjs}`;
            const reference = unit(text).toNumber(UNITS[name].mathjs);
            const ours = parseQuantity(text, name);
            expect(Math.abs(ours - reference) / reference, text).toBeLessThan(3e-16);
            checked++;
          }
        }
      }
    }
    expect(checked).toBe(UNIT_NAMES.length * PREFIXES.length * NUMBERS.length * 2);
  });

  it('gives the double nearest the decimal text, as a bare prefix does', () => {
    expect(parseQuantity('33nF', 'F')).toBe(33e-9);
    expect(parseQuantity('33 nF', 'F')).toBe(parseQuantity('33n', 'F'));
    expect(parseQuantity('4.7uH', 'H')).toBe(4.7e-6);
  });

  it('still names a unit that is not the expected one (that path goes through mathjs)', () => {
    expect(() => parseQuantity('10nH', 'F')).toThrow(/is in henries, expected farads/);
    expect(() => parseQuantity('10 kHz', 'ohm')).toThrow(/is in hertz, expected ohms/);
  });
});
