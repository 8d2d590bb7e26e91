// Predicted impedances of a board: for each frequency, each requested terminal pair.
import { GROUND } from '../board/types.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { ImpedanceSolver } from '../circuit/impedance.js';

export interface TerminalPair {
  hi: string;
  lo: string; // GROUND for node-to-ground
}

export interface ImpedancePoint {
  frequency_hz: number;
  hi: string;
  lo: string;
  re: number;
  im: number;
}

export interface FrequencyQuality {
  frequency_hz: number;
  /** Reciprocal condition estimate of J at this frequency. */
  rcond: number;
  /** Worst relative residual of the solves made at this frequency. */
  residual: number;
}

export interface ImpedancePrediction {
  impedances: ImpedancePoint[];
  quality: FrequencyQuality[];
}

/** From this many node-to-ground readings at one frequency on, selected inversion beats one solve each
 *  (measured break-even about 60 on a 10,000-node board; small boards favour it sooner). */
export const SELECTED_INVERSION_FROM = 24;

/** Residual above which a solve is not trusted (J numerically singular beyond what pivoting can rescue). */
export const RESIDUAL_LIMIT = 1e-8;

export function predictImpedances(
  laplacian: GroundedLaplacian,
  frequencies: readonly number[],
  pairs: readonly TerminalPair[],
): ImpedancePrediction {
  const solver = new ImpedanceSolver(laplacian);
  const impedances: ImpedancePoint[] = [];
  const quality: FrequencyQuality[] = [];
  for (const f of frequencies) {
    const point = solver.at(f);
    if (pairs.filter((p) => p.lo === GROUND).length >= SELECTED_INVERSION_FROM) point.allToGround();
    for (const { hi, lo } of pairs) {
      const z = lo === GROUND ? point.toGround(hi) : point.between(hi, lo);
      impedances.push({ frequency_hz: f, hi, lo, re: z.re, im: z.im });
    }
    quality.push({ frequency_hz: f, rcond: point.reciprocalCondition, residual: point.worstResidual });
  }
  return { impedances, quality };
}

/** Every node of the board to ground, in board order. */
export function everyNodeToGround(laplacian: GroundedLaplacian): TerminalPair[] {
  return laplacian.index.names.map((hi) => ({ hi, lo: GROUND }));
}
