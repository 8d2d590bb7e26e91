// Public face of the plan stage: derive a scan plan from a board, write it, read it back, judge readings.
export { derivePlan, DEFAULT_AVERAGES, DEFAULT_FLOOR, DEFAULT_SAMPLES, type BandMethod, type DerivedPlan, type PlanRequest } from './derive-plan.js';
export { loadPlan, parsePlanText, PlanError } from './read-plan.js';
export { planText, writePlan } from './write-plan.js';
export { boardHash } from './board-hash.js';
export { magnitudeInBand, phaseArcWidth, phaseInBand, readingInBand, wrapDegrees } from './band-membership.js';
export { PlanDerivationError, PlanLimitError } from './plan-errors.js';
export * from './types.js';
