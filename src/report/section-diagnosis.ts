// The diagnosis: its verdict and message, then the leading candidates with the change fitted to each,
// the nearest preferred (E-series) value, and the share of the deviation each explains, drawn as a bar.
import { html, type Markup } from './escape-html.js';
import type { Candidate, Diagnosis, PartCandidate, PartPair } from '../analysis/diagnose-types.js';
import { UNIT_OF_KIND } from '../board/part-values.js';
import { describeDecades } from '../analysis/e-series.js';
import { percent, quantity } from './report-format.js';

const VERDICT_WORDS: Record<Diagnosis['verdict'], string> = {
  'as-designed': 'as designed',
  'single-part': 'one part',
  fixture: 'test fixture',
  'several-faults': 'several faults',
  unexplained: 'unexplained',
};

export function diagnosisSection(diagnosis: Diagnosis | undefined): Markup {
  if (!diagnosis) return html`<section class="diagnosis"><h2>Diagnosis</h2><p class="absent">No diagnosis given.</p></section>`;
  const d = diagnosis;
  const table =
    d.candidates.length === 0
      ? html`<p class="muted">No candidates.</p>`
      : html`<div class="table-wrap"><table class="candidates">
<thead><tr><th>#</th><th>where</th><th>change fitted</th><th>nearest preferred value</th><th>share of the deviation</th><th>misfit</th></tr></thead>
<tbody>${d.candidates.map((c, i) => candidateRow(c, i + 1))}</tbody></table></div>`;
  return html`<section class="diagnosis"><h2>Diagnosis</h2>
<p class="verdict verdict-${d.verdict}">verdict: <strong>${VERDICT_WORDS[d.verdict]}</strong></p>
<p>${d.message}</p>
<p class="muted">${d.readings.used} readings used, ${d.readings.skipped} skipped as invalid; assumed noise ${percent(d.noise, 2)} per reading; mean misfit of the board as designed ${d.nominalMisfit.toPrecision(3)} (noise alone gives about 2).</p>
${table}${d.pair ? pairBlock(d.pair) : ''}${d.notes.length > 0 ? html`<ul class="notes">${d.notes.map((n) => html`<li>${n}</li>`)}</ul>` : ''}
</section>`;
}

function candidateRow(c: Candidate, rank: number): Markup {
  return html`<tr><td class="num">${rank}</td><td>${where(c)}</td><td>${change(c)}</td><td>${nearest(c)}</td><td>${shareBar(c.share)}</td><td class="num">${c.misfit.toPrecision(3)}</td></tr>`;
}

function where(c: Candidate): Markup {
  if (c.subject === 'fixture') return html`${c.ref}<br><span class="muted">${c.readings} readings through it</span>`;
  return html`<strong>${c.ref}</strong> <span class="muted">(${c.kind}, ${c.nodes[0]}–${c.nodes[1]})</span>`;
}

function change(c: Candidate): Markup {
  if (c.subject === 'fixture') {
    return c.change.kind === 'series-resistance'
      ? html`${quantity(c.change.ohms, 'ohm', 3)} in series`
      : html`contact open, ${quantity(c.change.farads, 'F', 2)} across the gap`;
  }
  const unit = UNIT_OF_KIND[c.kind];
  switch (c.change.kind) {
    case 'value': {
      const off = c.change.decades !== 0 ? describeDecades(c.change.decades) : `×${c.change.scale.toPrecision(3)}`;
      return html`${quantity(c.change.value, unit, 3)} where ${quantity(c.nominal, unit, 3)} placed <span class="muted">(${off})</span>`;
    }
    case 'open':
      return html`open (missing or not soldered)`;
    case 'short':
      return html`shorted, ${quantity(c.change.ohms, 'ohm', 2)} across`;
  }
}

function nearest(c: Candidate): Markup | string {
  if (c.subject !== 'part' || c.change.kind !== 'value') return '—';
  return html`${c.change.nearest.series} ${quantity(c.change.nearest.value, UNIT_OF_KIND[c.kind], 3)}`;
}

/** The share as a bar and a number (the number carries it in print and for screen readers). */
function shareBar(share: number): Markup {
  const w = Math.min(Math.max(share, 0), 1) * 100;
  return html`<span class="share"><svg class="share-bar" viewBox="0 0 100 10" width="100" height="10" aria-hidden="true"><rect class="share-track" x="0" y="0" width="100" height="10"/><rect class="share-fill" x="0" y="0" width="${w.toFixed(1)}" height="10"/></svg> ${percent(share)}</span>`;
}

function pairBlock(pair: PartPair): Markup {
  const one = (c: PartCandidate) => html`<strong>${c.ref}</strong> ${change(c)}`;
  return html`<p class="pair-result">Two parts together: ${one(pair.first)}, then ${one(pair.second)}; they explain ${percent(pair.share)} (misfit ${pair.misfit.toPrecision(3)}).</p>`;
}
