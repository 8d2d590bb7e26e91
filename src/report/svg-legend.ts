// Keys for the figures, as small HTML lists with inline SVG swatches (they print and wrap with the text),
// and the colour bar of the board maps with ticks on the same log scale.
import { html, type Markup } from './escape-html.js';
import { rampColour, rgbHex, type LogColourScale } from './colour-scale.js';
import { logScale } from './svg-axes.js';
import { markerMarkup, type MarkerShape } from './svg-markers.js';

export type KeyItem =
  | { swatch: 'marker'; shape: MarkerShape; className: string; label: string }
  | { swatch: 'line'; className: string; label: string }
  | { swatch: 'band'; label: string };

export function keyMarkup(items: readonly KeyItem[]): Markup {
  return html`<ul class="key">${items.map((item) => html`<li>${swatch(item)}<span>${item.label}</span></li>`)}</ul>`;
}

function swatch(item: KeyItem): Markup {
  const open = html`<svg class="swatch" viewBox="0 0 22 14" width="22" height="14" aria-hidden="true">`;
  if (item.swatch === 'marker') return html`${open}${markerMarkup(item.shape, 11, 7, 4, item.className, item.label)}</svg>`;
  if (item.swatch === 'line') return html`${open}<path class="${item.className}" d="M1 7L21 7"/></svg>`;
  return html`${open}<rect class="band" x="1" y="2" width="20" height="10"/></svg>`;
}

/** The shared scale of the two maps: a bar of the ramp with |Z| ticks. */
export function colourBar(scale: LogColourScale, label: string, format: (v: number) => string, width = 420): Markup {
  const left = 12;
  const right = width - 12;
  const segments = 48;
  const step = (right - left) / segments;
  const rects = Array.from({ length: segments }, (_, i) => {
    const colour = rgbHex(rampColour((i + 0.5) / segments));
    return html`<rect x="${(left + i * step).toFixed(2)}" y="4" width="${(step + 0.4).toFixed(2)}" height="14" fill="${colour}"/>`;
  });
  const axis = logScale([scale.min, scale.max], [left, right]);
  const ticks = axis.ticks().map((v) => {
    const x = axis.map(v).toFixed(1);
    return html`<line class="tick-mark" x1="${x}" x2="${x}" y1="18" y2="23"/><text class="tick x" x="${x}" y="34">${format(v)}</text>`;
  });
  return html`<svg class="colour-bar" viewBox="0 0 ${width} 40" width="${width}" height="40" role="img" aria-label="${label}">${rects}<rect class="bar-frame" x="${left}" y="4" width="${right - left}" height="14"/>${ticks}</svg>`;
}
