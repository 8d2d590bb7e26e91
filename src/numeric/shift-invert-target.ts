// A default shift when the caller names no target: the median over nodes of each node's own resonance,
// ω² = K_ii / C_ii (its total inductance and total capacitance to everything). On a lattice board that is
// the frequency the design is built around, where edge and corner modes of the lab's boards sit.
import type { CscPattern } from './types.js';
import { realDiagonal } from './shift-invert-real-csc.js';

/** Median K_ii / C_ii over nodes that have both (rad²/s²); null when no node has both. */
export function medianNodeResonance(p: CscPattern, K: Float64Array, C: Float64Array): number | null {
  const kd = realDiagonal(p, K);
  const cd = realDiagonal(p, C);
  const ratios: number[] = [];
  for (let i = 0; i < p.n; i++) if (kd[i] > 0 && cd[i] > 0) ratios.push(kd[i] / cd[i]);
  if (ratios.length === 0) return null;
  ratios.sort((a, b) => a - b);
  const mid = ratios.length >> 1;
  return ratios.length % 2 === 1 ? ratios[mid] : 0.5 * (ratios[mid - 1] + ratios[mid]);
}
