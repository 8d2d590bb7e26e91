// The plan for the demo corner board: the four corner modes in the gap, profiled over all 64 nodes.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import { predictBands } from '../../src/predict/bands.js';
import { DEFAULT_FLOOR, derivePlan } from '../../src/plan/derive-plan.js';
import { parsePlanText } from '../../src/plan/read-plan.js';
import { ROOT } from '../support/run-cli.js';

const board = loadBoard(path.join(ROOT, 'shared/boards/corner-8x8.yaml'));
const cornerPlan = (transfer: boolean, combine: 'worst-case' | 'quadrature') =>
  derivePlan(board, {
    modes: {},
    neighbours: false,
    transfer,
    bands: { method: 'first-order', combine },
    floor: DEFAULT_FLOOR,
    analyzer: { name: 'generic-analyzer', profile: builtinProfile('generic-analyzer') as AnalyzerProfile },
    switch: { name: 'generic-switch', profile: builtinProfile('generic-switch') as SwitchProfile },
    averages: 2,
  });
const { plan, notes } = cornerPlan(false, 'worst-case');

describe('plan for corner-8x8', () => {
  it('chooses the four corner modes, inside the band gap around 1/(2π√(22 µH · 83.7 nF)) ≈ 117.3 kHz', () => {
    // Every node carries 10 + 22 + 4.7 + 47 nF against 22 µH (common practice: f0 = 1/(2π√(LC))).
    const f0 = 1 / (2 * Math.PI * Math.sqrt(22e-6 * 83.7e-9));
    const gap = predictBands(board, 24).gaps.find((g) => g.below_hz < f0 && g.above_hz > f0)!;
    expect(plan.modes).toHaveLength(4);
    for (const m of plan.modes) {
      expect(m.frequency_hz).toBeGreaterThan(gap.below_hz);
      expect(m.frequency_hz).toBeLessThan(gap.above_hz);
      expect(Math.abs(m.frequency_hz / f0 - 1)).toBeLessThan(0.01);
      expect(m.localization).toBeCloseTo(plan.modes[0].localization, 3);
    }
    expect(notes.modes).toMatch(/inside a band gap/);
  });

  it('profiles all 64 nodes at each of the two corner-mode frequencies', () => {
    const profile = plan.steps.filter((s) => s.purpose === 'profile');
    expect(profile).toHaveLength(64);
    for (const s of profile) expect(s.points).toHaveLength(2);
    const frequencies = new Set(profile.flatMap((s) => s.points.map((p) => p.frequency_hz)));
    expect(frequencies.size).toBe(2);
  });

  it('sweeps the four corners, where the corner modes live', () => {
    expect(plan.steps.filter((s) => s.purpose === 'sweep').map((s) => s.hi).sort()).toEqual(['a0_0', 'b3_0', 'c0_3', 'd3_3']);
    expect(plan.steps.filter((s) => s.purpose === 'reference')).toHaveLength(2);
  });

  it('alternates the direction of the two-point profiles, so most nodes need one frequency change, not two', () => {
    expect(plan.estimate.frequency_changes).toBeLessThan(notes.naive.frequency_changes);
    expect(plan.bands).toMatchObject({ method: 'first-order', combine: 'worst-case', coverage: 1 });
  });
});

describe('first-order bands of transfer readings near a sign change of the profile', () => {
  it('stay finite, so the plan can be written and passes its own check', () => {
    // Where the transfer impedance nearly vanishes, relative sensitivities are huge; exp() of them overflows.
    const { plan: withTransfer } = cornerPlan(true, 'quadrature');
    const transfers = withTransfer.steps.filter((s) => s.kind === 'transfer');
    expect(transfers.length).toBeGreaterThan(0);
    for (const s of transfers) {
      for (const p of s.points) {
        expect(Number.isFinite(p.band.mag_hi_ohm), `step ${s.step} at ${p.frequency_hz} Hz`).toBe(true);
        expect(p.band.mag_hi_ohm).toBeGreaterThanOrEqual(p.band.mag_lo_ohm);
      }
    }
    expect(() => parsePlanText(JSON.stringify(withTransfer), 'corner-transfer.plan.json')).not.toThrow();
  });
});
