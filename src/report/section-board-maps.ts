// Two maps of the board side by side, measured and predicted |Z| to ground at one frequency, on one
// shared log colour scale, so a node that reads off shows as a different colour in the same place.
import type { Board } from '../board/types.js';
import { html, type Markup } from './escape-html.js';
import { LogColourScale } from './colour-scale.js';
import { magnitude, predictedMagnitude, usable, type NodeSnapshot } from './report-data.js';
import { ohms } from './report-format.js';
import { boardMap, type NodeShade } from './svg-board-map.js';
import { colourBar, keyMarkup } from './svg-legend.js';

export function boardMapsFigure(board: Board, snapshot: NodeSnapshot): Markup {
  const measured = new Map<string, NodeShade>();
  const predicted = new Map<string, NodeShade>();
  for (const node of board.nodes) {
    const r = snapshot.byNode.get(node.name);
    if (!r) continue;
    const ok = usable(r);
    const z = magnitude(r);
    const zp = predictedMagnitude(r);
    measured.set(node.name, {
      value: ok ? z : undefined,
      flag: r.flag,
      title: ok ? `${node.name}: measured |Z| ${ohms(z)} (${r.flag}; predicted ${ohms(zp)})` : `${node.name}: invalid reading`,
    });
    predicted.set(node.name, { value: zp, title: `${node.name}: predicted |Z| ${ohms(zp)}` });
  }
  const scale = LogColourScale.spanning([...measured.values(), ...predicted.values()].map((s) => s.value ?? Number.NaN));
  if (!scale) return html`<p class="absent">Board map: not measured (no node-to-ground reading with a value at this frequency).</p>`;
  const width = 520;
  return html`<div class="maps">
<figure class="map-figure"><figcaption>Measured |Z| to ground</figcaption>${boardMap({ board, shades: measured, scale, label: 'board map of measured |Z|', className: 'map-measured', width })}</figure>
<figure class="map-figure"><figcaption>Predicted |Z| to ground</figcaption>${boardMap({ board, shades: predicted, scale, label: 'board map of predicted |Z|', className: 'map-predicted', width })}</figure>
</div>
<div class="map-key">${colourBar(scale, 'colour scale of |Z| shared by both maps', (v) => ohms(v, 3))}${keyMarkup([
    { swatch: 'marker', shape: 'triangle', className: 'flag-deviation', label: 'deviation' },
    { swatch: 'marker', shape: 'cross', className: 'flag-invalid', label: 'invalid reading' },
    { swatch: 'marker', shape: 'circle', className: 'key-no-value', label: 'no value' },
    { swatch: 'line', className: 'key-part', label: 'part between nodes (thicker: larger value)' },
    { swatch: 'line', className: 'key-ground', label: 'part to ground' },
  ])}</div>`;
}
