// The bands against the simulated bench, which computes its readings from the board as built, through
// relay contacts, strays and leads, with noise, and never sees the plan: a board built exactly to its
// nominal values must read inside every band (the measurement floor covers the fixture), and a board
// with a wrong part must not.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard, type Board } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import { FixtureMap } from '../../src/instruments/fixture-map.js';
import { readingInBand } from '../../src/plan/band-membership.js';
import { DEFAULT_FLOOR, derivePlan, type PlanRequest } from '../../src/plan/derive-plan.js';
import type { ScanPlan } from '../../src/plan/types.js';
import { BenchPhysics } from '../../simulators/bench-physics.js';
import { buildBoardAsBuilt } from '../../simulators/board-as-built.js';
import { parseFaults } from '../../simulators/faults.js';
import { ROOT } from '../support/run-cli.js';

const request = (bands: PlanRequest['bands']): PlanRequest => ({
  modes: {},
  neighbours: true,
  transfer: true,
  bands,
  floor: DEFAULT_FLOOR,
  analyzer: { name: 'generic-analyzer', profile: builtinProfile('generic-analyzer') as AnalyzerProfile },
  switch: { name: 'generic-switch', profile: builtinProfile('generic-switch') as SwitchProfile },
  averages: 4,
});

/** Readings outside their band when the simulated bench measures `board` with `faults` through the plan. */
function outside(plan: ScanPlan, board: Board, faults: string[]): { step: number; purpose: string; node: string }[] {
  let closed = new Set<number>();
  const physics = new BenchPhysics(buildBoardAsBuilt(board, parseFaults(faults, board)), new FixtureMap(plan.fixture, 'plan'), () => closed);
  const out: { step: number; purpose: string; node: string }[] = [];
  for (const step of plan.steps) {
    closed = new Set(step.channels);
    for (const p of step.points) {
      const z = physics.measure({ frequencyHz: p.frequency_hz, level: step.level_v, averages: step.averages, function: step.kind === 'transfer' ? 'transfer' : 'impedance' });
      if (z === 'overload' || !readingInBand(z.re, z.im, p.band)) out.push({ step: step.step, purpose: step.purpose, node: step.sense ?? step.hi });
    }
  }
  return out;
}

describe.each(['chain-24', 'corner-8x8'])('%s through the simulated bench', (name) => {
  const board = loadBoard(path.join(ROOT, `shared/boards/${name}.yaml`));
  const { plan } = derivePlan(board, request({ method: 'monte-carlo', samples: name === 'chain-24' ? 200 : 60, seed: 1 }));

  it('as designed: every reading inside its band', () => {
    expect(outside(plan, board, [])).toEqual([]);
  });

  it('with the first tank inductor 40 % high: readings leave their bands', () => {
    const ref = board.parts.find((p) => p.kind === 'L')!.ref;
    expect(outside(plan, board, [`${ref}=${board.parts.find((p) => p.ref === ref)!.value * 1.4}`]).length).toBeGreaterThan(5);
  });
});
