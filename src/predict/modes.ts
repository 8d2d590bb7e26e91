// Resonant modes of the lossless board: K x = w^2 C x with K the inverse-inductance Laplacian and C the
// capacitance Laplacian. Localization (inverse participation ratio) makes edge and corner modes stand out.
//
// Two solvers, chosen by board size: up to DENSE_NODE_LIMIT nodes the dense pencil solver gives every mode
// at once; beyond, shift-invert Lanczos on the sparse LU gives the modes nearest a target (its cost grows
// far more slowly than the dense n³). See test/bench/modes-crossover.ts for the measurement behind the limit.
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { generalizedModes, inverseParticipationRatio } from '../numeric/pencil-modes.js';
import { shiftInvertModes } from '../numeric/lanczos-shift-invert.js';
import { SingularPencilError } from '../numeric/lanczos-errors.js';
import { medianNodeResonance } from '../numeric/shift-invert-target.js';
import { realNorm1 } from '../numeric/shift-invert-real-csc.js';
import type { CscPattern } from '../numeric/types.js';

export interface Mode {
  frequency_hz: number;
  /** Inverse participation ratio of the mode shape: 1/N when spread evenly, 1 on a single node. */
  localization: number;
  /** Mode shape on every node, unit 2-norm, sign chosen so the largest entry is positive. */
  profile: Record<string, number>;
}

export interface ModeQuery {
  count: number;
  /**
   * Target frequency in Hz: the modes nearest to it. Without it, the most localized modes: of all modes
   * on a small board; on a large board, of the modes nearest the median node self-resonance (see below).
   */
  near?: number;
}

export interface ModeSet {
  modes: Mode[];
  /**
   * Frequencies (Hz, ascending) of the modes the solver computed: with the dense solver every finite-
   * frequency mode of the board; with shift-invert Lanczos only the modes found near the target (the
   * `modes` are chosen from these).
   */
  spectrum: number[];
  solver: 'dense' | 'shift-invert';
  /** Set when the solver had something to say (the target sat on a mode and was moved slightly). */
  note?: string;
}

/**
 * Boards up to this many nodes use the dense solver. Measured (test/bench/modes-crossover.ts, 2-core
 * machine, 2D dimerized lattices, 10 modes): the two cost the same near 150 nodes, at 576 shift-invert is
 * about 10× faster and at 900 about 14×. Up to 300 nodes the dense solve stays under 0.2 s and gives the
 * whole spectrum besides, so the switch sits there rather than at the break-even point.
 */
export const DENSE_NODE_LIMIT = 300;

/** Without `near`, the large-board path ranks this many modes by localization: max(2·count, count + 10). */
function localizationPool(count: number): number {
  return Math.max(2 * count, count + 10);
}

export function predictModes(laplacian: GroundedLaplacian, query: ModeQuery): ModeSet {
  const n = laplacian.index.size;
  const count = Math.max(0, Math.floor(query.count));
  const pool = query.near !== undefined ? count : localizationPool(count);
  // Asking for a large share of all modes is the dense solver's job whatever the size.
  if (n <= DENSE_NODE_LIMIT || 4 * pool > n) return denseModes(laplacian, count, query.near);
  try {
    return sparseModes(laplacian, count, query.near);
  } catch (err) {
    // A direction with neither capacitance nor inductance makes every K − σC singular; the dense solver
    // condenses it away. Beyond a few thousand nodes that would take too long: report it instead.
    if (err instanceof SingularPencilError && n <= 3000) return denseModes(laplacian, count, query.near);
    throw err;
  }
}

interface Candidate {
  f: number;
  ipr: number;
  shape: Float64Array;
}

function denseModes(laplacian: GroundedLaplacian, count: number, near: number | undefined): ModeSet {
  const { n, capacitance, inverseInductance } = laplacian.losslessMatrices();
  const result = generalizedModes(n, inverseInductance, capacitance);
  const m = result.omega2.length;
  const all: Candidate[] = [];
  for (let k = 0; k < m; k++) {
    const shape = column(result.vectors, n, m, k);
    all.push({ f: frequency(result.omega2[k]), ipr: inverseParticipationRatio(shape), shape });
  }
  return { modes: choose(laplacian, all, count, near), spectrum: ascending(all), solver: 'dense' };
}

/**
 * The large-board path. Lanczos ranks by distance in ω², the query by distance in Hz, which weighs the two
 * sides of the target slightly differently; so it asks for a few more modes than wanted and widens the
 * request until the modes it keeps provably lie within the ω² window it searched completely.
 */
function sparseModes(laplacian: GroundedLaplacian, count: number, near: number | undefined): ModeSet {
  const { pattern, capacitance, inverseInductance } = laplacian.losslessSparse();
  if (count === 0) return { modes: [], spectrum: [], solver: 'shift-invert' };
  const target = near !== undefined ? (2 * Math.PI * near) ** 2 : defaultTarget(pattern, inverseInductance, capacitance);
  if (target === null) return denseModes(laplacian, count, near); // no inductance or no capacitance at all
  let ask = near !== undefined ? count + Math.max(2, Math.ceil(count / 2)) : localizationPool(count);
  for (;;) {
    const found = shiftInvertModes(pattern, inverseInductance, capacitance, { count: Math.min(ask, pattern.n), shift: target });
    const all: Candidate[] = Array.from(found.values, (w2, i) => ({
      f: frequency(w2),
      ipr: inverseParticipationRatio(found.vectors[i]),
      shape: found.vectors[i],
    }));
    const modes = choose(laplacian, all, count, near);
    const searched = all.length > 0 ? Math.max(...found.values.map((w2) => Math.abs(w2 - target))) : 0;
    const exhausted = found.values.length < Math.min(ask, pattern.n);
    const farthest = near !== undefined && modes.length > 0 ? Math.max(...modes.map((md) => Math.abs(md.frequency_hz - near))) : 0;
    // The Hz window [near − d, near + d] maps to ω² up to (2π(near + d))², its far side.
    const needed = near !== undefined ? (2 * Math.PI) ** 2 * ((near + farthest) ** 2 - near ** 2) : 0;
    if (near === undefined || exhausted || needed <= searched || ask >= pattern.n) {
      return { modes, spectrum: ascending(all), solver: 'shift-invert', note: found.shift.note };
    }
    ask = Math.min(pattern.n, 2 * ask);
  }
}

/**
 * ω² to search around when no frequency is given: the median node self-resonance 1/(2π√(L_node·C_node)),
 * L_node and C_node from the diagonals of K and C. If no node has both, the ratio ‖K‖₁/‖C‖₁ stands in.
 */
function defaultTarget(pattern: CscPattern, K: Float64Array, C: Float64Array): number | null {
  const median = medianNodeResonance(pattern, K, C);
  if (median !== null) return median;
  const k = realNorm1(pattern, K);
  const c = realNorm1(pattern, C);
  return k > 0 && c > 0 ? k / c : null;
}

/** Nearest `near` in Hz, or most localized first; shapes mapped to node names. */
function choose(laplacian: GroundedLaplacian, all: Candidate[], count: number, near: number | undefined): Mode[] {
  const ranked = [...all].sort((a, b) => (near !== undefined ? Math.abs(a.f - near) - Math.abs(b.f - near) : b.ipr - a.ipr));
  return ranked.slice(0, count).map(({ f, ipr, shape }) => {
    const sign = Math.sign(shape[argMaxAbs(shape)]) || 1;
    const profile: Record<string, number> = {};
    laplacian.index.names.forEach((name, i) => (profile[name] = sign * shape[i]));
    return { frequency_hz: f, localization: ipr, profile };
  });
}

function frequency(omega2: number): number {
  return Math.sqrt(Math.max(omega2, 0)) / (2 * Math.PI);
}

function ascending(all: Candidate[]): number[] {
  return all.map((a) => a.f).sort((a, b) => a - b);
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
