// The one colour scale both board maps share: |Z| on a logarithmic axis onto a sequential ramp of our own,
// from deep indigo through teal and green to pale sand. Lightness rises steadily along it, so the order
// reads in greyscale print and for the common red-green colour-vision deficiencies (the ramp runs along
// the blue-yellow axis they keep).

export interface Rgb {
  r: number;
  g: number;
  b: number;
}

/** Stops of the ramp, low values first, evenly spaced. */
export const RAMP: readonly Rgb[] = [
  { r: 0x26, g: 0x1a, b: 0x52 },
  { r: 0x2c, g: 0x45, b: 0x85 },
  { r: 0x24, g: 0x74, b: 0x8a },
  { r: 0x3f, g: 0x9e, b: 0x74 },
  { r: 0x9c, g: 0xc1, b: 0x5e },
  { r: 0xf1, g: 0xe4, b: 0x9c },
];

export function rgbHex({ r, g, b }: Rgb): string {
  const part = (v: number) => Math.round(Math.min(255, Math.max(0, v))).toString(16).padStart(2, '0');
  return `#${part(r)}${part(g)}${part(b)}`;
}

/** The ramp's colour at `t` in [0, 1] (clamped), linear between stops. */
export function rampColour(t: number): Rgb {
  const u = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(u));
  const f = u - i;
  const a = RAMP[i];
  const b = RAMP[i + 1];
  return { r: a.r + (b.r - a.r) * f, g: a.g + (b.g - a.g) * f, b: a.b + (b.b - a.b) * f };
}

/**
 * Relative luminance of an sRGB colour (WCAG 2.x definition, from memory): linearize each channel, then
 * 0.2126 R + 0.7152 G + 0.0722 B. Used to pick dark or light text on a swatch.
 */
export function relativeLuminance({ r, g, b }: Rgb): number {
  const lin = (v: number) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

/** Positive values onto the ramp by their logarithm; `min` at the dark end, `max` at the light end. */
export class LogColourScale {
  readonly min: number;
  readonly max: number;

  constructor(min: number, max: number) {
    if (!(min > 0) || !(max > 0) || !Number.isFinite(min) || !Number.isFinite(max)) throw new RangeError(`log colour scale needs positive finite ends, got ${min} and ${max}`);
    // One value only: a decade around it, so the colour is the middle of the ramp rather than undefined.
    if (max <= min) {
      const centre = Math.sqrt(min * max);
      this.min = centre / 10 ** 0.5;
      this.max = centre * 10 ** 0.5;
    } else {
      this.min = min;
      this.max = max;
    }
  }

  /** The scale spanning every positive finite value given; undefined when there is none. */
  static spanning(values: Iterable<number>): LogColourScale | undefined {
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of values) {
      if (!(v > 0) || !Number.isFinite(v)) continue;
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    return lo <= hi ? new LogColourScale(lo, hi) : undefined;
  }

  /** Where `value` sits, 0 at min to 1 at max (clamped). */
  position(value: number): number {
    const t = Math.log(value / this.min) / Math.log(this.max / this.min);
    return Math.min(1, Math.max(0, t));
  }

  colour(value: number): string {
    return rgbHex(rampColour(this.position(value)));
  }
}
