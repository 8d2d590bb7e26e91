// The top of the report: which board, how the scan ended, when, with what, and how many readings of each
// flag. Every value here comes from a file and is escaped by the html tag.
import { html, type Markup } from './escape-html.js';
import type { ReportInput } from './report-input.js';
import type { ReadingFlag } from '../analysis/readings.js';
import { markerMarkup } from './svg-markers.js';

const STATUS_CLASS: Record<string, string> = { complete: 'status-good', interrupted: 'status-warn', running: 'status-warn', failed: 'status-bad' };

export function boardTitle(input: ReportInput): string {
  return input.meta.board ?? input.board.name;
}

export function headerSection(input: ReportInput, counts: Record<ReadingFlag, number>): Markup {
  const { meta, board } = input;
  const status = meta.status ?? 'unknown';
  const rows: [string, Markup | string][] = [];
  rows.push(['board file', board.file]);
  if (meta.started) rows.push(['started', meta.started]);
  if (meta.started) rows.push(['ended', meta.ended ?? 'not ended (the log was not closed)']);
  for (const inst of meta.instruments ?? []) {
    const where = [inst.profile, inst.address].filter((s): s is string => !!s).join(' at ');
    rows.push([inst.role, html`${inst.identity ?? 'no identity answer'}${where ? html` <span class="muted">(${where})</span>` : ''}`]);
  }
  if (meta.simulated) rows.push(['bench', html`simulated${meta.simulated.faults.length > 0 ? html`, faults ${meta.simulated.faults.join(', ')}` : ', no faults'}${meta.simulated.seed !== undefined ? html`, seed ${meta.simulated.seed}` : ''}`]);
  if (meta.plan?.file || meta.plan?.sha256) rows.push(['plan', html`${meta.plan.file ?? ''}${meta.plan.sha256 ? html` <code class="hash">sha256 ${meta.plan.sha256}</code>` : ''}`]);
  if (meta.log) rows.push(['log', meta.log]);
  if (meta.software) rows.push(['software', `${meta.software.name} ${meta.software.version}`]);
  const total = counts.ok + counts.deviation + counts.invalid;
  return html`<header class="report-header">
<h1><span class="muted">Scan report</span> ${boardTitle(input)}</h1>
<p class="status ${STATUS_CLASS[status] ?? 'status-warn'}">status: <strong>${status}</strong></p>
<ul class="counts" aria-label="readings by flag">
<li class="count-total"><strong>${total}</strong> readings</li>
<li class="count-ok">${markerSwatch('circle', 'measured')}<strong>${counts.ok}</strong> ok</li>
<li class="count-deviation">${markerSwatch('triangle', 'measured deviation')}<strong>${counts.deviation}</strong> deviation</li>
<li class="count-invalid">${markerSwatch('cross', 'invalid')}<strong>${counts.invalid}</strong> invalid</li>
</ul>
<dl class="facts">${rows.map(([k, v]) => html`<dt>${k}</dt><dd>${v}</dd>`)}</dl>
</header>`;
}

export function markerSwatch(shape: 'circle' | 'triangle' | 'cross', className: string): Markup {
  return html`<svg class="swatch" viewBox="0 0 14 14" width="14" height="14" aria-hidden="true">${markerMarkup(shape, 7, 7.5, 4, className, className)}</svg>`;
}
