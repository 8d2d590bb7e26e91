// Before anything is sent: every setting the plan will ask for must sit inside the limits of the profiles
// in use (frequency, level, the current the level can drive into a short, averaging, channels). A plan that
// asks for more is refused with one line naming the step, the value and the limit. Exit 2.
import { LimitError, type AnalyzerProfile, type SwitchProfile } from '../instruments/index.js';
import type { ScanPlan } from '../plan/types.js';
import { formatQuantity } from '../units/format.js';

export function checkPlanLimits(planFile: string, plan: ScanPlan, analyzer: AnalyzerProfile, matrix?: SwitchProfile): void {
  const { limits } = analyzer;
  const refuse = (where: string, what: string, limit: string, profile: { name: string; file: string }) => {
    throw new LimitError(`${planFile}: ${where}: ${what}, outside ${limit} of profile ${profile.name} (${profile.file}); nothing was sent`, limit);
  };
  const outside = (v: number, r: { min: number; max: number }) => !(v >= r.min && v <= r.max);
  plan.steps.forEach((step, i) => {
    const where = `steps[${i}] (step ${step.step})`;
    if (outside(step.level_v, limits.levelV)) {
      refuse(where, `level ${formatQuantity(step.level_v, 'V')}`, `limits.level ${formatQuantity(limits.levelV.min, 'V')} .. ${formatQuantity(limits.levelV.max, 'V')}`, analyzer);
    }
    if (limits.currentA !== undefined && limits.sourceOhms !== undefined && step.level_v / limits.sourceOhms > limits.currentA) {
      refuse(where, `level ${formatQuantity(step.level_v, 'V')} can drive ${formatQuantity(step.level_v / limits.sourceOhms, 'A')} into a short`, `limits.current ${formatQuantity(limits.currentA, 'A')}`, analyzer);
    }
    if (!Number.isInteger(step.averages) || outside(step.averages, limits.averaging)) {
      refuse(where, `averaging ${step.averages}`, `limits.averaging ${limits.averaging.min} .. ${limits.averaging.max}`, analyzer);
    }
    step.points.forEach((p, k) => {
      if (outside(p.frequency_hz, limits.frequencyHz)) {
        refuse(`${where} points[${k}]`, `frequency ${formatQuantity(p.frequency_hz, 'Hz')}`, `limits.frequency ${formatQuantity(limits.frequencyHz.min, 'Hz')} .. ${formatQuantity(limits.frequencyHz.max, 'Hz')}`, analyzer);
      }
    });
    if (matrix) {
      for (const c of step.channels) {
        if (!Number.isInteger(c) || outside(c, matrix.limits.channels)) {
          refuse(where, `channel ${c}`, `limits.channels ${matrix.limits.channels.min} .. ${matrix.limits.channels.max}`, matrix);
        }
      }
      if (step.channels.length === 0) {
        throw new LimitError(`${planFile}: ${where}: closes no channel; a switched run needs the step's channels (or run it with --operator)`, 'channels');
      }
    }
  });
}
