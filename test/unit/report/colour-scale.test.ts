// The colour scale of the board maps. Relative luminance per WCAG 2.x (from memory): white 1, black 0,
// pure sRGB red 0.2126, green 0.7152, blue 0.0722. A sequential scale must rise in lightness from end to
// end so that its order survives greyscale print and colour-vision deficiencies (common practice).
import { describe, expect, it } from 'vitest';
import { LogColourScale, RAMP, rampColour, relativeLuminance, rgbHex } from '../../../src/report/colour-scale.js';

describe('relative luminance', () => {
  it('matches the WCAG anchor values', () => {
    expect(relativeLuminance({ r: 255, g: 255, b: 255 })).toBeCloseTo(1, 12);
    expect(relativeLuminance({ r: 0, g: 0, b: 0 })).toBe(0);
    expect(relativeLuminance({ r: 255, g: 0, b: 0 })).toBeCloseTo(0.2126, 12);
    expect(relativeLuminance({ r: 0, g: 255, b: 0 })).toBeCloseTo(0.7152, 12);
    expect(relativeLuminance({ r: 0, g: 0, b: 255 })).toBeCloseTo(0.0722, 12);
    // sRGB mid grey 128 is about 21.6 % luminance (from memory).
    expect(relativeLuminance({ r: 128, g: 128, b: 128 })).toBeCloseTo(0.2158, 3);
  });
});

describe('the ramp', () => {
  it('rises in luminance all the way (checked at 101 points)', () => {
    const lum = Array.from({ length: 101 }, (_, i) => relativeLuminance(rampColour(i / 100)));
    for (let i = 1; i < lum.length; i++) expect(lum[i]).toBeGreaterThan(lum[i - 1]);
  });

  it('spans a wide lightness range: the ends differ by a contrast ratio above 7 (WCAG: (L1 + 0.05) / (L2 + 0.05))', () => {
    const dark = relativeLuminance(RAMP[0]);
    const light = relativeLuminance(RAMP[RAMP.length - 1]);
    expect((light + 0.05) / (dark + 0.05)).toBeGreaterThan(7);
  });

  it('ends at its first and last stops and clamps outside [0, 1]', () => {
    expect(rgbHex(rampColour(0))).toBe(rgbHex(RAMP[0]));
    expect(rgbHex(rampColour(1))).toBe(rgbHex(RAMP[RAMP.length - 1]));
    expect(rgbHex(rampColour(-2))).toBe(rgbHex(RAMP[0]));
    expect(rgbHex(rampColour(7))).toBe(rgbHex(RAMP[RAMP.length - 1]));
  });

  it('writes colours as #rrggbb', () => {
    expect(rgbHex({ r: 255, g: 0, b: 16 })).toBe('#ff0010');
  });
});

describe('log colour scale', () => {
  const s = new LogColourScale(1, 10_000);

  it('places values by their logarithm: the geometric mean in the middle, each decade a quarter', () => {
    expect(s.position(1)).toBe(0);
    expect(s.position(10_000)).toBe(1);
    expect(s.position(100)).toBeCloseTo(0.5, 12);
    expect(s.position(10)).toBeCloseTo(0.25, 12);
  });

  it('clamps values outside its range to its ends', () => {
    expect(s.colour(0.01)).toBe(s.colour(1));
    expect(s.colour(1e9)).toBe(s.colour(10_000));
  });

  it('spans only positive finite values', () => {
    const t = LogColourScale.spanning([0, -5, Number.NaN, Infinity, 3, 300])!;
    expect(t.min).toBe(3);
    expect(t.max).toBe(300);
    expect(LogColourScale.spanning([0, Number.NaN])).toBeUndefined();
  });

  it('puts a single value in the middle of a decade', () => {
    const t = new LogColourScale(50, 50);
    expect(t.position(50)).toBeCloseTo(0.5, 12);
    expect(Math.log10(t.max / t.min)).toBeCloseTo(1, 12);
  });
});
