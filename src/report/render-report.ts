// One self-contained HTML page from the data of a scan: inline CSS and inline SVG only, no script and
// nothing fetched (the page's own policy forbids both). Sections, in order: header; board maps,
// profile, sweeps and transfer-mapped profile (per mode of interest); deviations; diagnosis; fit.
// Sections without data say "not measured" (or "not given") rather than vanish without a word.
import { html, trusted, type Markup } from './escape-html.js';
import type { ReportInput, ReportMode } from './report-input.js';
import { checkReportInput } from './check-report-input.js';
import { flagCounts, indexBands, sweeps, toGroundNear, transferProfiles, type NodeSnapshot } from './report-data.js';
import { hertz, percent } from './report-format.js';
import { styleSheet } from './report-style.js';
import { boardTitle, headerSection } from './section-header.js';
import { boardMapsFigure } from './section-board-maps.js';
import { profileFigure } from './section-profile.js';
import { sweepFigure } from './section-sweeps.js';
import { transferFigure } from './section-transfer.js';
import { deviationsSection } from './section-deviations.js';
import { diagnosisSection } from './section-diagnosis.js';
import { fitSection } from './section-fit.js';
import { boardMap } from './svg-board-map.js';

/** What the per-frequency sections look at: a mode of interest, or (none given) the most-read frequency. */
interface Focus {
  title: string;
  frequency_hz: number;
  mode?: ReportMode;
  snapshot?: NodeSnapshot;
}

/** Forbids scripts, fetches and frames: the page needs none, and an injected one must not run. */
const POLICY = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'";

export function renderReport(input: ReportInput): string {
  checkReportInput(input);
  const bands = indexBands(input.bands);
  const counts = flagCounts(input.readings);
  const focus = focusPoints(input);
  const swept = sweeps(input.readings);
  const modes = input.modes ?? [];
  const page = html`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${trusted(POLICY)}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Scan report: ${boardTitle(input)}</title>
<style>${styleSheet()}</style>
</head>
<body>
<main>
${headerSection(input, counts)}
${modesSummary(focus)}
<section class="board-maps"><h2>Board maps</h2>
${focus.length === 0 ? html`${plainMap(input)}<p class="absent">Not measured: no node-to-ground readings.</p>` : focus.map((p) => html`<h3>${p.title}</h3>${p.snapshot ? boardMapsFigure(input.board, p.snapshot) : html`${plainMap(input)}<p class="absent">Not measured at this frequency.</p>`}`)}
</section>
<section class="profile"><h2>Profile</h2>
${focus.length === 0 ? html`<p class="absent">Not measured.</p>` : focus.map((p) => html`<h3>${p.title}</h3>${p.snapshot ? profileFigure(input.board, p.snapshot, bands) : html`<p class="absent">Not measured.</p>`}`)}
</section>
<section class="sweeps"><h2>Sweeps</h2>
${swept.length === 0 ? html`<p class="absent">Not measured: no terminals were read at three or more frequencies.</p>` : swept.map((s) => sweepFigure(s, bands, modes))}
</section>
<section class="transfer"><h2>Transfer-mapped profile</h2>
${transferBlocks(input, focus)}
</section>
${deviationsSection(input.readings, bands)}
${diagnosisSection(input.diagnosis)}
${fitSection(input.fit)}
<footer class="muted">${input.meta.software ? `${input.meta.software.name} ${input.meta.software.version}` : ''}</footer>
</main>
</body>
</html>
`;
  return page.text;
}

function focusPoints(input: ReportInput): Focus[] {
  const modes = input.modes ?? [];
  if (modes.length > 0) {
    return modes.map((mode, i) => ({
      title: `Mode ${i + 1} at ${hertz(mode.frequency_hz)}`,
      frequency_hz: mode.frequency_hz,
      mode,
      snapshot: toGroundNear(input.readings, mode.frequency_hz),
    }));
  }
  // No mode given: the frequency at which the most nodes were read to ground.
  const nodesAt = new Map<number, Set<string>>();
  for (const r of input.readings) {
    if (r.kind !== 'to-ground') continue;
    const set = nodesAt.get(r.frequency_hz) ?? new Set<string>();
    set.add(r.hi);
    nodesAt.set(r.frequency_hz, set);
  }
  let best: number | undefined;
  for (const [f, set] of nodesAt) if (best === undefined || set.size > nodesAt.get(best)!.size) best = f;
  if (best === undefined) return [];
  return [{ title: `Readings at ${hertz(best)}`, frequency_hz: best, snapshot: toGroundNear(input.readings, best) }];
}

function modesSummary(focus: readonly Focus[]): Markup | string {
  const withModes = focus.filter((p) => p.mode);
  if (withModes.length === 0) return '';
  const rows = withModes.map((p, i) => {
    const used = p.snapshot?.frequency_hz;
    const off = used !== undefined ? used / p.frequency_hz - 1 : Number.NaN;
    const where = used === undefined ? 'not measured' : Math.abs(off) < 5e-4 ? hertz(used) : `${hertz(used)} (nearest logged, ${off >= 0 ? '+' : ''}${percent(off, 1)})`;
    return html`<tr><td class="num">${i + 1}</td><td class="num">${hertz(p.frequency_hz)}</td><td class="num">${p.mode!.localization.toPrecision(3)}</td><td>${where}</td></tr>`;
  });
  return html`<section class="modes"><h2>Modes of interest</h2><div class="table-wrap"><table>
<thead><tr><th>#</th><th>predicted frequency</th><th>localization (IPR)</th><th>readings shown at</th></tr></thead>
<tbody>${rows}</tbody></table></div></section>`;
}

function transferBlocks(input: ReportInput, focus: readonly Focus[]): Markup {
  const targets: Focus[] = focus.length > 0 ? [...focus] : [];
  if (targets.length === 0) {
    const first = input.readings.find((r) => r.kind === 'transfer');
    if (first) targets.push({ title: `Readings at ${hertz(first.frequency_hz)}`, frequency_hz: first.frequency_hz });
  }
  const blocks = targets.map((p) => {
    const profiles = transferProfiles(input.readings, p.frequency_hz);
    return html`<h3>${p.title}</h3>${profiles.length === 0 ? html`<p class="absent">Not measured: no transfer readings.</p>` : profiles.map((t) => transferFigure(input.board, t, p.mode))}`;
  });
  return blocks.length > 0 ? html`${blocks}` : html`<p class="absent">Not measured: no transfer readings.</p>`;
}

/** The board with no values, so a report without readings still shows what was to be measured. */
function plainMap(input: ReportInput): Markup {
  return boardMap({ board: input.board, shades: new Map(), scale: undefined, label: 'board map (no values)', className: 'map-plain' });
}
