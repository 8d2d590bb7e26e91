// |Z| to ground of every node at one frequency, nodes in board order: measured points against the
// predicted line, each reading's band shaded behind it. Log scale: a mode's edge nodes stand decades
// above the bulk.
import type { Board } from '../board/types.js';
import type { Reading } from '../analysis/readings.js';
import { html, type Markup } from './escape-html.js';
import { bandKey, magnitude, predictedMagnitude, usable, type NodeSnapshot } from './report-data.js';
import type { ReportBand } from './report-input.js';
import { ohms } from './report-format.js';
import { paddedDomain } from './svg-axes.js';
import { keyMarkup } from './svg-legend.js';
import { linePlot, type PlotBand, type PlotMarker } from './svg-line-plot.js';
import { nodeAxis } from './node-axis.js';

export function profileFigure(board: Board, snapshot: NodeSnapshot, bands: ReadonlyMap<string, ReportBand>): Markup {
  const names = board.nodes.map((n) => n.name);
  const read: { i: number; r: Reading }[] = names.flatMap((name, i) => {
    const r = snapshot.byNode.get(name);
    return r ? [{ i, r }] : [];
  });
  const plotBands: PlotBand[] = [];
  const values: number[] = [];
  for (const { i, r } of read) {
    values.push(predictedMagnitude(r));
    if (usable(r)) values.push(magnitude(r));
    const band = bands.get(bandKey(r.step, r.point));
    if (band) {
      plotBands.push({ x0: i - 0.32, x1: i + 0.32, y0: band.mag_lo_ohm, y1: band.mag_hi_ohm });
      values.push(band.mag_lo_ohm, band.mag_hi_ohm);
    }
  }
  const domain = paddedDomain(values, { positive: true });
  if (!domain) return html`<p class="absent">Profile: not measured.</p>`;
  const markers: PlotMarker[] = read.map(({ i, r }) => {
    const name = names[i];
    if (!usable(r)) return { x: i, y: domain[0], shape: 'cross', className: 'invalid', title: `${name}: invalid reading`, attrs: { 'data-node': name } };
    const deviation = r.flag === 'deviation';
    return {
      x: i,
      y: magnitude(r),
      shape: deviation ? 'triangle' : 'circle',
      className: deviation ? 'measured deviation' : 'measured',
      title: `${name}: measured ${ohms(magnitude(r))}, predicted ${ohms(predictedMagnitude(r))}${deviation ? ' (deviation)' : ''}`,
      attrs: { 'data-node': name },
    };
  });
  const plot = linePlot({
    label: `|Z| to ground per node at ${snapshot.frequency_hz} Hz`,
    className: 'profile-plot',
    width: 1040,
    height: 300,
    x: nodeAxis(names),
    y: { kind: 'log', domain, label: '|Z| to ground', format: (v) => ohms(v, 3) },
    bands: plotBands,
    lines: [{ className: 'predicted', points: read.map(({ i, r }) => [i, predictedMagnitude(r)] as const) }],
    markers,
  });
  return html`<figure class="wide">${plot}${keyMarkup([
    { swatch: 'marker', shape: 'circle', className: 'measured', label: 'measured, within band' },
    { swatch: 'marker', shape: 'triangle', className: 'measured deviation', label: 'measured, deviation' },
    { swatch: 'marker', shape: 'cross', className: 'invalid', label: 'invalid reading (at the axis)' },
    { swatch: 'line', className: 'predicted', label: 'predicted' },
    ...(plotBands.length > 0 ? [{ swatch: 'band' as const, label: 'band the reading was judged by' }] : []),
  ])}</figure>`;
}
