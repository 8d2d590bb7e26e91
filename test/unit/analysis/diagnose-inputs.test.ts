// What the diagnosis does with what it is given: invalid readings left out, a clean board called as
// designed, and every bad reading or option refused with one line naming it (exit code 2, as the
// project's error contract asks for bad input).
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { diagnose, DiagnoseError } from '../../../src/analysis/diagnose.js';
import type { Reading } from '../../../src/analysis/readings.js';
import { scanReadings } from '../../bench/diagnose-scan.util.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const FREQUENCIES = [131e3, 163.6e3, 204.5e3];

function refusal(run: () => unknown): DiagnoseError {
  try {
    run();
  } catch (err) {
    if (err instanceof DiagnoseError) return err;
    throw err;
  }
  throw new Error('expected a DiagnoseError');
}

describe('diagnose inputs', () => {
  const good = scanReadings(chain, { faults: ['C_intra_3=open'], frequencies: FREQUENCIES, seed: 3 });

  it('leaves readings flagged invalid out, whatever they hold', () => {
    const wild: Reading[] = good.map((r, i) => (i % 10 === 0 ? { ...r, re: Number.NaN, im: 1e12, flag: 'invalid' } : r));
    const d = diagnose(chain, wild);
    const invalid = wild.filter((r) => r.flag === 'invalid').length;
    expect(d.readings).toEqual({ used: wild.length - invalid, skipped: invalid });
    expect(d.candidates[0].ref).toBe('C_intra_3');
  });

  it('calls a fault-free board as designed', () => {
    const d = diagnose(chain, scanReadings(chain, { frequencies: FREQUENCIES, seed: 4 }));
    expect(d.verdict).toBe('as-designed');
    expect(d.nominalMisfit).toBeLessThan(3);
  });

  it('gives the same ranking with the refactoring reference as with rank-one updates', () => {
    const parts = ['C_intra_2', 'C_intra_3', 'C_inter_3', 'L_tanka_3', 'L_tankb_3'];
    const fast = diagnose(chain, good, { parts, fixture: false });
    const reference = diagnose(chain, good, { parts, fixture: false, method: 'refactor' });
    expect(reference.candidates.map((c) => c.ref)).toEqual(fast.candidates.map((c) => c.ref));
    fast.candidates.forEach((c, i) => expect(reference.candidates[i].misfit).toBeCloseTo(c.misfit, 6));
  });

  const badReadings: [string, (r: Reading) => Reading, RegExp][] = [
    ['an unknown hi node', (r) => ({ ...r, hi: 'n99' }), /^reading step 1 point 1: hi "n99" is not a node of board chain-24$/],
    ['a negative frequency', (r) => ({ ...r, frequency_hz: -5 }), /^reading step 1 point 1: frequency_hz must be a positive number of hertz, got -5$/],
    ['a missing value', (r) => ({ ...r, re: Number.NaN }), /^reading step 1 point 1: re must be a finite number, got NaN/],
    ['a to-ground reading to a node', (r) => ({ ...r, lo: 'n2' }), /^reading step 1 point 1: a to-ground reading must have lo gnd, got "n2"$/],
    ['a transfer without sense', (r) => ({ ...r, kind: 'transfer' }), /^reading step 1 point 1: a transfer reading needs a sense node$/],
    ['a two-point reading on one node', (r) => ({ ...r, kind: 'two-point', lo: r.hi }), /^reading step 1 point 1: a two-point reading needs two different nodes/],
    ['an unknown kind', (r) => ({ ...r, kind: 'four-wire' as Reading['kind'] }), /^reading step 1 point 1: kind must be to-ground, two-point or transfer, got "four-wire"$/],
  ];
  for (const [what, spoil, message] of badReadings) {
    it(`refuses ${what} in one line naming the reading and field`, () => {
      const err = refusal(() => diagnose(chain, [spoil(good[0]), ...good.slice(1)]));
      expect(err.message).toMatch(message);
      expect(err.message).not.toContain('\n');
      expect(err.exitCode).toBe(2);
    });
  }

  it('refuses a set with nothing to diagnose', () => {
    expect(refusal(() => diagnose(chain, [])).message).toBe('no readings to diagnose');
    const allInvalid = good.map((r) => ({ ...r, flag: 'invalid' as const }));
    expect(refusal(() => diagnose(chain, allInvalid)).message).toBe(`no readings to diagnose: all ${good.length} readings are flagged invalid`);
  });

  const badOptions: [string, object, RegExp][] = [
    ['noise', { noise: 0 }, /^option noise must be/],
    ['minShare', { minShare: 1.5 }, /^option minShare must be/],
    ['noiseMisfit', { noiseMisfit: -1 }, /^option noiseMisfit must be/],
    ['limit', { limit: 0 }, /^option limit must be/],
    ['method', { method: 'guess' }, /^option method must be rank-one or refactor, got "guess"$/],
    ['parts', { parts: ['C_intra_3', 'C_nowhere'] }, /^option parts: no part "C_nowhere" on board chain-24$/],
  ];
  for (const [name, options, message] of badOptions) {
    it(`refuses a bad ${name} option`, () => {
      const err = refusal(() => diagnose(chain, good, options));
      expect(err.message).toMatch(message);
      expect(err.exitCode).toBe(2);
    });
  }
});
