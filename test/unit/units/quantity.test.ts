import { unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { parseQuantity, QuantityError } from '../../../src/units/quantity.js';

/** Relative closeness, for values that may differ in the last bit between two correct computations. */
function expectClose(actual: number, expected: number, relative = 1e-15): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * relative);
}

function errorOf(run: () => unknown): string {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(QuantityError);
    return (error as Error).message;
  }
  throw new Error('expected a QuantityError');
}

describe('parseQuantity: plain numbers are in the SI base unit', () => {
  it('passes numbers and numeric text through', () => {
    expect(parseQuantity(1e-8, 'F')).toBe(1e-8);
    expect(parseQuantity('1e-8', 'F')).toBe(1e-8);
    expect(parseQuantity('4.7', 'ohm')).toBe(4.7);
    expect(parseQuantity(' .5 ', 'ohm')).toBe(0.5);
  });
});

describe('parseQuantity: SI prefixes without a unit', () => {
  // BIPM SI Brochure, 9th ed. 2019, Table 7 (the powers-of-1000 prefixes), written out here on purpose
  // rather than imported, so the table in src/ is checked against the source.
  const brochure: [string, number][] = [
    ['y', -24], ['z', -21], ['a', -18], ['f', -15], ['p', -12], ['n', -9], ['µ', -6], ['m', -3],
    ['k', 3], ['M', 6], ['G', 9], ['T', 12], ['P', 15], ['E', 18], ['Z', 21], ['Y', 24],
  ];
  for (const [symbol, exponent] of brochure) {
    it(`${symbol} is 10^${exponent}`, () => {
      expectClose(parseQuantity(`1.5${symbol}`, 'F'), 1.5 * 10 ** exponent, 1e-15);
      expectClose(parseQuantity(`2.2 ${symbol}`, 'ohm'), 2.2 * 10 ** exponent, 1e-15);
    });
  }

  it('tells M (mega) from m (milli), as the SI does (BIPM SI Brochure 2019, Table 7)', () => {
    expect(parseQuantity('10M', 'ohm')).toBe(1e7);
    expect(parseQuantity('10m', 'ohm')).toBe(1e-2);
  });

  it('reads micro as u, µ (U+00B5 micro sign) or μ (U+03BC Greek mu) (common practice)', () => {
    expect(parseQuantity('4.7u', 'F')).toBe(4.7e-6);
    expect(parseQuantity('4.7\u00b5', 'F')).toBe(4.7e-6);
    expect(parseQuantity('4.7\u03bc', 'F')).toBe(4.7e-6);
  });

  it('rounds once from the decimal text, so 4.7u is the double nearest 4.7e-6 (ECMAScript number literal)', () => {
    // The literal 4.7e-6 is correctly rounded by the language; 4.7 * 1e-6 need not be.
    expect(parseQuantity('4.7u', 'F')).toBe(4.7e-6);
    expect(parseQuantity('33n', 'F')).toBe(33e-9);
    expect(parseQuantity('1e3k', 'ohm')).toBe(1e6);
  });

  it('gives frequencies from a bare prefix', () => {
    expect(parseQuantity('163k', 'Hz')).toBe(163000);
  });
});

describe('parseQuantity: text with a unit agrees with mathjs', () => {
  // Reference: mathjs unit(...).toNumber(...). mathjs has no Ω, so the reference text spells it ohm.
  const cases: [string, 'F' | 'H' | 'ohm' | 'Hz' | 'V' | 'A' | 's', string][] = [
    ['10nF', 'F', '10 nF'],
    ['10 nF', 'F', '10 nF'],
    ['4.7uF', 'F', '4.7 uF'],
    ['4.7µF', 'F', '4.7 uF'],
    ['100 pF', 'F', '100 pF'],
    ['22uH', 'H', '22 uH'],
    ['22 µH', 'H', '22 uH'],
    ['1.5mH', 'H', '1.5 mH'],
    ['163kHz', 'Hz', '163 kHz'],
    ['0.163MHz', 'Hz', '0.163 MHz'],
    ['50 Hz', 'Hz', '50 Hz'],
    ['2.2kΩ', 'ohm', '2.2 kohm'],
    ['2.2 kohm', 'ohm', '2.2 kohm'],
    ['2.2 kOhm', 'ohm', '2.2 kohm'],
    ['47 Ω', 'ohm', '47 ohm'],
    ['1 MΩ', 'ohm', '1 Mohm'],
    ['20 mΩ', 'ohm', '20 mohm'],
    ['3.3 V', 'V', '3.3 V'],
    ['20 mA', 'A', '20 mA'],
    ['1.5 ms', 's', '1.5 ms'],
    ['1e-8 F', 'F', '1e-8 F'],
  ];
  for (const [text, target, reference] of cases) {
    it(`${text} -> ${target}`, () => {
      expectClose(parseQuantity(text, target), unit(reference).toNumber(target), 1e-15);
    });
  }

  it('gives the same double for 33nF and 33n', () => {
    expect(parseQuantity('33nF', 'F')).toBe(parseQuantity('33n', 'F'));
  });

  it('converts units that are not a power of ten of the base unit through mathjs (a minute is 60 s)', () => {
    expectClose(parseQuantity('2 min', 's'), unit('2 min').toNumber('s'));
  });
});

describe('parseQuantity: RKM code (IEC 60062, from memory)', () => {
  const cases: [string, 'F' | 'H' | 'ohm', number][] = [
    ['4R7', 'ohm', 4.7],
    ['R47', 'ohm', 0.47],
    ['47R', 'ohm', 47],
    ['2k2', 'ohm', 2200],
    ['2K2', 'ohm', 2200],
    ['4k75', 'ohm', 4750],
    ['1M5', 'ohm', 1.5e6],
    ['4M7', 'ohm', 4.7e6],
    ['4n7', 'F', 4.7e-9],
    ['4u7', 'F', 4.7e-6],
    ['p68', 'F', 0.68e-12],
    ['2m2', 'H', 2.2e-3],
  ];
  for (const [text, target, expected] of cases) {
    it(`${text} is ${expected}`, () => expect(parseQuantity(text, target)).toBe(expected));
  }

  it('keeps R for resistance', () => {
    expect(errorOf(() => parseQuantity('4R7', 'F'))).toBe('"4R7" uses the RKM letter R, which marks ohms; expected farads');
  });
});

describe('parseQuantity: rejections', () => {
  it('names the unit found and the one expected', () => {
    expect(errorOf(() => parseQuantity('10uH', 'F'))).toBe('"10uH" is in henries, expected farads');
    expect(errorOf(() => parseQuantity('10 nF', 'H'))).toBe('"10 nF" is in farads, expected henries');
    expect(errorOf(() => parseQuantity('1 kΩ', 'F'))).toBe('"1 kΩ" is in ohms, expected farads');
    expect(errorOf(() => parseQuantity('10 s', 'Hz'))).toBe('"10 s" is in seconds, expected hertz');
    expect(errorOf(() => parseQuantity('3 kg', 'F'))).toBe('"3 kg" is not in farads');
  });

  it('refuses zero, negative, NaN and infinite values', () => {
    expect(errorOf(() => parseQuantity(0, 'F'))).toMatch(/zero/);
    expect(errorOf(() => parseQuantity('0n', 'F'))).toMatch(/zero/);
    expect(errorOf(() => parseQuantity(-1e-9, 'F'))).toMatch(/negative/);
    expect(errorOf(() => parseQuantity('-10n', 'F'))).toMatch(/negative/);
    expect(errorOf(() => parseQuantity('-2k2', 'ohm'))).toMatch(/negative/);
    expect(errorOf(() => parseQuantity(Number.NaN, 'F'))).toMatch(/not a number/);
    expect(errorOf(() => parseQuantity(Number.POSITIVE_INFINITY, 'F'))).toMatch(/not finite/);
    expect(errorOf(() => parseQuantity('1e999', 'F'))).toMatch(/not finite/);
  });

  it('accepts zero only when asked to (an ideal series resistance)', () => {
    expect(parseQuantity(0, 'ohm', { allowZero: true })).toBe(0);
    expect(errorOf(() => parseQuantity(-1, 'ohm', { allowZero: true }))).toMatch(/negative/);
  });

  it('refuses empty text, non-values and other types', () => {
    expect(errorOf(() => parseQuantity('', 'F'))).toBe('the value is empty');
    expect(errorOf(() => parseQuantity('   ', 'F'))).toBe('the value is empty');
    expect(errorOf(() => parseQuantity('abc', 'F'))).toMatch(/^"abc" is not a value/);
    expect(errorOf(() => parseQuantity('1,5n', 'F'))).toMatch(/decimal point/);
    expect(errorOf(() => parseQuantity('10 nX', 'F'))).toMatch(/unit that is not known/);
    expect(errorOf(() => parseQuantity('10 n F x', 'F'))).toMatch(/not/);
    expect(errorOf(() => parseQuantity(null, 'F'))).toMatch(/got nothing/);
    expect(errorOf(() => parseQuantity(undefined, 'F'))).toMatch(/got nothing/);
    expect(errorOf(() => parseQuantity(true, 'F'))).toMatch(/got boolean/);
    expect(errorOf(() => parseQuantity([1], 'F'))).toMatch(/got a list/);
  });

  it('keeps every message on one line', () => {
    for (const bad of ['10uH', 'abc', '', '1,5n', '10 nX', '-1']) {
      expect(errorOf(() => parseQuantity(bad, 'F'))).not.toContain('\n');
    }
  });
});
