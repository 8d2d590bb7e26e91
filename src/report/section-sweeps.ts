// |Z| and phase against frequency for every terminal pair read at several frequencies: measured points,
// the predicted line, and each reading's band as a step around its frequency. Mode frequencies are
// drawn as guides.
import { html, type Markup } from './escape-html.js';
import type { ReportBand, ReportMode } from './report-input.js';
import { bandKey, magnitude, phaseDeg, phaseIntervals, predictedMagnitude, predictedPhaseDeg, usable, type Sweep } from './report-data.js';
import { degrees, hertz, ohms, terminals } from './report-format.js';
import { linearTicks, paddedDomain } from './svg-axes.js';
import { linePlot, type AxisSpec, type PlotBand, type PlotGuide, type PlotMarker } from './svg-line-plot.js';

/** Frequencies spanning more than this ratio get a log axis. */
const LOG_AXIS_RATIO = 3;

export function sweepFigure(sweep: Sweep, bands: ReadonlyMap<string, ReportBand>, modes: readonly ReportMode[]): Markup {
  const rs = sweep.readings;
  const fs = rs.map((r) => r.frequency_hz);
  const fLo = fs[0];
  const fHi = fs[fs.length - 1];
  const logX = fHi / fLo > LOG_AXIS_RATIO;
  const xDomain: [number, number] = logX ? [fLo / 1.03, fHi * 1.03] : [fLo - (fHi - fLo) * 0.02, fHi + (fHi - fLo) * 0.02];
  const x: AxisSpec = { kind: logX ? 'log' : 'linear', domain: xDomain, label: 'frequency', format: (v) => hertz(v, 4) };
  const guides: PlotGuide[] = modes.map((m, i) => ({ x: m.frequency_hz, label: `mode ${i + 1}` }));
  const name = terminals(sweep);

  // Each reading's band covers the frequencies closer to it than to its neighbours.
  const edges = fs.map((f, i) => [i === 0 ? xDomain[0] : (fs[i - 1] + f) / 2, i === fs.length - 1 ? xDomain[1] : (f + fs[i + 1]) / 2] as const);
  const magBands: PlotBand[] = [];
  const phaseBands: PlotBand[] = [];
  const magValues: number[] = [];
  const phaseValues: number[] = [];
  rs.forEach((r, i) => {
    magValues.push(predictedMagnitude(r));
    phaseValues.push(predictedPhaseDeg(r));
    if (usable(r)) {
      magValues.push(magnitude(r));
      phaseValues.push(phaseDeg(r));
    }
    const band = bands.get(bandKey(r.step, r.point));
    if (!band) return;
    const [x0, x1] = edges[i];
    magBands.push({ x0, x1, y0: band.mag_lo_ohm, y1: band.mag_hi_ohm });
    magValues.push(band.mag_lo_ohm, band.mag_hi_ohm);
    for (const [lo, hi] of phaseIntervals(band)) {
      phaseBands.push({ x0, x1, y0: lo, y1: hi });
      phaseValues.push(lo, hi);
    }
  });
  const magDomain = paddedDomain(magValues, { positive: true });
  if (!magDomain) return html`<p class="absent">${name}: not measured.</p>`;
  const pd = paddedDomain(phaseValues) ?? [-180, 180];
  const phaseDomain: [number, number] = [Math.max(pd[0], -180), Math.min(pd[1], 180)];
  const span = phaseDomain[1] - phaseDomain[0];
  const phaseTicks = span > 120 ? [-180, -90, 0, 90, 180].filter((t) => t >= phaseDomain[0] && t <= phaseDomain[1]) : linearTicks(phaseDomain[0], phaseDomain[1], 4);

  const markersOf = (value: (r: (typeof rs)[number]) => number, what: (v: number) => string): PlotMarker[] =>
    rs.filter(usable).map((r) => {
      const deviation = r.flag === 'deviation';
      return {
        x: r.frequency_hz,
        y: value(r),
        shape: deviation ? 'triangle' : 'circle',
        className: deviation ? 'measured deviation' : 'measured',
        title: `${hertz(r.frequency_hz)}: ${what(value(r))}${deviation ? ' (deviation)' : ''}`,
      };
    });
  const invalid = rs.filter((r) => !usable(r)).map((r): PlotMarker => ({ x: r.frequency_hz, y: magDomain[0], shape: 'cross', className: 'invalid', title: `${hertz(r.frequency_hz)}: invalid reading` }));

  const magnitudePlot = linePlot({
    label: `|Z| against frequency, ${name}`,
    className: 'sweep-magnitude',
    x,
    y: { kind: 'log', domain: magDomain, label: '|Z|', format: (v) => ohms(v, 3) },
    bands: magBands,
    guides,
    lines: [{ className: 'predicted', points: rs.map((r) => [r.frequency_hz, predictedMagnitude(r)] as const) }],
    markers: [...markersOf(magnitude, (v) => ohms(v)), ...invalid],
    markerSize: 3,
  });
  const phasePlot = linePlot({
    label: `phase against frequency, ${name}`,
    className: 'sweep-phase',
    x,
    y: { kind: 'linear', domain: phaseDomain, label: 'phase (°)', format: (v) => `${v}°`, ticks: phaseTicks },
    bands: phaseBands,
    guides,
    zero: true,
    lines: [{ className: 'predicted', points: unwrapBreaks(rs.map((r) => [r.frequency_hz, predictedPhaseDeg(r)] as const)) }],
    markers: markersOf(phaseDeg, degrees),
    markerSize: 3,
  });
  return html`<figure class="sweep"><figcaption>${name}</figcaption><div class="pair">${magnitudePlot}${phasePlot}</div></figure>`;
}

/** A predicted phase that wraps past ±180° between two points is not joined across the plot. */
function unwrapBreaks(points: (readonly [number, number])[]): (readonly [number, number])[] {
  const out: (readonly [number, number])[] = [];
  points.forEach((p, i) => {
    if (i > 0 && Math.abs(p[1] - points[i - 1][1]) > 180) out.push([Number.NaN, Number.NaN]);
    out.push(p);
  });
  return out;
}
