// Scan plans built in the test from the engine's nominal prediction, with bands of ±5 % in magnitude and
// ±3° in phase around it: self-contained plans (ScanPlan, src/plan/types.ts) for exercising the runner
// independently of the planner's band making.
import { GROUND, type Board } from '../../../src/board/types.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { defaultFixtureMap } from '../../../src/instruments/fixture-map.js';
import { profileFrom, type AnalyzerProfile } from '../../../src/instruments/index.js';
import { oneTwoFiveAtMost } from '../../../src/plan/excitation-level.js';
import { boardHash } from '../../../src/plan/board-hash.js';
import { writePlan } from '../../../src/plan/write-plan.js';
import { PLAN_FORMAT, type PlanStep, type ReadingBand, type ScanPlan, type StepKind } from '../../../src/plan/types.js';

export interface TestStepSpec {
  kind?: StepKind;
  hi: string;
  lo?: string;
  sense?: string;
}

export interface TestPlanOptions {
  frequencies: number[];
  steps: TestStepSpec[];
  /** Relative half-width of the magnitude band; default 0.05. */
  magnitude?: number;
  /** Half-width of the phase arc in degrees; default 3. */
  phaseDeg?: number;
  level_v?: number;
  averages?: number;
  settle_s?: number;
  analyzer?: string;
  switchMatrix?: string | null;
}

const DEG = 180 / Math.PI;
const wrap = (d: number) => ((((d + 180) % 360) + 360) % 360) - 180;

export function bandAround(re: number, im: number, magnitude: number, phaseDeg: number): ReadingBand {
  const mag = Math.hypot(re, im);
  const phase = Math.atan2(im, re) * DEG;
  return { mag_lo_ohm: mag * (1 - magnitude), mag_hi_ohm: mag * (1 + magnitude), phase_lo_deg: wrap(phase - phaseDeg), phase_hi_deg: wrap(phase + phaseDeg) };
}

export function testPlan(board: Board, o: TestPlanOptions): ScanPlan {
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const fixture = defaultFixtureMap(board);
  const magnitude = o.magnitude ?? 0.05;
  const phaseDeg = o.phaseDeg ?? 3;
  const operator = o.switchMatrix === null;
  // Without an explicit level, each step gets what the planner would allow: at most 100 mV, and no more
  // current into the step's lowest predicted drive impedance than the analyzer's limit (the runner refuses
  // a plan beyond it).
  const analyzer = profileFrom(o.analyzer ?? 'generic-analyzer') as AnalyzerProfile;
  const levelFor = (hi: string, lo: string) => {
    if (o.level_v !== undefined) return o.level_v;
    const { currentA, levelV } = analyzer.limits;
    if (currentA === undefined) return 0.1;
    const driveOhm = (f: number) => {
      const z = lo === GROUND ? solver.at(f).toGround(hi) : solver.at(f).between(hi, lo);
      return Math.hypot(z.re, z.im);
    };
    const drive = Math.min(...o.frequencies.map(driveOhm));
    return Math.max(levelV.min, Math.min(0.1, oneTwoFiveAtMost(currentA * drive)));
  };
  const steps: PlanStep[] = o.steps.map((spec, i) => {
    const kind = spec.kind ?? (spec.sense ? 'transfer' : spec.lo && spec.lo !== GROUND ? 'two-point' : 'to-ground');
    const lo = spec.lo ?? GROUND;
    // An operator-probed plan closes no channels and carries no fixture map, as the planner writes it.
    const channels = operator ? [] : [fixture.channel(spec.hi, 'hi')!, fixture.channel(lo, 'lo')!, ...(spec.sense ? [fixture.channel(spec.sense, 'sense')!] : [])];
    return {
      step: i + 1,
      kind,
      purpose: kind === 'transfer' ? 'transfer' : 'sweep',
      hi: spec.hi,
      lo,
      ...(spec.sense ? { sense: spec.sense } : {}),
      channels,
      level_v: levelFor(spec.hi, lo),
      averages: o.averages ?? 1,
      settle_s: o.settle_s ?? 0,
      points: o.frequencies.map((f) => {
        const at = solver.at(f);
        const z = kind === 'transfer' ? at.transfer(spec.hi, spec.sense!) : kind === 'two-point' ? at.between(spec.hi, lo) : at.toGround(spec.hi);
        return { frequency_hz: f, pred_re: z.re, pred_im: z.im, band: bandAround(z.re, z.im, magnitude, phaseDeg) };
      }),
    };
  });
  const readings = steps.reduce((n, s) => n + s.points.length, 0);
  return {
    format: PLAN_FORMAT,
    created: '2025-01-01T00:00:00.000Z',
    software: 'topoprobe test plan',
    board: { name: board.name, hash: boardHash(board), snapshot: board },
    instruments: { analyzer: o.analyzer ?? 'generic-analyzer', switch: o.switchMatrix === undefined ? 'generic-switch' : o.switchMatrix },
    fixture: operator ? { nodes: {}, gnd: {} } : fixture.toData(),
    modes: [],
    bands: { method: 'first-order', coverage: 0.95 },
    timing: { settle_after_relay_s: 0.005, settle_after_frequency_s: 0.001, measurement_s: 0.02, per_average_s: 0.005 },
    estimate: { duration_s: 0, readings, relay_operations: 0, frequency_changes: 0 },
    steps,
  };
}

/** Writes the plan with the planner's own writer, so the runner reads exactly what the planner writes. */
export function savePlan(file: string, plan: ScanPlan): string {
  return writePlan(plan, file);
}
