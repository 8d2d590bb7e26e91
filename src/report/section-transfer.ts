// The mode shape read through transfer impedances: re of each transfer reading over the drive node's
// own, with its sign, against the predicted mode profile scaled the same way (φ_s / φ_d).
import type { Board } from '../board/types.js';
import { html, type Markup } from './escape-html.js';
import type { ReportMode } from './report-input.js';
import type { TransferProfile } from './report-data.js';
import { hertz, plain } from './report-format.js';
import { paddedDomain } from './svg-axes.js';
import { keyMarkup } from './svg-legend.js';
import { linePlot, type PlotLine, type PlotMarker } from './svg-line-plot.js';
import { nodeAxis } from './node-axis.js';

const SOURCE_WORDS = {
  transfer: 'its own transfer reading',
  'to-ground': 'its node-to-ground reading',
  largest: 'the largest reading (the drive node itself was not read)',
} as const;

export function transferFigure(board: Board, profile: TransferProfile, mode: ReportMode | undefined): Markup {
  const names = board.nodes.map((n) => n.name);
  const slot = new Map(names.map((n, i) => [n, i]));
  const points = profile.points.filter((p) => slot.has(p.node)).sort((a, b) => slot.get(a.node)! - slot.get(b.node)!);
  const modeLine = mode ? modeShapeRelativeTo(profile.drive, mode, names) : undefined;
  const values = [...points.flatMap((p) => [p.predicted, p.measured ?? Number.NaN]), ...(modeLine?.points.map((p) => p[1]) ?? []), 0];
  const domain = paddedDomain(values) ?? [-1, 1];
  const markers: PlotMarker[] = points.flatMap((p): PlotMarker[] => {
    if (p.measured === undefined) return [];
    const deviation = p.reading.flag === 'deviation';
    return [
      {
        x: slot.get(p.node)!,
        y: p.measured,
        shape: deviation ? 'triangle' : 'circle',
        className: deviation ? 'measured deviation' : 'measured',
        title: `${p.node}: ${plain(p.measured)} measured, ${plain(p.predicted)} predicted${deviation ? ' (deviation)' : ''}`,
        attrs: { 'data-node': p.node },
      },
    ];
  });
  const lines: PlotLine[] = [{ className: 'predicted', points: points.map((p) => [slot.get(p.node)!, p.predicted] as const) }];
  if (modeLine) lines.unshift({ className: 'mode-line', points: modeLine.points });
  const plot = linePlot({
    label: `transfer-mapped profile, drive ${profile.drive}`,
    className: 'transfer-plot',
    width: 1040,
    height: 280,
    x: nodeAxis(names, 'sensed node (board order)'),
    y: { kind: 'linear', domain, label: `re Z / re Z(${profile.drive})`, format: plain },
    lines,
    markers,
    guides: slot.has(profile.drive) ? [{ x: slot.get(profile.drive)!, label: `drive ${profile.drive}` }] : [],
    zero: true,
  });
  const note = modeLine?.note ? html` ${modeLine.note}` : '';
  return html`<figure class="wide">${plot}<figcaption>Current driven into ${profile.drive} at ${hertz(profile.frequency_hz)}; each sensed voltage's real part over that of ${SOURCE_WORDS[profile.source]}.${note}</figcaption>${keyMarkup([
    { swatch: 'marker', shape: 'circle', className: 'measured', label: 'measured, within band' },
    { swatch: 'marker', shape: 'triangle', className: 'measured deviation', label: 'measured, deviation' },
    { swatch: 'line', className: 'predicted', label: 'predicted transfer' },
    ...(modeLine ? [{ swatch: 'line' as const, className: 'mode-line', label: 'predicted mode profile φ / φ(drive)' }] : []),
  ])}</figure>`;
}

/** The mode profile over the board's nodes divided by its value at the drive node (or by its largest entry when the drive node is a node of the mode). */
function modeShapeRelativeTo(drive: string, mode: ReportMode, names: readonly string[]): { points: [number, number][]; note?: string } {
  const entries = names.map((n) => mode.profile[n] ?? Number.NaN);
  const largest = entries.reduce((m, v) => (Number.isFinite(v) && Math.abs(v) > Math.abs(m) ? v : m), 0);
  const atDrive = mode.profile[drive];
  // Driving a node the mode barely touches would blow up the ratio; scale to the largest entry instead.
  const usableDrive = atDrive !== undefined && Math.abs(atDrive) > 1e-3 * Math.abs(largest);
  const divisor = usableDrive ? atDrive : largest;
  if (divisor === 0) return { points: [] };
  return {
    points: entries.map((v, i) => [i, v / divisor]),
    note: usableDrive ? undefined : `The mode is nearly zero at ${drive}; its profile is shown relative to its largest entry.`,
  };
}
