// From a board and the plan options to a complete scan plan: modes of interest -> readings and their
// frequency grid -> limits and excitation -> tolerance bands -> channels -> step order -> estimate.
// Cheap checks (frequencies, averaging, channels, levels) come before the Monte Carlo, so a refusal is quick.
import type { Board } from '../board/types.js';
import { GroundedLaplacian } from '../circuit/laplacian.js';
import { defaultFixtureMap, type FixtureMap } from '../instruments/fixture-map.js';
import type { AnalyzerProfile, SwitchProfile } from '../instruments/profile-types.js';
import { firstOrderSpreads, QUADRATURE_COVERAGE, type Combination } from '../predict/tolerance-first-order.js';
import { UnsolvableReadingError, type ReadingRequest } from '../predict/tolerance-evaluate.js';
import { envelopeCoverage, monteCarloSpreads } from '../predict/tolerance-monte-carlo.js';
import { drawToleranceSamples, TOLERANCE_DISTRIBUTION } from '../predict/tolerance-samples.js';
import type { PointSpread } from '../predict/tolerance-spread.js';
import type { FrequencyWindow } from '../predict/tolerance-mode-window.js';
import { formatQuantity } from '../units/quantity.js';
import { VERSION } from '../version.js';
import { DEFAULT_GRID, type GridOptions } from './adaptive-grid.js';
import { boardHash } from './board-hash.js';
import { deriveReadings, type PlannedReading } from './derive-readings.js';
import { estimateDuration } from './estimate.js';
import { chooseLevels } from './excitation-level.js';
import { readingLoads } from './excitation-loads.js';
import { PlanDerivationError, PlanLimitError } from './plan-errors.js';
import { bandFromSpread } from './reading-band.js';
import { modesOfInterest, type ModeQueryOptions } from './select-modes.js';
import { stepChannels, terminalsOf } from './step-channels.js';
import { countOperations, orderSteps } from './step-order.js';
import { PLAN_FORMAT, type BandFloor, type PlanStep, type ScanPlan } from './types.js';

export type BandMethod = { method: 'monte-carlo'; samples: number; seed: number } | { method: 'first-order'; combine: Combination };

export interface PlanRequest {
  modes: ModeQueryOptions;
  neighbours: boolean;
  transfer: boolean;
  bands: BandMethod;
  floor: BandFloor;
  analyzer: { name: string; profile: AnalyzerProfile };
  /** null: operator-probed, no switch matrix. */
  switch: { name: string; profile: SwitchProfile } | null;
  /** The fixture map for switched plans (default: the default map of the board). */
  fixture?: FixtureMap;
  /** An explicit level for every step; without it each step gets its own (excitation-level.ts). */
  level?: number;
  averages: number;
  grid?: GridOptions;
  /** Operator-probed plans: time assumed per probe move, for the estimate. */
  probeMoveS?: number;
  /** ISO time stamp to record (default: now). */
  created?: string;
}

/**
 * The default measurement floor: 2 % + 0.5 Ω in magnitude and 2° in phase, about what a fixture without
 * open/short compensation adds (two relay contacts and the leads in series, a few tenths of an ohm; some
 * pF of strays), so a board built to its nominal values reads inside every band. Lower it with
 * --floor-* after compensating the fixture.
 */
export const DEFAULT_FLOOR: BandFloor = { relative: 0.02, absolute_ohm: 0.5, phase_deg: 2 };
export const DEFAULT_SAMPLES = 200;
export const DEFAULT_AVERAGES = 4;
/** Hand-held probes: a moment for the contact to settle once the operator confirms. */
export const OPERATOR_SETTLE_S = 0.5;
export const DEFAULT_PROBE_MOVE_S = 10;

export interface DerivedPlan {
  plan: ScanPlan;
  /** What the summary tells the user besides the plan itself. */
  notes: { modes: string; sweepNodes: string[]; referenceNodes: string[]; windows: FrequencyWindow[]; naive: ReturnType<typeof countOperations> };
}

export function derivePlan(board: Board, request: PlanRequest): DerivedPlan {
  const laplacian = new GroundedLaplacian(board);
  const choice = modesOfInterest(board, laplacian, request.modes);
  if (choice.modes.length === 0) throw new PlanDerivationError(`${board.file}: board ${board.name} has no finite resonance to plan a scan around`);
  const set = deriveReadings(board, laplacian, choice.modes, { neighbours: request.neighbours, transfer: request.transfer, grid: request.grid ?? DEFAULT_GRID });
  const analyzer = request.analyzer.profile;
  checkFrequencies(set.readings, analyzer);
  checkAverages(request.averages, analyzer);

  const fixture = request.switch ? (request.fixture ?? defaultFixtureMap(board)) : undefined;
  const channels = request.switch && fixture ? stepChannels(set.readings.map((r) => r.reading), fixture, request.switch.profile) : set.readings.map(() => []);
  const requests: ReadingRequest[] = set.readings.map((r) => ({ reading: r.reading, frequencies: r.frequencies }));
  const loads = solving(board, () => readingLoads(laplacian, requests));
  const levels = chooseLevels(loads, analyzer, request.level, { describe: (i) => describeReading(set.readings[i]) });
  const spreads = solving(board, () => bandSpreads(laplacian, requests, request.bands));

  const settle = request.switch ? request.switch.profile.timing.settleAfterRelayMs / 1000 : OPERATOR_SETTLE_S;
  const unordered = set.readings.map((r, i) => {
    const step: PlanStep & { contacts: string[] } = {
      step: 0,
      kind: r.reading.kind,
      purpose: r.purpose,
      hi: r.reading.hi,
      lo: r.reading.lo,
      ...(r.reading.sense !== undefined ? { sense: r.reading.sense } : {}),
      channels: channels[i],
      level_v: levels[i],
      ...(loads[i].ratedPart ? { rated: { part: loads[i].ratedPart, volts_per_volt: loads[i].ratedRatio } } : {}),
      averages: request.averages,
      settle_s: settle,
      points: r.frequencies.map((f, p) => ({ frequency_hz: f, pred_re: spreads[i][p].nominal.re, pred_im: spreads[i][p].nominal.im, band: bandFromSpread(spreads[i][p], request.floor) })),
      // Operator plans move probes to terminals; switched plans close channels.
      contacts: request.switch ? channels[i].map(String) : terminalsOf(r.reading).map(([node, bus]) => `${bus}:${node}`),
    };
    return step;
  });
  const naive = countOperations(unordered);
  const ordered = orderSteps(unordered);
  const counts = countOperations(ordered);
  const steps: PlanStep[] = ordered.map(({ contacts: _contacts, ...step }, i) => ({ ...step, step: i + 1 }));

  const timing: ScanPlan['timing'] = {
    settle_after_relay_s: settle,
    settle_after_frequency_s: analyzer.timing.afterFrequencyChangeMs / 1000,
    measurement_s: analyzer.timing.measurementMs / 1000,
    per_average_s: analyzer.timing.perAverageMs / 1000,
    ...(request.switch ? {} : { probe_move_s: request.probeMoveS ?? DEFAULT_PROBE_MOVE_S }),
  };
  const plan: ScanPlan = {
    format: PLAN_FORMAT,
    created: request.created ?? new Date().toISOString(),
    software: `topoprobe ${VERSION}`,
    board: { name: board.name, hash: boardHash(board), snapshot: board },
    instruments: { analyzer: request.analyzer.name, switch: request.switch ? request.switch.name : null },
    fixture: fixture ? fixture.toData() : { nodes: {}, gnd: {} },
    modes: choice.modes.map((m) => ({ frequency_hz: m.frequency_hz, localization: m.localization, profile: m.profile })),
    bands: bandsRecord(request),
    timing,
    estimate: {
      duration_s: estimateDuration(steps, counts, timing),
      readings: counts.readings,
      relay_operations: request.switch ? counts.relay_operations : 0,
      frequency_changes: counts.frequency_changes,
      ...(request.switch ? {} : { probe_moves: counts.contact_changes }),
    },
    limits: limitsRecord(analyzer, loads, levels),
    steps,
  };
  return { plan, notes: { modes: choice.reason, sweepNodes: set.sweepNodes, referenceNodes: set.referenceNodes, windows: set.windows, naive } };
}

function bandSpreads(laplacian: GroundedLaplacian, requests: ReadingRequest[], bands: BandMethod): PointSpread[][] {
  if (bands.method === 'first-order') return firstOrderSpreads(laplacian, requests, bands.combine);
  return monteCarloSpreads(laplacian, requests, drawToleranceSamples(laplacian.board, { count: bands.samples, seed: bands.seed }));
}

function bandsRecord(request: PlanRequest): ScanPlan['bands'] {
  const b = request.bands;
  if (b.method === 'monte-carlo') {
    return { method: 'monte-carlo', samples: b.samples, seed: b.seed, coverage: envelopeCoverage(b.samples), distribution: TOLERANCE_DISTRIBUTION, floor: { ...request.floor } };
  }
  return { method: 'first-order', coverage: b.combine === 'worst-case' ? 1 : QUADRATURE_COVERAGE, distribution: TOLERANCE_DISTRIBUTION, combine: b.combine, floor: { ...request.floor } };
}

function limitsRecord(analyzer: AnalyzerProfile, loads: ReturnType<typeof readingLoads>, levels: number[]): NonNullable<ScanPlan['limits']> {
  let current = 0;
  let voltage = 0;
  let part = '';
  loads.forEach((load, i) => {
    current = Math.max(current, levels[i] / load.minDriveOhm);
    if (levels[i] * load.worstRatio > voltage) {
      voltage = levels[i] * load.worstRatio;
      part = load.worstPart;
    }
  });
  const { levelV, frequencyHz, currentA } = analyzer.limits;
  return {
    level_v: { min: levelV.min, max: levelV.max },
    frequency_hz: { min: frequencyHz.min, max: frequencyHz.max },
    ...(currentA !== undefined ? { current_a: currentA } : {}),
    highest_current_a: current,
    highest_part_voltage_v: voltage,
    highest_part: part,
  };
}

function checkFrequencies(readings: readonly PlannedReading[], analyzer: AnalyzerProfile): void {
  const range = analyzer.limits.frequencyHz;
  const all = readings.flatMap((r) => r.frequencies);
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const f = (v: number) => formatQuantity(v, 'Hz');
  if (lo < range.min || hi > range.max) {
    throw new PlanLimitError(`the plan needs ${f(lo)} .. ${f(hi)} to cover the modes and their tolerance windows, outside the analyzer's limits.frequency = ${f(range.min)} .. ${f(range.max)} of ${analyzer.file}`);
  }
}

function checkAverages(averages: number, analyzer: AnalyzerProfile): void {
  const range = analyzer.limits.averaging;
  if (averages < range.min || averages > range.max) {
    throw new PlanLimitError(`--averages ${averages}: outside the analyzer's limits.averaging = ${range.min} .. ${range.max} of ${analyzer.file}`);
  }
}

function describeReading(r: PlannedReading): string {
  if (r.reading.kind === 'two-point') return `${r.reading.hi} against ${r.reading.lo}`;
  return `${r.reading.hi} to ground`;
}

/** A lossless board solved exactly on one of its resonances has no finite reading there. */
function solving<T>(board: Board, work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof UnsolvableReadingError) {
      throw new PlanDerivationError(`${board.file}: board ${board.name} cannot be solved at ${formatQuantity(err.frequencyHz, 'Hz')} (lossless, and exactly on a resonance there); give its capacitors and inductors esr or q`);
    }
    throw err;
  }
}
