// How long a plan takes, from the instrument profiles' timing: a settle each time the contacts change
// (plus the probe move an operator needs), a settle after each frequency change, and per reading the
// measurement time plus the time per average.
import type { OperationCount } from './step-order.js';
import type { PlanStep, ScanPlan } from './types.js';

/** Command and answer turnaround per reading and per frequency change on the line (about 1 ms each). */
export const COMMAND_TURNAROUND_S = 1e-3;

export function estimateDuration(steps: readonly PlanStep[], counts: OperationCount, timing: ScanPlan['timing']): number {
  const readings = steps.reduce((s, step) => s + step.points.length * (timing.measurement_s + step.averages * timing.per_average_s + COMMAND_TURNAROUND_S), 0);
  // Break before make: every contact change is an open and a close, each operating the relays and
  // settling (the runner confirms both by query before it goes on).
  const contacts = counts.contact_changes * (4 * timing.settle_after_relay_s + (timing.probe_move_s ?? 0));
  return readings + contacts + counts.frequency_changes * (timing.settle_after_frequency_s + COMMAND_TURNAROUND_S);
}
