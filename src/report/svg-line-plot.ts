// One x-y plot as inline SVG: shaded bands (the judging band of each reading), lines (predictions),
// markers (readings), vertical guides (mode frequencies) and a zero line. Data coordinates in, pixels
// worked out here; everything outside the domain is pinned to the plot's edge.
import { html, type Markup } from './escape-html.js';
import { axesMarkup, linearScale, logScale, type Axis, type PlotBox, type Scale } from './svg-axes.js';
import { markerMarkup, type MarkerShape } from './svg-markers.js';

export interface AxisSpec {
  kind: 'linear' | 'log';
  domain: readonly [number, number];
  label: string;
  format: (value: number) => string;
  ticks?: number[];
  slanted?: boolean;
}

export interface PlotMarker {
  x: number;
  y: number;
  shape: MarkerShape;
  className: string;
  title: string;
  attrs?: Record<string, string>;
}

export interface PlotLine {
  points: readonly (readonly [number, number])[];
  className: string;
}

/** A rectangle in data coordinates (x0..x1, y0..y1). */
export interface PlotBand {
  x0: number;
  x1: number;
  y0: number;
  y1: number;
}

export interface PlotGuide {
  x: number;
  label: string;
}

export interface LinePlotSpec {
  /** Accessible name of the figure. */
  label: string;
  width?: number;
  height?: number;
  x: AxisSpec;
  y: AxisSpec;
  bands?: readonly PlotBand[];
  lines?: readonly PlotLine[];
  markers?: readonly PlotMarker[];
  guides?: readonly PlotGuide[];
  /** Draw the line y = 0 (signed quantities). */
  zero?: boolean;
  /** Class of the <svg> element (lets a page or test find a plot by its job). */
  className: string;
  markerSize?: number;
}

export const PLOT_MARGIN = { left: 70, right: 16, top: 14, bottom: 44 };

export function plotBox(width: number, height: number, slantedX = false): PlotBox {
  return { left: PLOT_MARGIN.left, top: PLOT_MARGIN.top, right: width - PLOT_MARGIN.right, bottom: height - PLOT_MARGIN.bottom - (slantedX ? 14 : 0) };
}

export function scaleFor(spec: AxisSpec, range: readonly [number, number]): Scale {
  return spec.kind === 'log' ? logScale(spec.domain, range) : linearScale(spec.domain, range);
}

const f = (n: number) => n.toFixed(1);
const pin = (v: number, a: number, b: number) => Math.min(Math.max(v, Math.min(a, b)), Math.max(a, b));

export function linePlot(spec: LinePlotSpec): Markup {
  const width = spec.width ?? 520;
  const height = spec.height ?? 260;
  const box = plotBox(width, height, spec.x.slanted);
  const xs = scaleFor(spec.x, [box.left, box.right]);
  const ys = scaleFor(spec.y, [box.bottom, box.top]);
  const px = (v: number) => pin(xs.map(v), box.left, box.right);
  const py = (v: number) => pin(ys.map(v), box.top, box.bottom);
  const xAxis: Axis = { scale: xs, label: spec.x.label, format: spec.x.format, ticks: spec.x.ticks, slanted: spec.x.slanted };
  const yAxis: Axis = { scale: ys, label: spec.y.label, format: spec.y.format, ticks: spec.y.ticks };

  const bands = (spec.bands ?? []).flatMap((b) => {
    const x0 = px(b.x0);
    const x1 = px(b.x1);
    // On a log axis a band reaching down to 0 Ω runs off the bottom of the plot.
    const yEnd = (v: number) => (ys.kind === 'log' && !(v > 0) ? box.bottom : py(v));
    const y0 = yEnd(b.y0);
    const y1 = yEnd(b.y1);
    if (![x0, x1, y0, y1].every(Number.isFinite)) return [];
    return [html`<rect class="band" x="${f(Math.min(x0, x1))}" y="${f(Math.min(y0, y1))}" width="${f(Math.abs(x1 - x0))}" height="${f(Math.max(Math.abs(y1 - y0), 1))}"/>`];
  });
  const lines = (spec.lines ?? []).map((line) => html`<path class="${line.className}" d="${pathData(line.points, px, py)}"/>`);
  const guides = (spec.guides ?? []).flatMap((g) => {
    const x = xs.map(g.x);
    if (!(x >= box.left && x <= box.right)) return [];
    return [html`<line class="guide" x1="${f(x)}" x2="${f(x)}" y1="${f(box.top)}" y2="${f(box.bottom)}"/><text class="guide-label" x="${f(x + 3)}" y="${f(box.top + 11)}">${g.label}</text>`];
  });
  const zero = spec.zero && ys.map(0) >= box.top && ys.map(0) <= box.bottom ? html`<line class="zero" x1="${f(box.left)}" x2="${f(box.right)}" y1="${f(ys.map(0))}" y2="${f(ys.map(0))}"/>` : '';
  const size = spec.markerSize ?? 4;
  const markers = (spec.markers ?? []).flatMap((m) => {
    const x = xs.map(m.x);
    const y = ys.map(m.y);
    if (!Number.isFinite(x) || !Number.isFinite(y)) return [];
    return [markerMarkup(m.shape, pin(x, box.left, box.right), pin(y, box.top, box.bottom), size, m.className, m.title, m.attrs)];
  });
  return html`<svg class="plot ${spec.className}" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" role="img" aria-label="${spec.label}">
${axesMarkup(box, xAxis, yAxis)}
<g class="bands">${bands}</g>${zero}<g class="guides">${guides}</g>
<g class="lines">${lines}</g>
<g class="markers">${markers}</g>
</svg>`;
}

/** SVG path data through the points; a point the scale cannot place (log of zero) breaks the line. */
export function pathData(points: readonly (readonly [number, number])[], px: (v: number) => number, py: (v: number) => number): string {
  let d = '';
  let pen = false;
  for (const [x, y] of points) {
    const X = px(x);
    const Y = py(y);
    if (!Number.isFinite(X) || !Number.isFinite(Y) || !Number.isFinite(x) || !Number.isFinite(y)) {
      pen = false;
      continue;
    }
    d += `${pen ? 'L' : 'M'}${f(X)} ${f(Y)}`;
    pen = true;
  }
  return d;
}
