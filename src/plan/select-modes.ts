// Which modes a plan is about. By default the most localized modes in the board's resonance window:
// for a lattice board the modes inside a band gap of its bulk (the only place boundary modes can live),
// otherwise the modes whose localization stands well above the bulk's (at least LOCALIZED_OVER_MEDIAN
// times the median). From these the most localized one leads, and the modes that look like its
// symmetry partners join it: localization within PARTNER_LOCALIZATION of the leader's and frequency
// inside the leader's tolerance window. That picks the chain's two edge modes and the corner board's
// four corner modes without being told how many there are. `--modes K` takes the K most localized
// instead; `--near F` the modes nearest F (with partners as above when K is not given).
import type { Board } from '../board/types.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import { predictBands } from '../predict/bands.js';
import { DENSE_NODE_LIMIT, predictModes, type Mode } from '../predict/modes.js';
import { modeToleranceWindow } from '../predict/tolerance-mode-window.js';
import { formatQuantity } from '../units/quantity.js';

export const LOCALIZED_OVER_MEDIAN = 3;
export const PARTNER_LOCALIZATION = 0.9;
/** At most this many modes are chosen without --modes. */
export const MAX_AUTOMATIC_MODES = 8;
/** With --near and no --modes, the partners are looked for among this many nearest modes. */
const NEAR_POOL = 12;

export interface ModeQueryOptions {
  count?: number;
  near?: number;
}

export interface ModeChoice {
  modes: Mode[];
  /** One line for the summary: how the modes were chosen. */
  reason: string;
}

export function modesOfInterest(board: Board, laplacian: GroundedLaplacian, options: ModeQueryOptions): ModeChoice {
  const all = candidateModes(board, laplacian);
  const finite = all.filter((m) => m.frequency_hz > 0 && Number.isFinite(m.frequency_hz));
  const byLocalization = [...finite].sort((a, b) => b.localization - a.localization);
  const bulk = medianLocalization(byLocalization);
  if (options.near !== undefined) return nearModes(laplacian, options.near, options.count, bulk);
  const { pool, window } = resonanceWindow(board, byLocalization, bulk);
  if (options.count !== undefined) {
    const chosen = [...pool, ...byLocalization.filter((m) => !pool.includes(m))].slice(0, options.count);
    const inside = chosen.filter((m) => pool.includes(m)).length;
    return { modes: chosen, reason: `the ${chosen.length} most localized modes (${inside} of them ${window})` };
  }
  if (pool.length === 0) return { modes: byLocalization.slice(0, 1), reason: 'the most localized mode (no mode stands out from the bulk)' };
  const chosen = withPartners(laplacian, pool);
  return { modes: chosen, reason: `the most localized mode ${window}${partnerPhrase(chosen.length - 1)}` };
}

function nearModes(laplacian: GroundedLaplacian, near: number, count: number | undefined, bulk: number): ModeChoice {
  const where = formatQuantity(near, 'Hz');
  const found = predictModes(laplacian, { count: count ?? Math.min(NEAR_POOL, laplacian.index.size), near }).modes.filter((m) => m.frequency_hz > 0);
  if (count !== undefined) return { modes: found, reason: `the ${found.length} modes nearest ${where}` };
  const [leader] = found;
  if (!leader) return { modes: [], reason: `no mode near ${where}` };
  // Bulk modes all look alike; only a mode that stands out from the bulk has partners worth adding.
  if (leader.localization < LOCALIZED_OVER_MEDIAN * bulk) return { modes: [leader], reason: `the mode nearest ${where}` };
  const chosen = withPartners(laplacian, found);
  return { modes: chosen, reason: `the mode nearest ${where}${partnerPhrase(chosen.length - 1)}` };
}

function partnerPhrase(count: number): string {
  return count === 0 ? '' : ` and its ${count} partner${count === 1 ? '' : 's'}`;
}

function medianLocalization(modes: readonly Mode[]): number {
  const sorted = modes.map((m) => m.localization).sort((a, b) => a - b);
  return sorted.length > 0 ? sorted[Math.floor((sorted.length - 1) / 2)] : 0;
}

/** Every mode on a small board; on a large one, those near the gap centres and the most localized. */
function candidateModes(board: Board, laplacian: GroundedLaplacian): Mode[] {
  const n = laplacian.index.size;
  if (n <= DENSE_NODE_LIMIT) return predictModes(laplacian, { count: n }).modes;
  const modes = [...predictModes(laplacian, { count: 16 }).modes];
  for (const gap of latticeGaps(board)) {
    for (const m of predictModes(laplacian, { count: 16, near: (gap.below_hz + gap.above_hz) / 2 }).modes) {
      if (!modes.some((o) => o.frequency_hz === m.frequency_hz && o.localization === m.localization)) modes.push(m);
    }
  }
  return modes;
}

function latticeGaps(board: Board): { below_hz: number; above_hz: number }[] {
  return board.lattice ? predictBands(board, 24).gaps : [];
}

/** The modes in the resonance window, most localized first, and a phrase saying what the window was. */
function resonanceWindow(board: Board, byLocalization: Mode[], median: number): { pool: Mode[]; window: string } {
  const gaps = latticeGaps(board);
  const inGap = byLocalization.filter((m) => gaps.some((g) => m.frequency_hz > g.below_hz && m.frequency_hz < g.above_hz));
  if (inGap.length > 0) return { pool: inGap, window: 'inside a band gap of the bulk' };
  const standOut = byLocalization.filter((m) => m.localization >= LOCALIZED_OVER_MEDIAN * median);
  return { pool: standOut, window: `localized well above the bulk (at least ${LOCALIZED_OVER_MEDIAN}× the median)` };
}

/** The first mode and those that look like its symmetry partners. */
function withPartners(laplacian: GroundedLaplacian, pool: Mode[]): Mode[] {
  const [leader, ...rest] = pool;
  const window = modeToleranceWindow(laplacian, leader);
  // A board without tolerances still has near-degenerate partners split by a little coupling.
  const lo = Math.min(window.lo_hz, leader.frequency_hz * 0.98);
  const hi = Math.max(window.hi_hz, leader.frequency_hz * 1.02);
  const partners = rest.filter((m) => m.localization >= PARTNER_LOCALIZATION * leader.localization && m.frequency_hz >= lo && m.frequency_hz <= hi);
  return [leader, ...partners].slice(0, MAX_AUTOMATIC_MODES);
}
