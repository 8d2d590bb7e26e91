import { describe, expect, it } from 'vitest';
import { parsePercent, QuantityError } from '../../../src/units/quantity.js';

describe('parsePercent', () => {
  it('reads percentages into fractions (1 % = 0.01; BIPM SI Brochure 2019, 5.4.7)', () => {
    expect(parsePercent('5%')).toBe(0.05);
    expect(parsePercent('5 %')).toBe(0.05);
    expect(parsePercent(' ±10% ')).toBe(0.1);
    expect(parsePercent('0.5%')).toBe(0.005);
    expect(parsePercent('0%')).toBe(0);
  });

  it('refuses a bare number rather than guess between percent and fraction', () => {
    expect(() => parsePercent(5)).toThrow(QuantityError);
    expect(() => parsePercent(0.05)).toThrow(/no percent sign/);
    expect(() => parsePercent('5')).toThrow(/not a percentage/);
  });

  it('refuses negative, 100 % and more, and non-percentages', () => {
    expect(() => parsePercent('-5%')).toThrow(/negative/);
    expect(() => parsePercent('100%')).toThrow(/below 100/);
    expect(() => parsePercent('five%')).toThrow(/not a percentage/);
    expect(() => parsePercent(null)).toThrow(/got nothing/);
  });
});
