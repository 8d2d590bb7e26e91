// Bloch bands of a lattice board's bulk unit cell: the lossless mode frequencies of the infinite lattice
// at each phase theta (radians per cell step along each lattice axis; see bloch-matrices.ts).
//
// Every sample lists one frequency per unit-cell site, ascending. A site direction without capacitance
// at that phase has its mode at infinite frequency; it is reported as Infinity (which JSON prints as
// null) at the top of the list, so band b is always the b-th entry and samples line up.
import type { LatticeSummary } from '../board/types.js';
import { hermitianPencilModes } from '../numeric/hermitian-pencil.js';
import { blochMatrices } from './bloch-matrices.js';
import { pathMetric, samplePath, type PathPoint } from './bloch-path.js';

export { blochMatrices, type BlochMatrices } from './bloch-matrices.js';
export { defaultBlochPath, type PathPoint } from './bloch-path.js';
export { bandGaps, type BandGap } from './bloch-gaps.js';

export interface BandSample {
  theta: number[];
  /** One frequency per site, ascending, Infinity for modes without capacitance. */
  frequencies_hz: number[];
}

export interface PathBandSample extends BandSample {
  /** Path length from the start in reciprocal space (radians per unit of the lattice vectors). */
  distance: number;
  /** Vertex label (e.g. Γ, X) on samples that are path vertices. */
  label?: string;
}

/** Band frequencies at one phase vector. */
export function bandsAt(lattice: LatticeSummary, theta: readonly number[]): number[] {
  const { n, capacitance, inverseInductance } = blochMatrices(lattice, theta);
  const { omega2 } = hermitianPencilModes(n, inverseInductance, capacitance);
  const f = Array.from(omega2, (w2) => Math.sqrt(Math.max(w2, 0)) / (2 * Math.PI));
  while (f.length < n) f.push(Infinity);
  return f;
}

/** Bands along a path of phase vectors, pointsPerSegment samples per segment plus the final vertex. */
export function bandsAlongPath(
  lattice: LatticeSummary,
  path: readonly PathPoint[],
  pointsPerSegment: number,
): { samples: PathBandSample[] } {
  const metric = pathMetric(lattice.vectors, lattice.dimensions);
  const samples = samplePath(path, pointsPerSegment, metric).map((s) => ({ ...s, frequencies_hz: bandsAt(lattice, s.theta) }));
  return { samples };
}

/**
 * Bands on the uniform grid theta_axis = 2 pi m / N_axis (m = 0..N_axis-1, wrapped into (-pi, pi]): exactly
 * the phases a board of N_axis cells per axis with periodic wrap admits, so the union of these bands is
 * that board's mode spectrum. Samples run with the last axis fastest.
 */
export function bandsOnGrid(lattice: LatticeSummary, pointsPerAxis: number | readonly number[]): { samples: BandSample[] } {
  const d = lattice.dimensions;
  const counts = typeof pointsPerAxis === 'number' ? new Array<number>(d).fill(pointsPerAxis) : [...pointsPerAxis];
  if (counts.length !== d || counts.some((c) => !Number.isInteger(c) || c < 1)) {
    throw new RangeError(`need ${d} positive integer point counts, got [${counts.join(', ')}]`);
  }
  const samples: BandSample[] = [];
  const index = new Array<number>(d).fill(0);
  const total = counts.reduce((a, b) => a * b, 1);
  for (let s = 0; s < total; s++) {
    const theta = index.map((m, axis) => wrapPhase((2 * Math.PI * m) / counts[axis]));
    samples.push({ theta, frequencies_hz: bandsAt(lattice, theta) });
    for (let axis = d - 1; axis >= 0; axis--) {
      if (++index[axis] < counts[axis]) break;
      index[axis] = 0;
    }
  }
  return { samples };
}

/** Into (-pi, pi]. */
function wrapPhase(t: number): number {
  return t > Math.PI ? t - 2 * Math.PI : t;
}
