// How a lossless mode's frequency moves with each part value, to first order (Rayleigh quotient /
// eigenvalue perturbation of the pencil K x = ω² C x; common practice). With x the mode shape and
// Δx_k = x_a − x_b across part k (ground's entry 0):
//   capacitor  d ln f / d ln C_k = −½ · C_k Δx_k² / (xᵀCx)
//   inductor   d ln f / d ln L_k = −½ · (Δx_k² / L_k) / (xᵀKx)       (ω² xᵀCx = xᵀKx)
// Resistors take no part in the lossless modes. Scaling every capacitor by s sums to f → f/√s.
import type { Part } from '../board/types.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';

export interface ModeSensitivity {
  part: Part;
  /** d ln f / d ln p */
  value: number;
}

export function modeFrequencySensitivities(laplacian: GroundedLaplacian, profile: Readonly<Record<string, number>>): ModeSensitivity[] {
  const shape = (node: string) => (laplacian.index.row(node) < 0 ? 0 : (profile[node] ?? 0));
  const drops = laplacian.board.parts.map((part) => (shape(part.nodes[0]) - shape(part.nodes[1])) ** 2);
  let xCx = 0;
  let xKx = 0;
  laplacian.board.parts.forEach((part, k) => {
    if (part.kind === 'C') xCx += part.value * drops[k];
    else if (part.kind === 'L') xKx += drops[k] / part.value;
  });
  return laplacian.board.parts.map((part, k) => {
    let value = 0;
    if (part.kind === 'C' && xCx > 0) value = (-0.5 * part.value * drops[k]) / xCx;
    else if (part.kind === 'L' && xKx > 0) value = (-0.5 * drops[k]) / part.value / xKx;
    return { part, value };
  });
}
