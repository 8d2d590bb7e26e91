// How long a plan takes, from the instrument profiles' timing: a settle each time the contacts change
// (plus the probe move an operator needs), a settle after each frequency change, and per reading the
// measurement time plus the time per average.
import type { OperationCount } from './step-order.js';
import type { PlanStep, ScanPlan } from './types.js';

export function estimateDuration(steps: readonly PlanStep[], counts: OperationCount, timing: ScanPlan['timing']): number {
  const readings = steps.reduce((s, step) => s + step.points.length * (timing.measurement_s + step.averages * timing.per_average_s), 0);
  const contacts = counts.contact_changes * (timing.settle_after_relay_s + (timing.probe_move_s ?? 0));
  return readings + contacts + counts.frequency_changes * timing.settle_after_frequency_s;
}
