// A plan written and read back is the same plan, byte for byte when written again.
import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile } from '../../src/instruments/index.js';
import { DEFAULT_FLOOR, derivePlan } from '../../src/plan/derive-plan.js';
import { loadPlan, parsePlanText, PlanError } from '../../src/plan/read-plan.js';
import { planText, writePlan } from '../../src/plan/write-plan.js';
import { ROOT } from '../support/run-cli.js';

describe('writePlan -> loadPlan', () => {
  const board = loadBoard(path.join(ROOT, 'test/fixtures/plans/pair-board.yaml'));
  const { plan } = derivePlan(board, {
    modes: {},
    neighbours: true,
    transfer: true,
    bands: { method: 'monte-carlo', samples: 25, seed: 9 },
    floor: DEFAULT_FLOOR,
    analyzer: { name: 'generic-analyzer', profile: builtinProfile('generic-analyzer') as AnalyzerProfile },
    switch: null,
    averages: 8,
    created: '2026-01-01T00:00:00.000Z',
  });
  const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-round-trip-'));
  const file = path.join(dir, 'pair.plan.json');
  writePlan(plan, file);

  it('reads back exactly what was written', () => {
    expect(loadPlan(file)).toEqual(JSON.parse(JSON.stringify(plan)));
  });

  it('writes the same text again from what it read', () => {
    expect(planText(loadPlan(file))).toBe(readFileSync(file, 'utf8'));
  });

  it('leaves no temporary file behind', () => {
    expect(readdirSync(dir)).toEqual(['pair.plan.json']);
  });

  it('keeps every number exact: 0.1 + 0.2 stays 0.30000000000000004', () => {
    const edited = JSON.parse(readFileSync(file, 'utf8'));
    edited.steps[0].points[0].pred_re = 0.1 + 0.2;
    writePlan(edited, file);
    expect(loadPlan(file).steps[0].points[0].pred_re).toBe(0.30000000000000004);
  });

  it('refuses text that is not a plan with a PlanError listing the problems', () => {
    expect(() => parsePlanText('{"format": "topoprobe-plan/1"}', 'x.json')).toThrow(PlanError);
    try {
      parsePlanText('{"format": "topoprobe-plan/1"}', 'x.json');
    } catch (err) {
      const problems = (err as PlanError).problems.map((p) => p.path);
      expect(problems).toEqual(expect.arrayContaining(['created', 'software', 'board', 'steps']));
    }
  });
});
