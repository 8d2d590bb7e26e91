// A plan asking more than the profiles allow is refused before anything is sent, in one line naming the
// step, the value and the limit (limits from the built-in profiles' files).
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { builtinProfile, LimitError, type AnalyzerProfile, type SwitchProfile } from '../../../src/instruments/index.js';
import { checkPlanLimits } from '../../../src/run/plan-limits.js';
import { testPlan } from '../../run/support/test-plan.js';
import { DEFAULT_FLOOR, derivePlan } from '../../../src/plan/derive-plan.js';

const board = loadBoard('shared/boards/chain-24.yaml');
const analyzer = builtinProfile('generic-analyzer') as AnalyzerProfile;
const matrix = builtinProfile('generic-switch') as SwitchProfile;
const base = () => testPlan(board, { frequencies: [100e3], steps: [{ hi: 'n1' }, { hi: 'n2' }] });

describe('plan limits', () => {
  it('passes a plan inside every limit', () => {
    expect(() => checkPlanLimits('p.json', base(), analyzer, matrix)).not.toThrow();
  });

  it.each([
    ['level above limits.level', (p: ReturnType<typeof base>) => (p.steps[1].level_v = 2 * analyzer.limits.levelV.max), /steps\[1\] \(step 2\): level .* outside limits\.level/],
    ['frequency above limits.frequency', (p: ReturnType<typeof base>) => (p.steps[0].points[0].frequency_hz = 2 * analyzer.limits.frequencyHz.max), /steps\[0\] \(step 1\) points\[0\]: frequency/],
    ['averaging not whole', (p: ReturnType<typeof base>) => (p.steps[0].averages = 2.5), /averaging 2\.5/],
    ['channel outside the matrix', (p: ReturnType<typeof base>) => (p.steps[0].channels = [matrix.limits.channels.max + 1]), /channel 10000, outside limits\.channels 1 \.\. 9999/],
  ])('refuses %s in one line', (_name, spoil, message) => {
    const p = base();
    spoil(p);
    let error: unknown;
    try {
      checkPlanLimits('p.json', p, analyzer, matrix);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(LimitError);
    expect((error as Error).message).toMatch(message);
    expect((error as Error).message).not.toContain('\n');
    expect((error as LimitError).exitCode).toBe(2);
  });

  it('checks the current a level can drive into a short (level / source resistance, Ohm\'s law)', () => {
    // 20 mA through 50 ohm: levels above 1 V are refused; the profile's level limit is 1 V too, so test
    // with a profile whose source is stiffer.
    const stiff = { ...analyzer, limits: { ...analyzer.limits, sourceOhms: 10 } };
    const p = base();
    p.steps[0].level_v = 0.5; // 50 mA into a short through 10 ohm
    expect(() => checkPlanLimits('p.json', p, stiff, matrix)).toThrow(/can drive 50 mA into a short/);
  });
});

describe('ratings of parts away from the probes', () => {
  // chain-24-rated: the 10 nF intra-cell capacitors are rated 0.5 V, and near the edge mode the a sites
  // swing tens of times the excitation (see the fixture's comment), so a part away from the terminals binds.
  const rated = loadBoard('test/fixtures/plans/chain-rated.yaml');
  const { plan } = derivePlan(rated, {
    modes: {},
    neighbours: false,
    transfer: false,
    bands: { method: 'first-order', combine: 'worst-case' },
    floor: DEFAULT_FLOOR,
    analyzer: { name: 'generic-analyzer', profile: analyzer },
    switch: { name: 'generic-switch', profile: matrix },
    averages: 1,
  });

  it('every step of the plan names the rated part that binds it, with the plan\'s volts per volt', () => {
    for (const step of plan.steps) {
      expect(step.rated?.part).toMatch(/^C_intra_/);
      // The planner kept level · ratio within the 0.5 V rating: that is what the runner re-checks.
      expect(step.level_v * step.rated!.volts_per_volt).toBeLessThanOrEqual(0.5 * (1 + 1e-9));
    }
    expect(() => checkPlanLimits('rated.plan.json', plan, analyzer, matrix)).not.toThrow();
  });

  it('refuses a level raised by hand that would push such a part past its rating (Ohm\'s law on the plan\'s own figure)', () => {
    const tampered = structuredClone(plan);
    // A level half again above what the rating allows, inside the analyzer's level and current limits, so
    // that only the rating can refuse it.
    const raised = (s: (typeof plan.steps)[number]) => (1.5 * 0.5) / s.rated!.volts_per_volt;
    const minOhms = (s: (typeof plan.steps)[number]) => Math.min(...s.points.map((p) => Math.hypot(p.pred_re, p.pred_im)));
    const k = tampered.steps.findIndex(
      (s) => s.rated !== undefined && raised(s) <= analyzer.limits.levelV.max && raised(s) / minOhms(s) < (analyzer.limits.currentA ?? Infinity) / 2,
    );
    expect(k).toBeGreaterThanOrEqual(0);
    tampered.steps[k].level_v = raised(tampered.steps[k]);
    expect(() => checkPlanLimits('rated.plan.json', tampered, analyzer, matrix)).toThrow(
      new RegExp(`steps\\[${k}\\] \\(step ${tampered.steps[k].step}\\): level .* puts .* across ${tampered.steps[k].rated!.part} .*above its rating 500 mV; nothing was sent`),
    );
  });
});
