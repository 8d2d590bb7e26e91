import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatQuantity, parseQuantity } from '../../../src/units/quantity.js';

describe('formatQuantity', () => {
  it('prints engineering notation with SI prefixes (BIPM SI Brochure 2019, Table 7)', () => {
    expect(formatQuantity(1e-8, 'F')).toBe('10 nF');
    expect(formatQuantity(163.4e3, 'Hz')).toBe('163.4 kHz');
    expect(formatQuantity(22e-6, 'H')).toBe('22 µH');
    expect(formatQuantity(2200, 'ohm')).toBe('2.2 kΩ');
    expect(formatQuantity(0.47, 'ohm')).toBe('470 mΩ');
    expect(formatQuantity(47, 'ohm')).toBe('47 Ω');
    expect(formatQuantity(3.3e-8, 'F')).toBe('33 nF');
    expect(formatQuantity(0, 'V')).toBe('0 V');
    expect(formatQuantity(-0.02, 'A')).toBe('-20 mA');
  });

  it('rounds to the requested significant digits and carries into the next prefix', () => {
    expect(formatQuantity(163_634.38, 'Hz')).toBe('163.6 kHz');
    expect(formatQuantity(163_634.38, 'Hz', 6)).toBe('163.634 kHz');
    expect(formatQuantity(999_960, 'Hz')).toBe('1 MHz');
    expect(formatQuantity(999.96e-9, 'F')).toBe('1 µF');
  });

  it('falls back to exponent notation beyond the prefixes', () => {
    expect(formatQuantity(1e-30, 'F')).toBe('1e-30 F');
  });

  it('reads back to the same value within its rounding (round trip through parseQuantity)', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-15, max: 1e12, noNaN: true }), (value) => {
        const back = parseQuantity(formatQuantity(value, 'F'), 'F');
        return Math.abs(back - value) <= value * 5e-4;
      }),
    );
  });
});
