// Before anything is sent: every setting the plan will ask for must sit inside the limits of the profiles
// in use (frequency, level, the current the level can drive into a short, averaging, channels), and inside
// what the plan itself says about the board: the current its own predicted impedances draw at that level,
// and the rating of a part that sits straight across the terminals (it sees the whole level). A plan that
// asks for more, made so or edited by hand, is refused with one line naming the step, the value and the
// limit. Exit 2. Only the plan's numbers are used (Ohm's law on its predictions, and the voltage per volt
// of level the planner predicted across the rated part that binds each step), no physics of its own.
import { GROUND, type Part } from '../board/types.js';
import { LimitError, type AnalyzerProfile, type SwitchProfile } from '../instruments/index.js';
import type { PlanStep, ScanPlan } from '../plan/types.js';
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
    if (limits.currentA !== undefined) {
      const worst = highestPredictedCurrent(step);
      // The planner keeps level / |Z| at or below the limit; the margin only absorbs rounding.
      if (worst !== undefined && worst.amps > limits.currentA * (1 + 1e-9)) {
        refuse(
          `${where} points[${worst.point}]`,
          `level ${formatQuantity(step.level_v, 'V')} drives ${formatQuantity(worst.amps, 'A')} into the predicted ${formatQuantity(worst.ohms, 'ohm')} of ${step.hi} to ${step.lo} at ${formatQuantity(step.points[worst.point].frequency_hz, 'Hz')}`,
          `limits.current ${formatQuantity(limits.currentA, 'A')}`,
          analyzer,
        );
      }
    }
    for (const part of partsAcrossTerminals(plan, step)) {
      if (part.rating_v !== undefined && step.level_v > part.rating_v * (1 + 1e-9)) {
        throw new LimitError(
          `${planFile}: ${where}: level ${formatQuantity(step.level_v, 'V')} is across ${part.ref} (${part.nodes.join(' to ')}), above its rating ${formatQuantity(part.rating_v, 'V')} in the plan's board; nothing was sent`,
          'rating',
        );
      }
    }
    if (step.rated) {
      const part = plan.board.snapshot.parts.find((p) => p.ref === step.rated!.part);
      const across = step.level_v * step.rated.volts_per_volt;
      if (part?.rating_v !== undefined && across > part.rating_v * (1 + 1e-9)) {
        throw new LimitError(
          `${planFile}: ${where}: level ${formatQuantity(step.level_v, 'V')} puts ${formatQuantity(across, 'V')} across ${part.ref} (the plan's own prediction, ${step.rated.volts_per_volt.toPrecision(3)} V per volt), above its rating ${formatQuantity(part.rating_v, 'V')}; nothing was sent`,
          'rating',
        );
      }
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

/**
 * The largest level / |predicted Z| over a step's points, for readings whose prediction is the impedance the
 * analyzer drives (to ground, two-point). A transfer reading's prediction is a transimpedance, not the load.
 */
function highestPredictedCurrent(step: PlanStep): { amps: number; ohms: number; point: number } | undefined {
  if (step.kind === 'transfer') return undefined;
  let worst: { amps: number; ohms: number; point: number } | undefined;
  step.points.forEach((p, k) => {
    const ohms = Math.hypot(p.pred_re, p.pred_im);
    const amps = step.level_v / ohms;
    if (!(amps <= (worst?.amps ?? 0))) worst = { amps, ohms, point: k };
  });
  return worst;
}

/** Parts whose two ends are the step's HI and LO terminals: the whole level stands across them. */
function partsAcrossTerminals(plan: ScanPlan, step: PlanStep): Part[] {
  const lo = step.kind === 'two-point' ? step.lo : GROUND;
  return plan.board.snapshot.parts.filter((p) => (p.nodes[0] === step.hi && p.nodes[1] === lo) || (p.nodes[1] === step.hi && p.nodes[0] === lo));
}
