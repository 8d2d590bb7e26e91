// Every reading flagged deviation or invalid, in the order of the plan, with what was measured, what was
// predicted and the band it was judged by.
import { html, type Markup } from './escape-html.js';
import type { Reading } from '../analysis/readings.js';
import type { ReportBand } from './report-input.js';
import { bandKey, magnitude, phaseDeg, predictedMagnitude, predictedPhaseDeg, usable } from './report-data.js';
import { degrees, hertz, ohms, terminals } from './report-format.js';
import { markerSwatch } from './section-header.js';

/** Beyond this many rows the table says how many more there are (the log holds them all). */
export const MOST_ROWS = 500;

export function deviationsSection(readings: readonly Reading[], bands: ReadonlyMap<string, ReportBand>): Markup {
  const flagged = readings.filter((r) => r.flag !== 'ok').sort((a, b) => a.step - b.step || a.point - b.point);
  if (readings.length === 0) return html`<section class="deviations"><h2>Deviations</h2><p class="absent">Not measured.</p></section>`;
  if (flagged.length === 0) return html`<section class="deviations"><h2>Deviations</h2><p>None: every reading lies within its band.</p></section>`;
  const shown = flagged.slice(0, MOST_ROWS);
  const rows = shown.map((r) => {
    const band = bands.get(bandKey(r.step, r.point));
    const ok = usable(r);
    const ratio = ok ? magnitude(r) / predictedMagnitude(r) : Number.NaN;
    return html`<tr class="flag-${r.flag}">
<td class="flag">${markerSwatch(r.flag === 'deviation' ? 'triangle' : 'cross', r.flag === 'deviation' ? 'measured deviation' : 'invalid')} ${r.flag}</td>
<td class="num">${r.step}</td><td class="num">${r.point}</td><td class="terminals">${terminals(r)}</td><td class="num">${hertz(r.frequency_hz)}</td>
<td class="num">${ok ? ohms(magnitude(r)) : 'no value'}</td><td class="num">${ok ? degrees(phaseDeg(r)) : ''}</td>
<td class="num">${ohms(predictedMagnitude(r))}</td><td class="num">${degrees(predictedPhaseDeg(r))}</td>
<td class="num">${Number.isFinite(ratio) ? ratio.toPrecision(3) : '—'}</td>
<td class="num">${band ? `${ohms(band.mag_lo_ohm, 3)} … ${ohms(band.mag_hi_ohm, 3)}; ${degrees(band.phase_lo_deg)} … ${degrees(band.phase_hi_deg)}` : '—'}</td>
</tr>`;
  });
  const more = flagged.length > shown.length ? html`<p class="muted">…and ${flagged.length - shown.length} more in the log.</p>` : '';
  return html`<section class="deviations"><h2>Deviations</h2>
<p>${flagged.length} of ${readings.length} readings are flagged.</p>
<div class="table-wrap"><table>
<thead><tr><th>flag</th><th>step</th><th>point</th><th>terminals</th><th>frequency</th><th>measured |Z|</th><th>phase</th><th>predicted |Z|</th><th>phase</th><th>|Z| ratio</th><th>band (|Z|; phase)</th></tr></thead>
<tbody>${rows}</tbody></table></div>${more}</section>`;
}
