// The report's one style sheet, inlined into the page. A calm palette on a warm off-white page that
// prints cleanly: measured readings in orange and predictions in blue (a pair that stays apart for the
// common colour-vision deficiencies), deviations in brick red and always with their own shape too.
import { trusted, type Markup } from './escape-html.js';

const CSS = `
:root { --ink: #1f2a33; --muted: #5d6770; --paper: #fbfaf6; --card: #ffffff; --rule: #d9dcd6;
  --measured: #d7832e; --measured-edge: #7a4614; --deviation: #b8372f; --deviation-edge: #5a1510;
  --predicted: #2f5d8a; --mode: #6d4f9c; --band: #86a0bf; }
* { box-sizing: border-box; }
body { margin: 0; background: var(--paper); color: var(--ink);
  font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Helvetica Neue", Arial, sans-serif; }
main { max-width: 1120px; margin: 0 auto; padding: 24px 28px 48px; }
h1 { font-size: 24px; margin: 0 0 6px; font-weight: 600; word-break: break-word; }
h2 { font-size: 18px; margin: 0 0 10px; font-weight: 600; border-bottom: 1px solid var(--rule); padding-bottom: 4px; }
h3 { font-size: 15px; margin: 18px 0 6px; font-weight: 600; }
section, .report-header { background: var(--card); border: 1px solid var(--rule); border-radius: 6px; padding: 16px 20px; margin: 0 0 18px; }
.muted { color: var(--muted); }
.absent { color: var(--muted); font-style: italic; }
.warn { color: var(--deviation); }
code.hash { font-size: 12px; word-break: break-all; color: var(--muted); }
.status { margin: 0 0 10px; }
.status strong { padding: 1px 8px; border-radius: 10px; border: 1px solid currentColor; }
.status-good strong { color: #2d6a4f; } .status-warn strong { color: #8a5a00; } .status-bad strong { color: var(--deviation); }
ul.counts { list-style: none; display: flex; flex-wrap: wrap; gap: 18px; padding: 0; margin: 0 0 12px; }
ul.counts li { display: flex; align-items: center; gap: 5px; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 2px 14px; margin: 0; }
dl.facts dt { color: var(--muted); } dl.facts dd { margin: 0; word-break: break-word; }
figure { margin: 8px 0 14px; }
figcaption { font-size: 13px; color: var(--muted); margin: 2px 0 4px; }
svg { max-width: 100%; height: auto; }
.maps { display: flex; flex-wrap: wrap; gap: 16px; }
.map-figure { flex: 1 1 480px; margin: 0; }
.map-key { display: flex; flex-wrap: wrap; align-items: center; gap: 8px 24px; }
.pair { display: flex; flex-wrap: wrap; gap: 8px; }
.pair svg { flex: 1 1 460px; }
ul.key { list-style: none; display: flex; flex-wrap: wrap; gap: 4px 16px; padding: 0; margin: 4px 0 0; font-size: 12px; color: var(--muted); }
ul.key li { display: flex; align-items: center; gap: 4px; }
.table-wrap { overflow-x: auto; }
table { border-collapse: collapse; width: 100%; font-size: 13px; }
th, td { text-align: left; padding: 4px 8px; border-bottom: 1px solid #eceae4; vertical-align: top; }
th { font-weight: 600; color: var(--muted); border-bottom-color: var(--rule); }
td.num { font-variant-numeric: tabular-nums; white-space: nowrap; }
td.flag, td.terminals { white-space: nowrap; }
tr.notable td { background: #fbf1e6; }
.share { white-space: nowrap; display: inline-flex; align-items: center; gap: 6px; }
.share-track { fill: #eceae4; } .share-fill { fill: var(--predicted); }
.verdict strong { padding: 1px 8px; border-radius: 10px; background: #eef2f7; }
/* plots */
.plot-area { fill: #fff; stroke: #c4c8cc; }
.grid { stroke: #eef0f2; }
.tick { font-size: 11px; fill: #4c555d; }
.tick.x { text-anchor: middle; } .tick.y { text-anchor: end; } .tick.x.slanted { text-anchor: end; }
.axis-title { font-size: 12px; fill: #333d46; text-anchor: middle; }
.band { fill: var(--band); fill-opacity: 0.28; stroke: none; }
.predicted { fill: none; stroke: var(--predicted); stroke-width: 1.8; }
.mode-line { fill: none; stroke: var(--mode); stroke-width: 1.4; stroke-dasharray: 5 3; }
.measured { fill: var(--measured); stroke: var(--measured-edge); stroke-width: 0.8; }
.measured.deviation { fill: var(--deviation); stroke: var(--deviation-edge); }
.invalid { fill: none; stroke: #222; stroke-width: 1.6; }
.guide { stroke: var(--mode); stroke-dasharray: 2 3; }
.guide-label { font-size: 10px; fill: var(--mode); }
.zero { stroke: #8d949a; stroke-width: 1; }
/* board maps */
.board-map { background: #fff; border: 1px solid #e3e5e1; }
.part { stroke: #5e6873; stroke-linecap: round; }
.part.part-L { stroke-dasharray: 4 2; } .part.part-R { stroke-dasharray: 1 2; }
.part.wraps { stroke-opacity: 0.35; stroke-dasharray: 3 4; }
.ground line { stroke: #98a0a7; stroke-width: 1; } .ground .ground-bar { stroke-width: 1.6; }
.node { stroke: #1f2a33; stroke-width: 0.9; }
.node.no-value, .key-no-value { fill: #fff; stroke: #1f2a33; stroke-width: 0.9; stroke-dasharray: 2 1.5; }
.flag-deviation { fill: var(--deviation); stroke: #fff; stroke-width: 0.6; }
.flag-invalid { stroke: #222; stroke-width: 1.6; fill: none; }
.node-label { font-size: 9px; fill: #4c555d; text-anchor: middle; }
.colour-bar .bar-frame { fill: none; stroke: #8d949a; }
.colour-bar .tick-mark { stroke: #4c555d; }
.key-part { stroke: #5e6873; stroke-width: 2.5; } .key-ground { stroke: #98a0a7; stroke-width: 1.2; }
.swatch { flex: none; }
@media print {
  body { background: #fff; font-size: 11pt; }
  main { max-width: none; padding: 0; }
  section, .report-header { border: none; padding: 0; margin: 0 0 14pt; break-inside: auto; }
  figure, tr { break-inside: avoid; }
  .table-wrap { overflow: visible; }
}
`;

export function styleSheet(): Markup {
  return trusted(CSS);
}
