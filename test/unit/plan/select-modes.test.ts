// Which modes a plan is about, on the three demo boards.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { modesOfInterest } from '../../../src/plan/select-modes.js';
import { ROOT } from '../../support/run-cli.js';

const setup = (file: string) => {
  const board = loadBoard(path.join(ROOT, 'shared/boards', file));
  return { board, laplacian: new GroundedLaplacian(board) };
};

describe('modesOfInterest', () => {
  it('chain-24: the two edge modes, a degenerate pair at the two ends', () => {
    const { board, laplacian } = setup('chain-24.yaml');
    const { modes } = modesOfInterest(board, laplacian, {});
    expect(modes).toHaveLength(2);
    // The pair is split only by the tiny overlap of the two ends: far less than 1 Hz in 163.6 kHz.
    expect(Math.abs(modes[0].frequency_hz - modes[1].frequency_hz)).toBeLessThan(1);
  });

  it('corner-8x8: the four corner modes', () => {
    const { board, laplacian } = setup('corner-8x8.yaml');
    const { modes } = modesOfInterest(board, laplacian, {});
    expect(modes).toHaveLength(4);
    const largest = modes.map((m) => Object.entries(m.profile).sort((a, b) => Math.abs(b[1]) - Math.abs(a[1])).slice(0, 4).map(([n]) => n).sort());
    for (const nodes of largest) expect(nodes).toEqual(['a0_0', 'b3_0', 'c0_3', 'd3_3']);
  });

  it('--near: the nearest mode, with partners only when it stands out from the bulk', () => {
    const chain = setup('chain-24.yaml');
    expect(modesOfInterest(chain.board, chain.laplacian, { near: 160e3 }).modes).toHaveLength(2);
    // At 120 kHz the chain has only bulk modes: just the nearest one.
    const bulk = modesOfInterest(chain.board, chain.laplacian, { near: 120e3 }).modes;
    expect(bulk).toHaveLength(1);
    expect(Math.abs(bulk[0].frequency_hz - 120e3)).toBeLessThan(5e3);
  });

  it('--modes K: the K most localized, in-gap modes first', () => {
    const { board, laplacian } = setup('chain-24.yaml');
    const { modes } = modesOfInterest(board, laplacian, { count: 3 });
    expect(modes).toHaveLength(3);
    expect(modes[0].localization).toBeGreaterThan(3 * modes[2].localization);
  });

  it('a board without a lattice and no standout mode: the most localized mode', () => {
    const { board, laplacian } = setup('tank-3.json');
    const choice = modesOfInterest(board, laplacian, {});
    expect(choice.modes).toHaveLength(1);
    expect(choice.reason).toMatch(/no mode stands out/);
  });
});
