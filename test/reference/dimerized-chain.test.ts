// The dimerized (SSH) chain built from capacitors, with inductors to ground.
// Source: W. P. Su, J. R. Schrieffer, A. J. Heeger, PRL 42, 1698 (1979) (from memory): an open chain
// starting on the intracell bond v has a zero-energy edge state on sublattice A with amplitude ratio -v/w
// from cell to cell and zero weight on B, present for v < w and absent for v > w.
// Common practice for the circuit form: at the frequency where each node's own admittance cancels,
// J = -i w (hopping matrix), so the edge state shows as a mode at that frequency and a large edge impedance.
import { describe, expect, it } from 'vitest';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { predictModes } from '../../src/predict/modes.js';
import { GROUND } from '../../src/board/types.js';
import { makeBoard, type PartSpec } from '../support/make-board.js';

function chain(cells: number, v: number, w: number, L: number, esr = 0) {
  const node = (i: number) => `n${i + 1}`;
  const specs: PartSpec[] = [];
  const N = 2 * cells;
  for (let i = 0; i + 1 < N; i++) specs.push(['C', node(i), node(i + 1), i % 2 === 0 ? v : w]);
  // terminate the open ends with the missing intercell capacitance so every node's total is v + w
  specs.push(['C', node(0), GROUND, w], ['C', node(N - 1), GROUND, w]);
  for (let i = 0; i < N; i++) specs.push(['L', node(i), GROUND, L, esr]);
  return makeBoard(`chain-${N}`, specs);
}

const v = 10e-9;
const w = 33e-9;
const L = 22e-6;
const f0 = 1 / (2 * Math.PI * Math.sqrt(L * (v + w)));

describe('topological chain (v < w)', () => {
  const lap = new GroundedLaplacian(chain(12, v, w, L));
  const { modes } = predictModes(lap, { count: 2, near: f0 });

  it('has a mode at the ground-cancelling frequency', () => {
    expect(Math.abs(modes[0].frequency_hz / f0 - 1)).toBeLessThan(1e-4);
  });

  it('the edge mode decays by -v/w per cell on sublattice A and vanishes on B', () => {
    // The two edge states of the finite chain hybridize by ~(v/w)^12; combine the pair to isolate the left one.
    const [m1, m2] = modes;
    const left = Object.keys(m1.profile).map((k) => m1.profile[k] + Math.sign(m1.profile.n1 * m2.profile.n1) * m2.profile[k]);
    for (let cell = 0; cell < 4; cell++) {
      expect(left[2 * cell + 2] / left[2 * cell]).toBeCloseTo(-v / w, 4);
      expect(Math.abs(left[2 * cell + 1] / left[0])).toBeLessThan(1e-4);
    }
  });

  it('is far more localized than the bulk modes', () => {
    const { modes: all } = predictModes(lap, { count: 24 });
    const bulk = all.filter((m) => Math.abs(m.frequency_hz / f0 - 1) > 0.05);
    expect(modes[0].localization).toBeGreaterThan(3 * Math.max(...bulk.map((m) => m.localization)));
  });

  it('the edge node reads a far larger impedance than a bulk node at f0', () => {
    const lossy = new GroundedLaplacian(chain(12, v, w, L, 0.276));
    const point = new ImpedanceSolver(lossy).at(f0);
    const edge = point.toGround('n1');
    const bulk = point.toGround('n12');
    expect(Math.hypot(edge.re, edge.im)).toBeGreaterThan(20 * Math.hypot(bulk.re, bulk.im));
  });
});

describe('trivial chain (v > w): no edge state', () => {
  const lap = new GroundedLaplacian(chain(12, w, v, L));
  it('has no mode near the ground-cancelling frequency', () => {
    const { modes } = predictModes(lap, { count: 1, near: f0 });
    // the bulk gap is |w - v| around the mid-gap frequency; nothing lives in its middle
    expect(Math.abs(modes[0].frequency_hz / f0 - 1)).toBeGreaterThan(0.05);
  });
});
