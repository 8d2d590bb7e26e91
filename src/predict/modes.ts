// Resonant modes of the lossless board: K x = w^2 C x with K the inverse-inductance Laplacian and C the
// capacitance Laplacian. Localization (inverse participation ratio) makes edge and corner modes stand out.
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { generalizedModes, inverseParticipationRatio } from '../numeric/pencil-modes.js';

export interface Mode {
  frequency_hz: number;
  /** Inverse participation ratio of the mode shape: 1/N when spread evenly, 1 on a single node. */
  localization: number;
  /** Mode shape on every node, unit 2-norm, sign chosen so the largest entry is positive. */
  profile: Record<string, number>;
}

export interface ModeQuery {
  count: number;
  /** Target frequency in Hz: the modes nearest to it. Without it, the most localized modes. */
  near?: number;
}

export interface ModeSet {
  modes: Mode[];
  /** All finite-frequency modes of the board, ascending (Hz). */
  spectrum: number[];
}

export function predictModes(laplacian: GroundedLaplacian, query: ModeQuery): ModeSet {
  const { n, capacitance, inverseInductance } = laplacian.losslessMatrices();
  const result = generalizedModes(n, inverseInductance, capacitance);
  const m = result.omega2.length;
  const all: { f: number; column: number; ipr: number }[] = [];
  for (let k = 0; k < m; k++) {
    const w2 = Math.max(result.omega2[k], 0);
    const shape = column(result.vectors, n, m, k);
    all.push({ f: Math.sqrt(w2) / (2 * Math.PI), column: k, ipr: inverseParticipationRatio(shape) });
  }
  const near = query.near;
  const ranked = [...all].sort((a, b) =>
    near !== undefined ? Math.abs(a.f - near) - Math.abs(b.f - near) : b.ipr - a.ipr,
  );
  const chosen = ranked.slice(0, Math.max(0, query.count));
  const modes = chosen.map(({ f, column: k, ipr }) => {
    const shape = column(result.vectors, n, m, k);
    const sign = Math.sign(shape[argMaxAbs(shape)]) || 1;
    const profile: Record<string, number> = {};
    laplacian.index.names.forEach((name, i) => (profile[name] = sign * shape[i]));
    return { frequency_hz: f, localization: ipr, profile };
  });
  return { modes, spectrum: all.map((a) => a.f).sort((a, b) => a - b) };
}

function column(vectors: Float64Array, n: number, m: number, k: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = vectors[i * m + k];
  return out;
}

function argMaxAbs(v: Float64Array): number {
  let best = 0;
  for (let i = 1; i < v.length; i++) if (Math.abs(v[i]) > Math.abs(v[best])) best = i;
  return best;
}
