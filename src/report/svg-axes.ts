// Scales (value -> pixel), tick choice and the drawn axes of a plot. Logarithmic axes give every decade
// the same length; tick values stay on the 1-2-5 sequence (or whole decades) so labels read cleanly.
import { html, type Markup } from './escape-html.js';

export interface Scale {
  readonly kind: 'linear' | 'log';
  readonly domain: readonly [number, number];
  readonly range: readonly [number, number];
  /** Pixel position of `value`; NaN where the scale cannot place it (a log scale at zero or below). */
  map(value: number): number;
  /** Tick values inside the domain. */
  ticks(): number[];
}

export function linearScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  const [d0, d1] = domain;
  const span = d1 - d0 || 1;
  return {
    kind: 'linear',
    domain,
    range,
    map: (v) => range[0] + ((v - d0) / span) * (range[1] - range[0]),
    ticks: () => linearTicks(d0, d1),
  };
}

export function logScale(domain: readonly [number, number], range: readonly [number, number]): Scale {
  const [d0, d1] = domain;
  if (!(d0 > 0) || !(d1 > 0)) throw new RangeError(`log scale needs a positive domain, got [${d0}, ${d1}]`);
  const span = Math.log(d1 / d0) || 1;
  return {
    kind: 'log',
    domain,
    range,
    map: (v) => (v > 0 ? range[0] + (Math.log(v / d0) / span) * (range[1] - range[0]) : Number.NaN),
    ticks: () => logTicks(d0, d1),
  };
}

/** A step of 1, 2 or 5 times a power of ten giving about `target` intervals over `span`. */
export function niceStep(span: number, target = 5): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / target;
  const power = 10 ** Math.floor(Math.log10(raw));
  const m = raw / power;
  return (m < 1.5 ? 1 : m < 3.5 ? 2 : m < 7.5 ? 5 : 10) * power;
}

const clean = (v: number) => Number(v.toPrecision(10));

export function linearTicks(lo: number, hi: number, target = 5): number[] {
  const step = niceStep(hi - lo, target);
  const ticks: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + step * 1e-9; k++) ticks.push(clean(k * step) || 0);
  return ticks;
}

/** Whole decades over wide ranges, 1-2-5 over a few decades, 1…9 within about one; linear when narrower. */
export function logTicks(lo: number, hi: number): number[] {
  const decades = Math.log10(hi / lo);
  const mantissas = decades > 2.5 ? [1] : decades > 0.8 ? [1, 2, 5] : [1, 2, 3, 4, 5, 6, 7, 8, 9];
  const every = Math.max(1, Math.ceil(decades / 8));
  const ticks: number[] = [];
  const first = Math.floor(Math.log10(lo));
  for (let e = first; e <= Math.ceil(Math.log10(hi)); e++) {
    if (mantissas.length === 1 && (e - first) % every !== 0) continue;
    for (const m of mantissas) {
      const v = Number((m * 10 ** e).toPrecision(6));
      if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) ticks.push(v);
    }
  }
  return ticks.length >= 2 ? ticks : linearTicks(lo, hi, 4).filter((v) => v > 0);
}

/** The range of the finite values (positive only when `positive`), widened by `pad` of its span (log span when positive). */
export function paddedDomain(values: Iterable<number>, options: { positive?: boolean; pad?: number } = {}): [number, number] | undefined {
  const pad = options.pad ?? 0.05;
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v) || (options.positive && !(v > 0))) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  if (!(lo <= hi)) return undefined;
  if (options.positive) {
    // A single value (or a very flat set) still gets a readable half-decade either side.
    const span = Math.max(Math.log10(hi / lo), 0.2);
    const centre = Math.sqrt(lo * hi);
    const half = (span / 2) * (1 + 2 * pad);
    return [centre / 10 ** half, centre * 10 ** half];
  }
  const span = hi - lo || Math.abs(hi) || 1;
  return [lo - span * pad, hi + span * pad];
}

/** The inner rectangle of a plot, in pixels. */
export interface PlotBox {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

export interface Axis {
  scale: Scale;
  label: string;
  format: (value: number) => string;
  /** Ticks to draw instead of the scale's own (category positions, for instance). */
  ticks?: number[];
  /** Slant the tick labels (many category names). */
  slanted?: boolean;
}

/** Grid lines, ticks, tick labels and axis titles of one plot. */
export function axesMarkup(box: PlotBox, x: Axis, y: Axis): Markup {
  const xTicks = x.ticks ?? x.scale.ticks();
  const yTicks = y.ticks ?? y.scale.ticks();
  const xs = xTicks.map((v) => ({ v, p: x.scale.map(v) })).filter((t) => Number.isFinite(t.p));
  const ys = yTicks.map((v) => ({ v, p: y.scale.map(v) })).filter((t) => Number.isFinite(t.p));
  const f = (n: number) => n.toFixed(1);
  const midY = (box.top + box.bottom) / 2;
  return html`<g class="axes">
<rect class="plot-area" x="${f(box.left)}" y="${f(box.top)}" width="${f(box.right - box.left)}" height="${f(box.bottom - box.top)}"/>
${ys.map((t) => html`<line class="grid" x1="${f(box.left)}" x2="${f(box.right)}" y1="${f(t.p)}" y2="${f(t.p)}"/><text class="tick y" x="${f(box.left - 6)}" y="${f(t.p + 4)}">${y.format(t.v)}</text>
`)}${xs.map((t) =>
    x.slanted
      ? html`<line class="grid" x1="${f(t.p)}" x2="${f(t.p)}" y1="${f(box.top)}" y2="${f(box.bottom)}"/><text class="tick x slanted" transform="translate(${f(t.p + 3)} ${f(box.bottom + 10)}) rotate(-50)">${x.format(t.v)}</text>
`
      : html`<line class="grid" x1="${f(t.p)}" x2="${f(t.p)}" y1="${f(box.top)}" y2="${f(box.bottom)}"/><text class="tick x" x="${f(t.p)}" y="${f(box.bottom + 16)}">${x.format(t.v)}</text>
`,
  )}<text class="axis-title x" x="${f((box.left + box.right) / 2)}" y="${f(box.bottom + (x.slanted ? 46 : 34))}">${x.label}</text>
<text class="axis-title y" transform="translate(${f(box.left - 52)} ${f(midY)}) rotate(-90)">${y.label}</text>
</g>`;
}
