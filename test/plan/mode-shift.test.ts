// How far the tolerances can move a mode, and whether the plan's sweeps cover it. For a uniform scale s
// of every capacitor the modes move by exactly 1/√s, for every inductor likewise (f ∝ 1/√(LC); common
// practice), so the board at the ends of its tolerances has its edge mode at f0/√((1 ± tC)(1 ± tL)).
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard, type Board } from '../../src/board/index.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import { predictModes } from '../../src/predict/modes.js';
import { modeToleranceWindow } from '../../src/predict/tolerance-mode-window.js';
import { DEFAULT_FLOOR, derivePlan } from '../../src/plan/derive-plan.js';
import { ROOT } from '../support/run-cli.js';

const chain = loadBoard(path.join(ROOT, 'shared/boards/chain-24.yaml'));
const scaled = (board: Board, kind: 'C' | 'L', s: number): Board => ({ ...board, parts: board.parts.map((p) => (p.kind === kind ? { ...p, value: p.value * s } : p)) });
/** The two edge modes (a near-degenerate pair, split by their tiny overlap), lower frequency first. */
const edgeModes = (board: Board) => predictModes(new GroundedLaplacian(board), { count: 2 }).modes.sort((a, b) => a.frequency_hz - b.frequency_hz);
const edgeMode = (board: Board) => edgeModes(board)[0];

describe('edge mode of chain-24 under a uniform scale', () => {
  const f0 = edgeMode(chain).frequency_hz;

  it('sits at 1/(2π√(22 µH · 43 nF)) ≈ 163.6 kHz (common practice)', () => {
    expect(f0 / (1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9)))).toBeCloseTo(1, 4);
  });

  it.each([0.95, 1.05, 1.3])('moves by 1/√s when every capacitor is scaled by s = %d', (s) => {
    const nominal = edgeModes(chain);
    for (const kind of ['C', 'L'] as const) {
      edgeModes(scaled(chain, kind, s)).forEach((m, k) => expect(m.frequency_hz / nominal[k].frequency_hz).toBeCloseTo(1 / Math.sqrt(s), 9));
    }
  });

  it('has a tolerance window that ends exactly where the extreme boards put the mode', () => {
    const low = edgeModes(scaled(scaled(chain, 'C', 1.05), 'L', 1.1));
    const high = edgeModes(scaled(scaled(chain, 'C', 0.95), 'L', 0.9));
    edgeModes(chain).forEach((mode, k) => {
      const window = modeToleranceWindow(new GroundedLaplacian(chain), mode);
      expect(window.lo_hz / low[k].frequency_hz).toBeCloseTo(1, 9);
      expect(window.hi_hz / high[k].frequency_hz).toBeCloseTo(1, 9);
    });
  });
});

describe('the plan sweeps of chain-24', () => {
  const { plan } = derivePlan(chain, {
    modes: {},
    neighbours: false,
    transfer: false,
    bands: { method: 'first-order', combine: 'quadrature' },
    floor: DEFAULT_FLOOR,
    analyzer: { name: 'generic-analyzer', profile: builtinProfile('generic-analyzer') as AnalyzerProfile },
    switch: { name: 'generic-switch', profile: builtinProfile('generic-switch') as SwitchProfile },
    averages: 4,
  });
  const sweep = plan.steps.find((s) => s.purpose === 'sweep' && s.hi === 'n1')!;
  const grid = sweep.points.map((p) => p.frequency_hz).sort((a, b) => a - b);

  it('cover the mode of every board at the ends of its tolerances, with room for the peak flanks', () => {
    for (const [sc, sl] of [[1.05, 1.1], [0.95, 0.9], [1.05, 0.9], [0.95, 1.1]]) {
      const f = edgeMode(scaled(scaled(chain, 'C', sc), 'L', sl)).frequency_hz;
      // The mode plus its half-power width f/Q (Q ≈ 50 here) lies inside the grid.
      expect(grid[0]).toBeLessThan(f * (1 - 1 / 50));
      expect(grid[grid.length - 1]).toBeGreaterThan(f * (1 + 1 / 50));
    }
  });

  it('cover a uniform capacitance scale s within tolerance: f0/√s lies inside the grid', () => {
    for (const s of [0.95, 0.97, 1.03, 1.05]) {
      const f = plan.modes[0].frequency_hz / Math.sqrt(s);
      expect(grid[0]).toBeLessThan(f);
      expect(grid[grid.length - 1]).toBeGreaterThan(f);
    }
  });

  it('are denser at the predicted peak, where the impedance changes fastest, than in the wings', () => {
    const f0 = plan.modes[0].frequency_hz;
    const near = grid.filter((f) => Math.abs(f / f0 - 1) < 0.01).length;
    const wing = grid.filter((f) => f / f0 - 1 > 0.1).length;
    expect(near).toBeGreaterThan(3 * wing);
  });
});
