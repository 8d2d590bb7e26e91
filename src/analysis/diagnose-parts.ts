// The best single-part explanation for each candidate part: its value fitted over six decades (a part
// from the wrong bin is a real assembly fault), an open and a short, whichever misses the readings least.
import type { PartChange } from './diagnose-change.js';
import type { MisfitMeter } from './diagnose-misfit.js';
import type { ReadingModel } from './diagnose-model.js';
import { scanAndRefine } from './diagnose-search.js';

export interface PartFit {
  /** Index into model.parts. */
  part: number;
  change: PartChange;
  misfit: number;
}

/** log10 of the value scale searched: 1e-3 to 1e3 of the placed value. */
const LOG_SCALE_RANGE = 3;
const STEPS_PER_DECADE = 10;
/**
 * An open or a short is preferred to a fitted value that misses no better by more than this (relative,
 * and absolute in misfit units): at the ends of the range a value fit imitates them, with no meaning.
 */
const SIMPLER_RELATIVE = 0.05;
const SIMPLER_ABSOLUTE = 0.1;

export function fitPart(model: ReadingModel, meter: MisfitMeter, part: number): PartFit {
  const scratch = new Float64Array(2 * model.scan.readings.length);
  const misfitOf = (change: PartChange) => {
    model.predict(part, change, scratch);
    return meter.of(scratch);
  };
  const valueFit = scanAndRefine(
    (x) => misfitOf({ kind: 'scale', scale: 10 ** x }),
    -LOG_SCALE_RANGE,
    LOG_SCALE_RANGE,
    2 * LOG_SCALE_RANGE * STEPS_PER_DECADE,
  );
  const value: PartFit = { part, change: { kind: 'scale', scale: 10 ** valueFit.x }, misfit: valueFit.value };
  const margin = Math.max(SIMPLER_RELATIVE * value.misfit, SIMPLER_ABSOLUTE);
  let best = value;
  for (const change of [{ kind: 'open' }, { kind: 'short' }] as const) {
    const misfit = misfitOf(change);
    if (misfit > value.misfit + margin) continue;
    if (best === value || misfit < best.misfit) best = { part, change, misfit };
  }
  return best;
}

/** fitPart for every part of the model, best first. */
export function fitParts(model: ReadingModel, meter: MisfitMeter, skip: ReadonlySet<number> = new Set()): PartFit[] {
  const fits: PartFit[] = [];
  for (let k = 0; k < model.parts.length; k++) if (!skip.has(k)) fits.push(fitPart(model, meter, k));
  return fits.sort((a, b) => a.misfit - b.misfit);
}
