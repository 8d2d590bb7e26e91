// The board drawn from its node coordinates: parts between nodes as lines (thicker for larger values of
// the same kind, so a dimerized coupling shows), parts to ground as short marks at their node, and one
// circle per node filled by its |Z| on the shared colour scale. Flags are drawn as extra shapes beside
// the node (triangle: deviation, cross: invalid), never only as a colour.
import { GROUND, type Board, type Part } from '../board/types.js';
import type { ReadingFlag } from '../analysis/readings.js';
import { html, type Markup } from './escape-html.js';
import type { LogColourScale } from './colour-scale.js';
import { markerMarkup } from './svg-markers.js';

export interface NodeShade {
  /** |Z| in ohms; absent when the node has no usable value. */
  value?: number;
  flag?: ReadingFlag;
  /** Tooltip text. */
  title: string;
}

export interface BoardMapSpec {
  board: Board;
  shades: ReadonlyMap<string, NodeShade>;
  scale: LogColourScale | undefined;
  label: string;
  className: string;
  width?: number;
  maxHeight?: number;
}

/** Board coordinates onto the page: x right, y up; z drawn oblique (half length at 30°, common practice for a cabinet view). */
export function projectPosition([x, y, z]: readonly [number, number, number]): [number, number] {
  return [x + 0.5 * z * Math.cos(Math.PI / 6), y + 0.5 * z * Math.sin(Math.PI / 6)];
}

export interface BoardLayout {
  /** Pixel centre of every node, SVG orientation (y down). */
  positions: Map<string, [number, number]>;
  width: number;
  height: number;
  /** Typical distance between neighbouring nodes, in pixels. */
  spacing: number;
}

/** Fits the projected board into `width` × at most `maxHeight` pixels with one scale for both axes. */
export function layoutBoard(board: Board, width: number, maxHeight: number): BoardLayout {
  let projected = board.nodes.map((n) => projectPosition(n.position));
  // Nodes that all sit on one point (plain data without coordinates) are drawn in a row, in board order.
  if (projected.length > 1 && projected.every((p) => p[0] === projected[0][0] && p[1] === projected[0][1])) projected = projected.map((_, i) => [i, 0]);
  const xs = projected.map((p) => p[0]);
  const ys = projected.map((p) => p[1]);
  const [minX, maxX] = extent(xs);
  const [minY, maxY] = extent(ys);
  const typical = typicalSpacing(projected) || 1;
  const pad = 26;
  const spanX = maxX - minX;
  const spanY = maxY - minY;
  // Equal scale on both axes (a map keeps its shape); no more than 64 px between neighbours on a small board.
  const scale = Math.min(spanX > 0 ? (width - 2 * pad) / spanX : Infinity, spanY > 0 ? (maxHeight - 2 * pad) / spanY : Infinity, 64 / typical);
  const s = Number.isFinite(scale) ? scale : 1;
  const height = Math.max(spanY * s + 2 * pad, 70);
  const offsetX = (width - spanX * s) / 2;
  const offsetY = (height - spanY * s) / 2;
  const positions = new Map<string, [number, number]>();
  board.nodes.forEach((n, i) => {
    const [x, y] = projected[i];
    positions.set(n.name, [offsetX + (x - minX) * s, offsetY + (maxY - y) * s]);
  });
  return { positions, width, height, spacing: typical * s };
}

function extent(values: readonly number[]): [number, number] {
  return values.reduce<[number, number]>(([lo, hi], v) => [Math.min(lo, v), Math.max(hi, v)], [Infinity, -Infinity]);
}

/** Nodes whose nearest neighbour is looked up; more would only cost time (each lookup scans every node). */
const SPACING_SAMPLE = 400;

/** Median distance from a node to its nearest neighbour (over an even sample of the nodes on a large board). */
function typicalSpacing(points: [number, number][]): number {
  if (points.length < 2) return 0;
  const every = Math.max(1, Math.ceil(points.length / SPACING_SAMPLE));
  const nearest = points.filter((_, i) => i % every === 0).map((p, k) => {
    const i = k * every;
    let best = Infinity;
    points.forEach((q, j) => {
      if (i !== j) {
        const d = Math.hypot(p[0] - q[0], p[1] - q[1]);
        if (d > 0 && d < best) best = d;
      }
    });
    return best;
  });
  const finite = nearest.filter(Number.isFinite).sort((a, b) => a - b);
  return finite.length > 0 ? finite[Math.floor(finite.length / 2)] : 0;
}

const f = (n: number) => n.toFixed(1);

export function boardMap(spec: BoardMapSpec): Markup {
  const width = spec.width ?? 520;
  const layout = layoutBoard(spec.board, width, spec.maxHeight ?? 420);
  const radius = Math.min(Math.max(layout.spacing * 0.28, 3), 10);
  const stroke = strokeWidths(spec.board.parts);
  const between: Markup[] = [];
  const grounds: Markup[] = [];
  const groundCount = new Map<string, number>();
  for (const part of spec.board.parts) {
    const [a, b] = part.nodes;
    const tip = html`<title>${part.ref} (${part.kind}) ${a}–${b}</title>`;
    if (a === GROUND || b === GROUND) {
      const node = a === GROUND ? b : a;
      const at = layout.positions.get(node);
      if (!at) continue;
      const k = groundCount.get(node) ?? 0;
      groundCount.set(node, k + 1);
      grounds.push(html`<g class="ground part-${part.kind}">${groundMark(at, k, radius)}${tip}</g>`);
      continue;
    }
    const p = layout.positions.get(a);
    const q = layout.positions.get(b);
    if (!p || !q) continue;
    // A part much longer than the node spacing closes a periodic boundary: drawn faint and dashed.
    const wraps = Math.hypot(p[0] - q[0], p[1] - q[1]) > 2.5 * layout.spacing;
    between.push(
      html`<line class="part part-${part.kind}${wraps ? ' wraps' : ''}" x1="${f(p[0])}" y1="${f(p[1])}" x2="${f(q[0])}" y2="${f(q[1])}" stroke-width="${stroke.get(part)!.toFixed(2)}">${tip}</line>`,
    );
  }
  const nodes: Markup[] = [];
  const flags: Markup[] = [];
  const labels: Markup[] = [];
  const labelEvery = layout.spacing >= 26 ? 1 : Math.ceil(26 / Math.max(layout.spacing, 1));
  spec.board.nodes.forEach((node, i) => {
    const [x, y] = layout.positions.get(node.name)!;
    const shade = spec.shades.get(node.name);
    const value = shade?.value;
    const filled = value !== undefined && value > 0 && Number.isFinite(value) && spec.scale !== undefined;
    const fill = filled ? html` fill="${spec.scale!.colour(value)}"` : '';
    nodes.push(html`<circle class="node${filled ? '' : ' no-value'}" data-node="${node.name}" cx="${f(x)}" cy="${f(y)}" r="${f(radius)}"${fill}><title>${shade?.title ?? `${node.name}: not measured`}</title></circle>`);
    if (shade?.flag === 'deviation') flags.push(markerMarkup('triangle', x + radius * 1.1, y - radius * 1.3, Math.max(radius * 0.55, 2.5), 'flag-deviation', `${node.name}: deviation`));
    if (shade?.flag === 'invalid') flags.push(markerMarkup('cross', x + radius * 1.1, y - radius * 1.3, Math.max(radius * 0.5, 2.5), 'flag-invalid', `${node.name}: invalid reading`));
    if (i % labelEvery === 0 || i === spec.board.nodes.length - 1) labels.push(html`<text class="node-label" x="${f(x)}" y="${f(y - radius - 5)}">${node.name}</text>`);
  });
  return html`<svg class="board-map ${spec.className}" viewBox="0 0 ${width} ${f(layout.height)}" width="${width}" height="${f(layout.height)}" role="img" aria-label="${spec.label}">
<g class="parts">${between}</g>
<g class="grounds">${grounds}</g>
<g class="nodes">${nodes}</g>
<g class="flags">${flags}</g>
<g class="labels">${labels}</g>
</svg>`;
}

/** The k-th part to ground at a node: a stub fanned out below the node, ending in a short bar. */
function groundMark([x, y]: [number, number], k: number, radius: number): Markup {
  const angle = Math.PI / 2 + (k % 2 === 0 ? 1 : -1) * Math.ceil(k / 2) * 0.45;
  const length = radius + Math.max(radius * 1.1, 6);
  const ex = x + Math.cos(angle) * length;
  const ey = y + Math.sin(angle) * length;
  const bar = Math.max(radius * 0.6, 3);
  const nx = -Math.sin(angle) * bar;
  const ny = Math.cos(angle) * bar;
  return html`<line x1="${f(x)}" y1="${f(y)}" x2="${f(ex)}" y2="${f(ey)}"/><line class="ground-bar" x1="${f(ex - nx)}" y1="${f(ey - ny)}" x2="${f(ex + nx)}" y2="${f(ey + ny)}"/>`;
}

/** Line width per part: 1 to 3.5 px by the logarithm of its value among the parts of its kind between nodes. */
function strokeWidths(parts: readonly Part[]): Map<Part, number> {
  const range = new Map<string, [number, number]>();
  for (const p of parts) {
    const r = range.get(p.kind) ?? [Infinity, -Infinity];
    range.set(p.kind, [Math.min(r[0], p.value), Math.max(r[1], p.value)]);
  }
  return new Map(
    parts.map((p) => {
      const [lo, hi] = range.get(p.kind)!;
      const t = hi > lo ? Math.log(p.value / lo) / Math.log(hi / lo) : 0.5;
      return [p, 1 + 2.5 * t];
    }),
  );
}
