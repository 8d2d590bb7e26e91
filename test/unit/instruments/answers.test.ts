// Strict reading of instrument answers against the IEEE 488.2 numeric response forms and the SCPI-99
// overload convention; polar answers checked against mathjs's complex numbers as the reference.
import { describe, expect, it } from 'vitest';
import { complex } from 'mathjs';
import {
  INVALID,
  numericForm,
  readComplex,
  readFlags,
  readInteger,
  readNumber,
  readNumbers,
  readValue,
} from '../../../src/instruments/answers.js';
import { AnswerError } from '../../../src/instruments/instrument-errors.js';
import { parseErrorEntry } from '../../../src/instruments/error-queue.js';
import { parseIdentity } from '../../../src/instruments/identity.js';

function failure(read: () => unknown): AnswerError {
  try {
    read();
  } catch (error) {
    expect(error).toBeInstanceOf(AnswerError);
    return error as AnswerError;
  }
  throw new Error('expected an AnswerError');
}

describe('IEEE 488.2 numeric response forms (8.7.2 to 8.7.4, from memory)', () => {
  it('NR1 is an integer with an optional sign', () => {
    expect(numericForm('+12')).toBe('NR1');
    expect(numericForm('-7')).toBe('NR1');
    expect(numericForm('0')).toBe('NR1');
    expect(readNumber('+12', 'AVER?')).toBe(12);
  });

  it('NR2 has an explicit decimal point', () => {
    expect(numericForm('-1.5')).toBe('NR2');
    expect(numericForm('.25')).toBe('NR2');
    expect(numericForm('3.')).toBe('NR2');
    expect(readNumber('-1.5', 'VOLT?')).toBe(-1.5);
  });

  it('NR3 has an exponent', () => {
    expect(numericForm('1.5E+3')).toBe('NR3');
    expect(numericForm('-2.50E-06')).toBe('NR3');
    expect(numericForm('+1E9')).toBe('NR3');
    expect(readNumber('1.5E+3', 'FREQ?')).toBe(1500);
    expect(readNumber('+1.63000000E+05', 'FREQ?')).toBe(163000);
  });

  it('anything else is not a number', () => {
    for (const text of ['', ' 12', '12 ', '1,5', '1.5.2', 'E3', '1E', '0x1F', 'INF', 'NaN', '--1', '1e+', '.', '+']) {
      expect(numericForm(text)).toBeUndefined();
    }
  });
});

describe('number lists', () => {
  it('reads comma-separated fields in order', () => {
    expect(readNumbers('+12,-1.5,1.5E+3', 'TEST?')).toEqual([12, -1.5, 1500]);
  });

  it('demands the exact number of fields', () => {
    expect(failure(() => readNumbers('1.0,2.0,3.0', 'FETCh?', 2)).message).toBe('answer to "FETCh?" has 3 fields, expected 2: "1.0,2.0,3.0"');
    expect(failure(() => readNumbers('1.0', 'FETCh?', 2)).message).toBe('answer to "FETCh?" has 1 field, expected 2: "1.0"');
  });

  it('names the bad field and quotes the answer', () => {
    const error = failure(() => readNumbers('1.5,abc', 'READ?', 2));
    expect(error.message).toBe('answer to "READ?" field 2 "abc" is not a number in NR1, NR2 or NR3 form: "1.5,abc"');
    expect(error.exitCode).toBe(3);
    expect(error.command).toBe('READ?');
    expect(error.answer).toBe('1.5,abc');
  });

  it('an empty field or an empty answer is an error', () => {
    expect(failure(() => readNumbers('1.5,', 'READ?', 2)).message).toBe('answer to "READ?" field 2 "" is not a number in NR1, NR2 or NR3 form: "1.5,"');
    expect(failure(() => readNumber('', 'FREQ?')).message).toBe('answer to "FREQ?" is empty: ""');
  });

  it('control characters in a bad answer are shown escaped, on one line', () => {
    expect(failure(() => readNumber('1.5\r', 'FREQ?')).message).toBe('answer to "FREQ?" is not a number in NR1, NR2 or NR3 form: "1.5\\r"');
  });

  it('a value beyond the range of a double is refused, not turned into Infinity', () => {
    expect(failure(() => readNumber('1E999', 'FREQ?')).message).toBe('answer to "FREQ?" field 1 is beyond the range of a double: "1E999"');
  });
});

describe('the SCPI overload marker (SCPI-99 vol. 1, 7.2.1, from memory)', () => {
  it('9.9E37 in any numeric spelling is an invalid reading, not a number', () => {
    for (const text of ['9.9E37', '+9.9E+37', '9.90000E+37', '-9.9E37', '99E36']) expect(readNumber(text, 'READ?')).toBe(INVALID);
  });

  it('9.91E37 (not a number) is invalid too', () => {
    expect(readNumber('9.91E37', 'READ?')).toBe(INVALID);
    expect(readNumber('-9.91E+37', 'READ?')).toBe(INVALID);
  });

  it('a nearby ordinary value is a number', () => {
    expect(readNumber('9.8E37', 'READ?')).toBe(9.8e37);
  });

  it('an impedance pair with a marker in either field is invalid', () => {
    expect(readComplex('9.9E37,9.9E37', 'READ?', 'rect')).toBe(INVALID);
    expect(readComplex('12.5,9.9E37', 'READ?', 'polar-deg')).toBe(INVALID);
  });

  it('a setting read back as the marker is an error', () => {
    expect(failure(() => readValue('9.9E37', 'FREQ?')).message).toBe('answer to "FREQ?" is the overload marker where a value was expected: "9.9E37"');
  });
});

describe('impedance answers', () => {
  it('rect is re,im in ohms', () => {
    expect(readComplex('1.25E+02,-3.5E+01', 'READ?', 'rect')).toEqual({ re: 125, im: -35 });
  });

  it('polar-deg is |Z|,phase in degrees; converted like mathjs complex({r, phi}) (its {abs, arg} form)', () => {
    for (const [abs, deg] of [[100, 30], [2.2e3, -89.5], [0.5, 180], [47, 0], [1e6, 90]]) {
      const got = readComplex(`${abs},${deg}`, 'FETC?', 'polar-deg');
      // Reference: mathjs builds the complex number from magnitude and argument in radians.
      const ref = complex({ r: abs, phi: (deg * Math.PI) / 180 });
      expect(got).not.toBe(INVALID);
      if (got === INVALID) continue;
      expect(got.re).toBeCloseTo(ref.re, 9);
      expect(got.im).toBeCloseTo(ref.im, 9);
    }
  });

  it('polar-rad takes the phase in radians', () => {
    const got = readComplex('10,1.0', 'FETC?', 'polar-rad');
    const ref = complex({ r: 10, phi: 1 });
    expect(got).not.toBe(INVALID);
    if (got !== INVALID) {
      expect(got.re).toBeCloseTo(ref.re, 12);
      expect(got.im).toBeCloseTo(ref.im, 12);
    }
  });

  it('a negative magnitude is refused', () => {
    expect(failure(() => readComplex('-5,10', 'FETC?', 'polar-deg')).message).toBe('answer to "FETC?" gives a negative magnitude in polar form: "-5,10"');
  });
});

describe('flags, integers, error entries, identity', () => {
  it('ROUTe:CLOSe? flags are 1 or 0, one per channel, in list order', () => {
    expect(readFlags('1,0,1', 'ROUTe:CLOSe? (@101,102,103)', 3)).toEqual([true, false, true]);
    expect(failure(() => readFlags('1,0', 'ROUTe:CLOSe? (@101,102,103)', 3)).message).toBe(
      'answer to "ROUTe:CLOSe? (@101,102,103)" has 2 flags, expected 3: "1,0"',
    );
    expect(failure(() => readFlags('1,2', 'ROUT:CLOS? (@1,2)', 2)).message).toBe('answer to "ROUT:CLOS? (@1,2)" flag 2 "2" is not 1 or 0: "1,2"');
  });

  it('readInteger takes NR1 only', () => {
    expect(readInteger('+32', '*ESR?')).toBe(32);
    expect(failure(() => readInteger('32.0', '*ESR?')).message).toBe('answer to "*ESR?" is not a whole number (NR1): "32.0"');
  });

  it('error queue entries are <code>,"<message>" (SCPI-99, from memory)', () => {
    expect(parseErrorEntry('0,"No error"')).toEqual({ code: 0, message: 'No error' });
    expect(parseErrorEntry('-102,"Syntax error;FREQ 1O0"')).toEqual({ code: -102, message: 'Syntax error;FREQ 1O0' });
    expect(parseErrorEntry('-102,Syntax error')).toBeUndefined();
    expect(parseErrorEntry('"No error"')).toBeUndefined();
  });

  it('*IDN? has exactly four fields (IEEE 488.2, 10.14, from memory)', () => {
    expect(parseIdentity('Topoprobe Lab,SIM-SW256,SW-0007,2.0.1')).toMatchObject({ maker: 'Topoprobe Lab', model: 'SIM-SW256', serial: 'SW-0007', firmware: '2.0.1' });
    expect(() => parseIdentity('Topoprobe Lab,SIM-SW256,SW-0007,2.0.1,extra')).toThrow('has 5 fields, expected 4');
    expect(() => parseIdentity(',SIM-SW256,0,0')).toThrow('leaves the maker or the model empty');
  });
});
