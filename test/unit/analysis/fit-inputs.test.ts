// Bad input to the fit: every problem is one line naming the field or the reading, with exit code 2
// (the product's rule for bad input); readings that cannot be used are listed, never silently lost.
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { FitError, fitBoard, type FitOptions, type FitSpec } from '../../../src/analysis/fit.js';
import type { Reading } from '../../../src/analysis/readings.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const solver = new ImpedanceSolver(new GroundedLaplacian(chain));

function reading(hi: string, f: number, extra: Partial<Reading> = {}): Reading {
  const z = solver.at(f).toGround(hi);
  return { step: 4, point: 7, kind: 'to-ground', hi, lo: 'gnd', frequency_hz: f, re: z.re, im: z.im, pred_re: z.re, pred_im: z.im, flag: 'ok', ...extra };
}

const good: Reading[] = [130e3, 150e3, 170e3].flatMap((f) => ['n1', 'n2', 'n5'].map((n) => reading(n, f)));

function failure(run: () => unknown): FitError {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(FitError);
    const e = error as FitError;
    expect(e.exitCode).toBe(2);
    expect(e.message).not.toMatch(/\n/);
    return e;
  }
  throw new Error('expected a FitError');
}

const fit = (spec: FitSpec, readings: Reading[] = good, options: FitOptions = {}) => () => fitBoard(chain, readings, spec, options);

describe('fit spec problems', () => {
  it('names a part that is not on the board, with the likely one', () => {
    const e = failure(fit({ parts: ['C_intra_3', 'C_intr_3'] }));
    expect(e.message).toBe('fit spec: parts[1]: no part "C_intr_3" on board chain-24 (did you mean C_intra_3?)');
  });
  it('refuses a part named twice', () => {
    expect(failure(fit({ parts: ['L_tanka_0', 'L_tanka_0'] })).message).toMatch(/parts\[1\]: L_tanka_0 is named twice/);
  });
  it('refuses a scale on top of all parts', () => {
    expect(failure(fit({ allParts: true, capacitanceScale: true })).message).toMatch(/^fit spec: capacitanceScale cannot be combined with allParts/);
  });
  it('refuses an empty spec', () => {
    expect(failure(fit({})).message).toMatch(/^fit spec: nothing to fit/);
  });
  it('refuses a Q at no frequency', () => {
    expect(failure(fit({ inductorResistance: { form: 'q', atHz: 0 } })).message).toMatch(/^fit spec: inductorResistance\.atHz/);
  });
  it('refuses a scale with nothing left to scale', () => {
    const tankBoard = loadBoard('shared/boards/tank-3.json');
    const e = failure(() => fitBoard(tankBoard, [], { inductanceScale: true, parts: ['L1', 'L2', 'L3'] }));
    expect(e.message).toMatch(/inductanceScale: board tank-3 has no inductor left to scale/);
  });
});

describe('reading problems', () => {
  it('names the reading and the node that is not on the board', () => {
    const e = failure(fit({ capacitanceScale: true }, [...good, { ...good[0], hi: 'n99', step: 9, point: 2 }]));
    expect(e.message).toBe('reading 10 (step 9, point 2): hi: node "n99" is not on board chain-24');
  });
  it('refuses a to-ground reading whose lo is a node', () => {
    expect(failure(fit({ capacitanceScale: true }, [{ ...good[0], lo: 'n3' }])).message).toMatch(/reading 1 .*lo = gnd/);
  });
  it('refuses a transfer reading without a sensed node', () => {
    expect(failure(fit({ capacitanceScale: true }, [{ ...good[0], kind: 'transfer' }])).message).toMatch(/reading 1 .*: sense names no node/);
  });
  it('refuses a frequency that is not above zero', () => {
    expect(failure(fit({ capacitanceScale: true }, [{ ...good[0], frequency_hz: -5 }])).message).toMatch(/frequency_hz must be/);
  });
  it('says when no reading is usable, and why', () => {
    const invalid = good.map((r) => ({ ...r, flag: 'invalid' as const }));
    expect(failure(fit({ capacitanceScale: true }, invalid)).message).toBe(
      'readings: none can be used for the fit (9 left out, e.g. reading 1: flagged invalid)',
    );
  });
  it('says when the readings are too few for the parameters', () => {
    const e = failure(fit({ parts: ['C_intra_0', 'C_inter_0', 'L_tanka_0'] }, good.slice(0, 1)));
    expect(e.message).toMatch(/1 usable readings give 2 residuals, not more than the 3 parameters/);
  });
  it('lists the readings it leaves out and fits with the rest', () => {
    const readings = [...good, { ...good[0], flag: 'invalid' as const }, { ...good[1], re: 0, im: 0 }, { ...good[2], re: Number.NaN }];
    const result = fitBoard(chain, readings, { capacitanceScale: true }, { noise: { relative: 1e-3 } });
    expect(result.readings.used).toBe(good.length);
    expect(result.readings.skipped.map((s) => [s.index, s.why])).toEqual([
      [9, 'flagged invalid'],
      [10, 'value is zero (log |Z| undefined)'],
      [11, 'value is not finite'],
    ]);
    // The readings are the nominal board's own, so the scale stays at 1.
    expect(result.parameters[0].value).toBeCloseTo(1, 9);
  });
});

describe('option problems', () => {
  it('refuses a negative noise', () => {
    expect(failure(fit({ capacitanceScale: true }, good, { noise: { relative: -1 } })).message).toMatch(/^fit options: noise\.relative/);
  });
  it('refuses an iteration limit that is not a whole number', () => {
    expect(failure(fit({ capacitanceScale: true }, good, { maxIterations: 2.5 })).message).toMatch(/^fit options: maxIterations/);
  });
});
