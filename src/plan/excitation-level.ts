// The excitation level of every step, within the analyzer's limits and the parts' ratings.
// Checked per step against its loads (excitation-loads.ts):
//   level within the profile's limits.level;
//   level / source resistance (the current into a short, as the analyzer driver checks it) and
//   level / |Z_drive| (the current into the lowest predicted impedance of the step; the larger of the
//   two for a passive board) within limits.current;
//   level × (largest part voltage per volt) within each rated part's rating.
// An explicit --level is used for every step and refused with one line naming the limit it breaks.
// Without it, each step gets the largest level of the 1-2-5 sequence (common practice for instrument
// settings) up to AUTO_LEVEL_V that keeps within all of them, or the analyzer's smallest level when no
// 1-2-5 value fits above it; a step that cannot be measured within its limits at all is refused.
import type { AnalyzerProfile } from '../instruments/profile-types.js';
import { formatQuantity } from '../units/quantity.js';
import type { ReadingLoad } from './excitation-loads.js';
import { PlanLimitError } from './plan-errors.js';

export const AUTO_LEVEL_V = 0.1;

export interface LevelTarget {
  /** The reading each load belongs to, for messages: "n2 to ground". */
  describe: (index: number) => string;
}

export function chooseLevels(loads: readonly ReadingLoad[], analyzer: AnalyzerProfile, explicit: number | undefined, target: LevelTarget): number[] {
  const { levelV, currentA, sourceOhms } = analyzer.limits;
  const where = `of ${analyzer.file}`;
  const f = (v: number, unit: 'V' | 'A' | 'ohm' | 'Hz') => formatQuantity(v, unit);
  if (explicit !== undefined) {
    if (explicit < levelV.min) throw new PlanLimitError(`--level ${f(explicit, 'V')}: below the analyzer's limits.level.min = ${f(levelV.min, 'V')} ${where}`);
    if (explicit > levelV.max) throw new PlanLimitError(`--level ${f(explicit, 'V')}: above the analyzer's limits.level.max = ${f(levelV.max, 'V')} ${where}`);
    if (currentA !== undefined && sourceOhms !== undefined && explicit / sourceOhms > currentA) {
      throw new PlanLimitError(`--level ${f(explicit, 'V')}: can drive ${f(explicit / sourceOhms, 'A')} into a short through the ${f(sourceOhms, 'ohm')} source, above limits.current = ${f(currentA, 'A')} ${where}`);
    }
    loads.forEach((load, i) => {
      if (currentA !== undefined && explicit / load.minDriveOhm > currentA) {
        throw new PlanLimitError(
          `--level ${f(explicit, 'V')}: drives ${f(explicit / load.minDriveOhm, 'A')} into ${target.describe(i)} at ${f(load.minDriveAt, 'Hz')} (predicted |Z| ${f(load.minDriveOhm, 'ohm')}), above the analyzer's limits.current = ${f(currentA, 'A')} ${where}; lower --level to ${f(currentA * load.minDriveOhm, 'V')} or less, or leave it out to let each step get a level within the limits`,
        );
      }
      if (explicit > load.ratedLevel) {
        throw new PlanLimitError(
          `--level ${f(explicit, 'V')}: puts ${f(explicit * load.ratedRatio, 'V')} across ${load.ratedPart} (rating ${f(load.ratedRating, 'V')}) when reading ${target.describe(i)} at ${f(load.ratedAt, 'Hz')}; lower --level to ${f(load.ratedLevel, 'V')} or less, or leave it out`,
        );
      }
    });
    return loads.map(() => explicit);
  }
  return loads.map((load, i) => {
    let cap = Math.min(AUTO_LEVEL_V, levelV.max, load.ratedLevel);
    let binding = cap === load.ratedLevel ? `the rating of ${load.ratedPart} at ${f(load.ratedAt, 'Hz')}` : '';
    if (currentA !== undefined) {
      const byDrive = currentA * load.minDriveOhm;
      if (byDrive < cap) {
        cap = byDrive;
        binding = `limits.current = ${f(currentA, 'A')} ${where} into ${f(load.minDriveOhm, 'ohm')} at ${f(load.minDriveAt, 'Hz')}`;
      }
      if (sourceOhms !== undefined && currentA * sourceOhms < cap) cap = currentA * sourceOhms;
    }
    if (cap < levelV.min) {
      throw new PlanLimitError(`no level the analyzer can set (limits.level.min = ${f(levelV.min, 'V')} ${where}) keeps ${target.describe(i)} within ${binding}`);
    }
    return Math.max(levelV.min, oneTwoFiveAtMost(cap));
  });
}

/** The largest 1, 2 or 5 times a power of ten that is at most `cap`. */
export function oneTwoFiveAtMost(cap: number): number {
  const decade = 10 ** Math.floor(Math.log10(cap));
  // Guard against log10 landing a hair low or high on exact values.
  for (const d of [decade * 10, decade, decade / 10]) {
    for (const m of [5, 2, 1]) {
      const v = Number((m * d).toPrecision(12));
      if (v <= cap * (1 + 1e-12)) return v;
    }
  }
  return cap;
}
