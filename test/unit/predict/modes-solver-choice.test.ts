// predictModes picks the dense solver for small boards and shift-invert Lanczos for large ones; either way
// the modes must be those of the dense pencil solver generalizedModes (the outside reference here).
import { describe, expect, it } from 'vitest';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { loadBoard } from '../../../src/board/index.js';
import { generalizedModes, inverseParticipationRatio, modeShape } from '../../../src/numeric/pencil-modes.js';
import { DENSE_NODE_LIMIT, predictModes, type Mode } from '../../../src/predict/modes.js';
import { dimerizedSquareBoard } from '../../bench/modes-boards.util.js';

const dimerized = dimerizedSquareBoard; // the same board as the modes benchmarks

function dense(lap: GroundedLaplacian) {
  const d = lap.losslessMatrices();
  const g = generalizedModes(d.n, d.inverseInductance, d.capacitance);
  return Array.from(g.omega2, (w2, k) => ({ f: Math.sqrt(w2) / (2 * Math.PI), shape: modeShape(g, k) }));
}

/** Share of a unit mode shape inside the span of reference shapes (1 when inside): Gram–Schmidt, then projection. */
function captured(mode: Mode, names: readonly string[], shapes: Float64Array[]): number {
  const basis: Float64Array[] = [];
  for (const y of shapes) {
    const w = Float64Array.from(y);
    for (let pass = 0; pass < 2; pass++) {
      for (const u of basis) {
        const d = u.reduce((acc, ui, i) => acc + ui * w[i], 0);
        for (let i = 0; i < w.length; i++) w[i] -= d * u[i];
      }
    }
    const norm = Math.hypot(...w);
    if (norm > 1e-8) basis.push(w.map((wi) => wi / norm));
  }
  const x = Float64Array.from(names, (name) => mode.profile[name]);
  return basis.reduce((acc, u) => acc + u.reduce((d, ui, i) => d + ui * x[i], 0) ** 2, 0);
}

const board = dimerized(20, 20); // 400 nodes
const lap = new GroundedLaplacian(board);
const reference = dense(lap);

describe('predictModes on a board above the dense limit', () => {
  it('uses shift-invert and returns the dense solver modes nearest the target', () => {
    expect(board.nodes.length).toBeGreaterThan(DENSE_NODE_LIMIT);
    const near = 125e3;
    const set = predictModes(lap, { count: 8, near });
    expect(set.solver).toBe('shift-invert');
    const ref = [...reference].sort((a, b) => Math.abs(a.f - near) - Math.abs(b.f - near)).slice(0, 8);
    const ours = set.modes.map((m) => m.frequency_hz).sort((a, b) => a - b);
    ref.map((r) => r.f).sort((a, b) => a - b).forEach((f, i) => expect(Math.abs(ours[i] / f - 1)).toBeLessThan(1e-9)); // dense
    // nearest first, as the dense path ranks them
    set.modes.forEach((m, i) => i > 0 && expect(Math.abs(m.frequency_hz - near)).toBeGreaterThanOrEqual(Math.abs(set.modes[i - 1].frequency_hz - near) - 1e-6));
    for (const m of set.modes) {
      // the shape lies in the dense eigenspace of its frequency (pairs closer than 1e-6 relative count as one)
      const space = reference.filter((r) => Math.abs(r.f / m.frequency_hz - 1) < 1e-6).map((r) => r.shape);
      expect(captured(m, lap.index.names, space)).toBeCloseTo(1, 8);
      expect(m.localization).toBeCloseTo(inverseParticipationRatio(Float64Array.from(lap.index.names, (k) => m.profile[k])), 12);
    }
    expect(set.spectrum.length).toBeGreaterThanOrEqual(8);
  });

  it('without a target, ranks by localization around the median node self-resonance: the four corner modes', () => {
    const set = predictModes(lap, { count: 4 });
    expect(set.solver).toBe('shift-invert');
    // dense reference: the four most localized modes of the whole board
    const top = reference
      .map((r) => ({ ...r, ipr: inverseParticipationRatio(r.shape) }))
      .sort((a, b) => b.ipr - a.ipr)
      .slice(0, 4);
    const ours = set.modes.map((m) => m.frequency_hz).sort((a, b) => a - b);
    top.map((r) => r.f).sort((a, b) => a - b).forEach((f, i) => expect(Math.abs(ours[i] / f - 1)).toBeLessThan(1e-9));
    for (const m of set.modes) {
      expect(m.localization).toBeGreaterThan(0.1);
      const profile = Object.values(m.profile);
      expect(Math.max(...profile)).toBeCloseTo(Math.max(...profile.map(Math.abs)), 14); // largest entry positive
      expect(Math.hypot(...profile)).toBeCloseTo(1, 12);
    }
  });
});

describe('predictModes on small boards', () => {
  it('keeps the dense solver and its whole spectrum', () => {
    const small = loadBoard('shared/boards/corner-8x8.yaml');
    const set = predictModes(new GroundedLaplacian(small), { count: 4, near: 117.3e3 });
    expect(set.solver).toBe('dense');
    expect(set.spectrum).toHaveLength(64);
  });
});
