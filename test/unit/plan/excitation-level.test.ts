// Excitation levels: the 1-2-5 sequence of instrument settings (common practice) and the limits.
import { describe, expect, it } from 'vitest';
import { builtinProfile, type AnalyzerProfile } from '../../../src/instruments/index.js';
import { chooseLevels, oneTwoFiveAtMost } from '../../../src/plan/excitation-level.js';
import type { ReadingLoad } from '../../../src/plan/excitation-loads.js';
import { PlanLimitError } from '../../../src/plan/plan-errors.js';

const analyzer = builtinProfile('generic-analyzer') as AnalyzerProfile; // 5 mV .. 1 V, 20 mA, 50 Ω source
const load = (minDriveOhm: number, ratedLevel = Infinity): ReadingLoad => ({
  minDriveOhm,
  minDriveAt: 1e5,
  worstRatio: 1,
  worstPart: 'C1',
  ratedLevel,
  ratedPart: ratedLevel < Infinity ? 'C9' : '',
  ratedAt: 1e5,
  ratedRating: 1,
  ratedRatio: ratedLevel < Infinity ? 1 / ratedLevel : 0,
});
const describeIt = { describe: (i: number) => `reading ${i}` };

describe('oneTwoFiveAtMost', () => {
  it.each([
    [0.1, 0.1],
    [0.0999, 0.05],
    [0.0098, 0.005],
    [1, 1],
    [0.0025, 0.002],
    [0.019, 0.01],
    [7e-7, 5e-7],
  ])('%d -> %d', (cap, level) => expect(oneTwoFiveAtMost(cap)).toBe(level));
});

describe('chooseLevels', () => {
  it('gives each step the highest 1-2-5 level up to 100 mV within I = V/|Z| ≤ 20 mA', () => {
    // 1 kΩ allows 20 V (capped at 100 mV); 2 Ω allows 40 mV -> 20 mV; 0.3 Ω allows 6 mV -> 5 mV.
    expect(chooseLevels([load(1000), load(2), load(0.3)], analyzer, undefined, describeIt)).toEqual([0.1, 0.02, 0.005]);
  });

  it('takes a part rating into account', () => {
    expect(chooseLevels([load(1000, 0.03)], analyzer, undefined, describeIt)).toEqual([0.02]);
  });

  it('refuses a step no settable level can measure within the current limit', () => {
    // 0.2 Ω: 20 mA needs at most 4 mV, below the analyzer's 5 mV.
    expect(() => chooseLevels([load(0.2)], analyzer, undefined, describeIt)).toThrow(PlanLimitError);
    expect(() => chooseLevels([load(0.2)], analyzer, undefined, describeIt)).toThrow(/keeps reading 0 within limits\.current = 20 mA/);
  });

  it('uses an explicit level everywhere, or refuses it naming the limit', () => {
    expect(chooseLevels([load(1000), load(2)], analyzer, 0.02, describeIt)).toEqual([0.02, 0.02]);
    expect(() => chooseLevels([load(1000), load(2)], analyzer, 0.05, describeIt)).toThrow(/drives 25 mA into reading 1 .* limits\.current = 20 mA/);
  });
});
