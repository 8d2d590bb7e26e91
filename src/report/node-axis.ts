// The x axis of the per-node plots: the board's nodes in board order, one slot each, with labels thinned
// so that they do not overlap.
import type { AxisSpec } from './svg-line-plot.js';

const MOST_LABELS = 26;

export function nodeAxis(names: readonly string[], label = 'node (board order)'): AxisSpec {
  const every = Math.max(1, Math.ceil(names.length / MOST_LABELS));
  const ticks = names.map((_, i) => i).filter((i) => i % every === 0 || i === names.length - 1);
  return {
    kind: 'linear',
    domain: [-0.5, Math.max(names.length - 0.5, 0.5)],
    label,
    format: (i) => names[Math.round(i)] ?? '',
    ticks,
    slanted: names.length > 10,
  };
}
