// Bloch bands against the modes of a finite board with periodic wrap. Bloch's theorem (common practice): the
// modes of a board of M cells per axis closed on itself are exactly the Bloch modes at theta = 2 pi m / M,
// so the sorted finite spectrum equals the sorted union of the bands on that grid. The board side runs
// through the independent real-pencil path: GroundedLaplacian.losslessMatrices() and generalizedModes.
import { describe, expect, it } from 'vitest';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { generalizedModes } from '../../../src/numeric/pencil-modes.js';
import { bandsOnGrid } from '../../../src/predict/bloch-bands.js';
import type { LatticeSummary } from '../../../src/board/types.js';
import { dimerizedChain, mixedSquareSheet, zigzagRibbon } from './lattices.js';
import { periodicBoard } from './periodic-board.js';

function boardSpectrum(lattice: LatticeSummary): { finite: number[]; infinite: number } {
  const board = periodicBoard('periodic', lattice);
  const { n, capacitance, inverseInductance } = new GroundedLaplacian(board).losslessMatrices();
  const modes = generalizedModes(n, inverseInductance, capacitance);
  const finite = Array.from(modes.omega2, (w2) => Math.sqrt(w2) / (2 * Math.PI)).sort((a, b) => a - b);
  return { finite, infinite: modes.infiniteCount };
}

function bandSpectrum(lattice: LatticeSummary): { finite: number[]; infinite: number } {
  const all = bandsOnGrid(lattice, lattice.repeats).samples.flatMap((s) => s.frequencies_hz);
  return { finite: all.filter(Number.isFinite).sort((a, b) => a - b), infinite: all.filter((f) => !Number.isFinite(f)).length };
}

function expectSameSpectrum(lattice: LatticeSummary) {
  const board = boardSpectrum(lattice);
  const bands = bandSpectrum(lattice);
  expect(bands.infinite).toBe(board.infinite);
  expect(bands.finite.length).toBe(board.finite.length);
  bands.finite.forEach((f, k) => expect(Math.abs(f / board.finite[k] - 1)).toBeLessThan(1e-9));
}

describe('Bloch bands equal the spectrum of a periodic board', () => {
  it.each([8, 7, 3])('ring of %i dimerized-chain cells (one infinite mode: the floating capacitor network)', (M) => {
    const lattice = dimerizedChain(10e-9, 33e-9, 22e-6, 1, M);
    expectSameSpectrum(lattice);
    expect(bandSpectrum(lattice).infinite).toBe(1);
  });

  it.each([
    [6, 6],
    [5, 4],
  ] as [number, number][])('%i x %i sheet of a two-site cell with phases in both C and K', (...repeats) => {
    expectSameSpectrum(mixedSquareSheet(repeats));
  });

  it('ring of 9 zigzag-ribbon cross-sections (W = 4)', () => {
    expectSameSpectrum({ ...zigzagRibbon(4, 4.7e-9, 10e-6, 1), repeats: [9] });
  });
});
