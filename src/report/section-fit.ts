// The fit: each parameter's fitted value with its standard uncertainty beside the nominal, and per kind
// of part the measured spread against the stated tolerance.
import { html, type Markup } from './escape-html.js';
import type { ReportFit, ReportFitParameter, ReportFitSpread } from './report-input.js';
import { percent, quantity } from './report-format.js';

const KIND_WORDS = { C: 'capacitors', L: 'inductors', R: 'resistors' } as const;

export function fitSection(fit: ReportFit | undefined): Markup {
  if (!fit) return html`<section class="fit"><h2>Fit</h2><p class="absent">No fit given.</p></section>`;
  const params =
    fit.parameters.length === 0
      ? html`<p class="muted">No parameters fitted.</p>`
      : html`<div class="table-wrap"><table class="parameters">
<thead><tr><th>parameter</th><th>nominal</th><th>fitted ± standard uncertainty</th><th>relative uncertainty</th><th>off nominal</th></tr></thead>
<tbody>${fit.parameters.map(parameterRow)}</tbody></table></div>`;
  const spread =
    fit.spread && fit.spread.length > 0
      ? html`<h3>Spread against tolerance</h3><div class="table-wrap"><table class="spread">
<thead><tr><th>parts</th><th>counted</th><th>mean off nominal</th><th>spread of the parts</th><th>stated tolerance</th><th>spread / tolerance</th><th>within tolerance</th></tr></thead>
<tbody>${fit.spread.map(spreadRow)}</tbody></table></div>
<p class="muted">Parts spread evenly over ±t have a standard deviation of t/√3, so a spread / tolerance near 0.58 or below is what a series that keeps its tolerance shows (common practice).</p>`
      : '';
  const state = fit.converged === false ? html`<p class="warn">The fit did not converge; the values are a guide only.</p>` : '';
  return html`<section class="fit"><h2>Fit</h2>${fit.message ? html`<p>${fit.message}</p>` : ''}${state}${params}${spread}</section>`;
}

function parameterRow(p: ReportFitParameter): Markup {
  const fixed = p.identifiable !== false && Number.isFinite(p.sigma);
  const relative = fixed && p.value !== 0 ? Math.abs(p.sigma / p.value) : Number.NaN;
  const off = p.nominal !== 0 ? p.value / p.nominal - 1 : Number.NaN;
  // Off nominal by more than two standard uncertainties: worth a look (a coverage factor of 2, common practice).
  const notable = fixed && Math.abs(p.value - p.nominal) > 2 * p.sigma;
  return html`<tr${notable ? html` class="notable"` : ''}><td>${p.label}${p.ref && !p.label.includes(p.ref) ? html` <span class="muted">${p.ref}</span>` : ''}</td>
<td class="num">${quantity(p.nominal, p.unit)}</td>
<td class="num">${quantity(p.value, p.unit)} ± ${fixed ? quantity(p.sigma, p.unit, 2) : 'not fixed by the readings'}</td>
<td class="num">${fixed ? percent(relative, 2) : '—'}</td><td class="num">${Number.isFinite(off) ? `${off >= 0 ? '+' : ''}${percent(off, 2)}` : '—'}</td></tr>`;
}

function spreadRow(s: ReportFitSpread): Markup {
  return html`<tr><td>${KIND_WORDS[s.kind]}</td><td class="num">${s.counted}</td><td class="num">${percent(s.meanDeviation, 2)}</td><td class="num">${percent(s.partSpread, 2)}</td>
<td class="num">${s.tolerance !== undefined ? `±${percent(s.tolerance, 0)}` : 'not stated'}</td><td class="num">${s.spreadToTolerance !== undefined && Number.isFinite(s.spreadToTolerance) ? s.spreadToTolerance.toFixed(2) : '—'}</td>
<td class="num">${s.tolerance !== undefined ? `${s.withinTolerance} of ${s.counted}` : '—'}</td></tr>`;
}
