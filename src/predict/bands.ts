// The bulk bands of a lattice board for `predict --bands`: samples along the customary path for plotting,
// and the band gaps (the windows where boundary modes can live), read off the path and a uniform grid of
// phases together, because a band's extremes need not lie on the path.
import type { Board } from '../board/types.js';
import { bandGaps, bandsAlongPath, bandsOnGrid, defaultBlochPath, type BandGap, type PathBandSample } from './bloch-bands.js';

export interface BandPrediction {
  path: string[];
  samples: PathBandSample[];
  gaps: BandGap[];
  /** Lowest and highest frequency of each band over all samples (Infinity for a band without capacitance). */
  bands: { band: number; min_hz: number; max_hz: number }[];
}

export class NoLatticeError extends Error {
  constructor(board: string) {
    super(`board ${board} has no lattice section; bands need a unit cell`);
    this.name = 'NoLatticeError';
  }
}

const GRID_POINTS: Record<number, number> = { 1: 64, 2: 24, 3: 10 };

export function predictBands(board: Board, pointsPerSegment: number): BandPrediction {
  const lattice = board.lattice;
  if (!lattice) throw new NoLatticeError(board.name);
  const path = defaultBlochPath(lattice.dimensions);
  const { samples } = bandsAlongPath(lattice, path, pointsPerSegment);
  const grid = bandsOnGrid(lattice, GRID_POINTS[lattice.dimensions] ?? 8).samples;
  const all = [...samples, ...grid];
  const siteCount = lattice.sites.length;
  const bands = Array.from({ length: siteCount }, (_, b) => {
    const values = all.map((s) => s.frequencies_hz[b]);
    return { band: b, min_hz: Math.min(...values), max_hz: Math.max(...values) };
  });
  return { path: path.map((p) => p.label), samples, gaps: bandGaps(all), bands };
}
