// What is left to do: the plan's steps in order, each with the points not yet in the log. A fresh run has
// every point; a resumed one skips exactly the (step, point) pairs already logged, wherever they are, so
// nothing is read twice and nothing is left out.
import type { PlanPoint, PlanStep, ScanPlan } from '../plan/types.js';

export interface PendingPoint {
  /** 1-based position within the step (the log's `point`). */
  point: number;
  data: PlanPoint;
}

export interface PendingStep {
  step: PlanStep;
  points: PendingPoint[];
}

/** The key a reading is known by in the log and in a resume. */
export const readingKey = (step: number, point: number): string => `${step}:${point}`;

export function pendingWork(plan: ScanPlan, done: ReadonlySet<string> = new Set()): PendingStep[] {
  const work: PendingStep[] = [];
  for (const step of plan.steps) {
    const pending = pendingOfStep(step, done);
    if (pending.points.length > 0) work.push(pending);
  }
  return work;
}

/** One step's points still to read; made when the step runs, so a huge plan is never copied whole. */
export function pendingOfStep(step: PlanStep, done: ReadonlySet<string>): PendingStep {
  const points: PendingPoint[] = [];
  step.points.forEach((data, i) => {
    if (!done.has(readingKey(step.step, i + 1))) points.push({ point: i + 1, data });
  });
  return { step, points };
}

export function totalReadings(plan: ScanPlan): number {
  let n = 0;
  for (const step of plan.steps) n += step.points.length;
  return n;
}
