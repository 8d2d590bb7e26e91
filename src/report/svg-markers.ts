// Point markers. A reading's flag is told by the shape as well as the colour (circle: within its band,
// triangle: a deviation), so the plots still read in greyscale print and without colour vision.
import { html, type Markup } from './escape-html.js';

export type MarkerShape = 'circle' | 'triangle' | 'diamond' | 'square' | 'cross';

const f = (n: number) => n.toFixed(1);

/** One marker centred at (x, y) pixels; `attrs` become attributes of the shape itself. */
export function markerMarkup(shape: MarkerShape, x: number, y: number, size: number, className: string, title: string, attrs: Record<string, string> = {}): Markup {
  const extra = Object.entries(attrs).map(([k, v]) => html` ${attributeName(k)}="${v}"`);
  const tip = html`<title>${title}</title>`;
  const s = size;
  switch (shape) {
    case 'circle':
      return html`<circle class="${className}" cx="${f(x)}" cy="${f(y)}" r="${f(s)}"${extra}>${tip}</circle>`;
    case 'square':
      return html`<rect class="${className}" x="${f(x - s)}" y="${f(y - s)}" width="${f(2 * s)}" height="${f(2 * s)}"${extra}>${tip}</rect>`;
    case 'triangle': {
      const h = s * 1.25;
      return html`<polygon class="${className}" points="${f(x)},${f(y - h)} ${f(x + h)},${f(y + h * 0.75)} ${f(x - h)},${f(y + h * 0.75)}"${extra}>${tip}</polygon>`;
    }
    case 'diamond': {
      const h = s * 1.3;
      return html`<polygon class="${className}" points="${f(x)},${f(y - h)} ${f(x + h)},${f(y)} ${f(x)},${f(y + h)} ${f(x - h)},${f(y)}"${extra}>${tip}</polygon>`;
    }
    case 'cross':
      return html`<path class="${className}" d="M${f(x - s)} ${f(y - s)}L${f(x + s)} ${f(y + s)}M${f(x - s)} ${f(y + s)}L${f(x + s)} ${f(y - s)}"${extra}>${tip}</path>`;
  }
}

/** Attribute names are ours, never from a file; anything else is refused rather than escaped. */
function attributeName(name: string): Markup {
  if (!/^[a-z][a-z0-9-]*$/.test(name)) throw new Error(`not an attribute name: ${name}`);
  return html`${name}`;
}
