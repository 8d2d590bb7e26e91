// `topoprobe plan <board> -o FILE`: a self-contained scan plan from the board's predicted modes, with a
// tolerance band for every reading; `topoprobe plan --check FILE` checks a plan file.
import { Command } from 'commander';
import { loadBoard } from '../board/load.js';
import type { Board } from '../board/types.js';
import { loadFixtureMap } from '../instruments/fixture-map.js';
import { profileFrom } from '../instruments/profile.js';
import type { AnalyzerProfile, SwitchProfile } from '../instruments/profile-types.js';
import { DEFAULT_GRID } from '../plan/adaptive-grid.js';
import { DEFAULT_AVERAGES, DEFAULT_FLOOR, DEFAULT_PROBE_MOVE_S, DEFAULT_SAMPLES, derivePlan, type DerivedPlan, type PlanRequest } from '../plan/derive-plan.js';
import { loadPlan } from '../plan/read-plan.js';
import { planText, writePlan } from '../plan/write-plan.js';
import type { ScanPlan } from '../plan/types.js';
import { formatQuantity, parsePercent, parseQuantity, type UnitName } from '../units/quantity.js';
import { UsageError } from './exit-codes.js';
import { parseCount, parseFrequency } from './frequency-options.js';

export function planCommand(): Command {
  return new Command('plan')
    .description('derive a scan plan (steps, frequencies, predicted readings with tolerance bands) from a board, or check a plan file')
    .argument('[board]', 'board file (YAML or JSON)')
    .option('-o, --output <file>', 'the plan file to write (JSON); - writes it to stdout')
    .option('--check <plan>', 'check a plan file and say what it holds, instead of making one')
    .option('--modes <k>', 'plan for the k most localized modes (default: the most localized mode in the resonance window and its partners)')
    .option('--near <freq>', 'plan for the modes nearest this frequency (with --modes: the k nearest)')
    .option('--neighbours', 'add two-point readings across every part between two nodes, at the mode frequencies')
    .option('--transfer', 'add transfer readings: drive the largest node of each mode, sense every node')
    .option('--bands <method>', 'monte-carlo (seeded samples within the tolerances) or first-order (adjoint sensitivities, fast)', 'monte-carlo')
    .option('--combine <how>', 'first-order bands: quadrature (default) or worst-case')
    .option('--samples <n>', 'Monte Carlo samples (default 200)')
    .option('--seed <n>', 'Monte Carlo seed (default 1)')
    .option('--floor-relative <pct>', 'measurement floor added to every magnitude band, relative (default 2%)')
    .option('--floor-absolute <ohms>', 'measurement floor added to every magnitude band, absolute (default 0.5 ohm)')
    .option('--floor-phase <deg>', 'measurement floor added to every phase band (default 2 degrees)')
    .option('--analyzer <profile>', 'analyzer profile: a built-in name or a file', DEFAULT_ANALYZER)
    .option('--switch <profile>', 'switch-matrix profile (built-in name or file), or none for an operator-probed plan', DEFAULT_SWITCH)
    .option('--fixture <file>', 'fixture map (default: the default map of the board)')
    .option('--level <volts>', 'one excitation level for every step, refused if it breaks a limit (default: each step the highest 1-2-5 level up to 100 mV within the limits)')
    .option('--averages <n>', 'averages per reading (default 4)')
    .option('--points <n>', 'most points in one sweep (default 161)')
    .option('--probe-time <seconds>', 'operator-probed plans: time to move the probes, for the estimate (default 10 s)')
    .addHelpText(
      'after',
      `
The plan reads every node to ground at each mode frequency (the mode profile), sweeps the nodes where
the modes are largest and two bulk reference nodes over the window the tolerances let the modes move
in (denser where the impedance changes fast), and gives every reading its predicted value and a band:
the spread over the part tolerances (each part uniform within its tolerance) plus a measurement floor.
Steps are ordered to save relay operations and frequency changes; the summary says how many.

Examples:
  topoprobe plan shared/boards/chain-24.yaml -o chain-24.plan.json
  topoprobe plan shared/boards/corner-8x8.yaml -o corner.plan.json --transfer --samples 500 --seed 7
  topoprobe plan shared/boards/chain-24.yaml -o quick.plan.json --bands first-order --combine worst-case
  topoprobe plan shared/boards/chain-24.yaml -o probes.plan.json --switch none --near 160k
  topoprobe plan shared/boards/chain-24.yaml -o fixture.plan.json --fixture shared/fixtures/chain-24.yaml --level 10mV
  topoprobe plan --check chain-24.plan.json`,
    )
    .action((board: string | undefined, flags: PlanFlags) => {
      if (flags.check !== undefined) {
        if (board !== undefined || flags.output !== undefined) throw new UsageError('--check: give only the plan file to check, not a board or --output');
        process.stdout.write(checkSummary(flags.check, loadPlan(flags.check)));
        return;
      }
      if (board === undefined) throw new UsageError('give a board file, e.g. topoprobe plan shared/boards/chain-24.yaml -o chain-24.plan.json');
      if (flags.output === undefined || flags.output === '') throw new UsageError('-o FILE: say where to write the plan (- for stdout)');
      const loaded = loadBoard(board);
      const derived = derivePlan(loaded, planRequest(loaded, flags));
      if (flags.output === '-') {
        process.stdout.write(planText(derived.plan));
        process.stderr.write(planSummary(derived, 'stdout'));
      } else {
        writePlan(derived.plan, flags.output);
        process.stdout.write(planSummary(derived, flags.output));
      }
    });
}

function planSummary({ plan, notes }: DerivedPlan, where: string): string {
  const hz = (f: number) => formatQuantity(f, 'Hz');
  const lines = [`plan for board ${plan.board.name} written to ${where}`, `modes: ${notes.modes}`];
  for (const m of plan.modes) lines.push(`  ${hz(m.frequency_hz)}  localization ${m.localization.toFixed(3)}  largest ${largest(m.profile)}`);
  const byPurpose = new Map<string, number>();
  for (const s of plan.steps) byPurpose.set(s.purpose, (byPurpose.get(s.purpose) ?? 0) + 1);
  lines.push(`steps: ${[...byPurpose].map(([p, n]) => `${n} ${p}`).join(', ')}`);
  if (notes.sweepNodes.length > 0 || notes.referenceNodes.length > 0) {
    lines.push(`sweeps at ${notes.sweepNodes.join(', ') || 'no node'}, references at ${notes.referenceNodes.join(', ') || 'no node'}, over ${notes.windows.map((w) => `${hz(w.lo_hz)} .. ${hz(w.hi_hz)}`).join(' and ')}`);
  }
  lines.push(`bands: ${bandsText(plan)}`);
  const e = plan.estimate;
  const moves = plan.instruments.switch === null ? `${e.probe_moves} probe moves` : `${e.relay_operations} relay operations (${notes.naive.relay_operations} in derivation order)`;
  lines.push(`${e.readings} readings, ${moves}, ${e.frequency_changes} frequency changes (${notes.naive.frequency_changes} in derivation order), about ${formatDuration(e.duration_s)}`);
  const levels = plan.steps.map((s) => s.level_v);
  if (plan.limits) {
    const l = plan.limits;
    lines.push(`levels ${formatQuantity(Math.min(...levels), 'V')} .. ${formatQuantity(Math.max(...levels), 'V')}; highest current ${formatQuantity(l.highest_current_a, 'A')}${l.current_a !== undefined ? ` (limit ${formatQuantity(l.current_a, 'A')})` : ''}; highest part voltage ${formatQuantity(l.highest_part_voltage_v, 'V')} (${l.highest_part})`);
  }
  return `${lines.join('\n')}\n`;
}

function checkSummary(file: string, plan: ScanPlan): string {
  const points = plan.steps.reduce((n, s) => n + s.points.length, 0);
  return `${file}: a sound ${plan.format} plan for board ${plan.board.name} (hash ${plan.board.hash.slice(0, 12)}…): ${plan.steps.length} steps, ${points} readings, ${plan.modes.length} modes, bands ${bandsText(plan)}\n`;
}

function bandsText(plan: ScanPlan): string {
  const b = plan.bands;
  const how = b.method === 'monte-carlo' ? `Monte Carlo, ${b.samples} samples (seed ${b.seed})` : `first order, ${b.combine ?? 'quadrature'}`;
  const floor = b.floor ? `, floor ${+(b.floor.relative * 100).toPrecision(4)} % + ${formatQuantity(b.floor.absolute_ohm, 'ohm')} and ${b.floor.phase_deg}°` : '';
  return `${how}, coverage ${(b.coverage * 100).toFixed(1)} %${floor}`;
}

function largest(profile: Record<string, number>): string {
  return Object.entries(profile)
    .sort((a, b) => Math.abs(b[1]) - Math.abs(a[1]))
    .slice(0, 4)
    .map(([node, v]) => `${node} ${v >= 0 ? '+' : ''}${v.toFixed(3)}`)
    .join(', ');
}

function formatDuration(seconds: number): string {
  if (seconds < 120) return `${seconds.toFixed(1)} s`;
  const minutes = Math.floor(seconds / 60);
  return minutes < 120 ? `${minutes} min ${Math.round(seconds - 60 * minutes)} s` : `${Math.floor(minutes / 60)} h ${minutes % 60} min`;
}

// Flags -> plan request; every bad flag is one line naming it.

interface PlanFlags {
  output?: string;
  check?: string;
  modes?: string;
  near?: string;
  neighbours?: boolean;
  transfer?: boolean;
  bands: string;
  combine?: string;
  samples?: string;
  seed?: string;
  floorRelative?: string;
  floorAbsolute?: string;
  floorPhase?: string;
  analyzer: string;
  switch: string;
  fixture?: string;
  level?: string;
  averages?: string;
  points?: string;
  probeTime?: string;
}

const DEFAULT_ANALYZER = 'generic-analyzer';
const DEFAULT_SWITCH = 'generic-switch';
const MAX_SAMPLES = 100_000;
const MAX_SWEEP_POINTS = 10_000;
const MIN_SWEEP_POINTS = 8;

export function planRequest(board: Board, flags: PlanFlags): PlanRequest {
  const count = flags.modes !== undefined ? parseCount(flags.modes, '--modes', board.nodes.length) : undefined;
  const near = flags.near !== undefined ? parseFrequency(flags.near, '--near') : undefined;
  const bands = bandMethod(flags);
  const analyzer = analyzerProfile(flags.analyzer);
  const switchChoice = switchProfile(flags.switch);
  if (!switchChoice && flags.fixture !== undefined) throw new UsageError('--fixture: an operator-probed plan (--switch none) uses no fixture map; leave one of them out');
  if (switchChoice && flags.probeTime !== undefined) throw new UsageError('--probe-time: goes with operator-probed plans (--switch none)');
  const points = flags.points !== undefined ? sweepPoints(flags.points) : DEFAULT_GRID.maxPoints;
  return {
    modes: { count, near },
    neighbours: flags.neighbours === true,
    transfer: flags.transfer === true,
    bands,
    floor: {
      relative: flags.floorRelative !== undefined ? quantityFlag('--floor-relative', () => parsePercent(flags.floorRelative), flags.floorRelative) : DEFAULT_FLOOR.relative,
      absolute_ohm: flags.floorAbsolute !== undefined ? quantityFlag('--floor-absolute', () => parseQuantity(flags.floorAbsolute?.trim(), 'ohm', { allowZero: true }), flags.floorAbsolute) : DEFAULT_FLOOR.absolute_ohm,
      phase_deg: flags.floorPhase !== undefined ? parseDegrees(flags.floorPhase) : DEFAULT_FLOOR.phase_deg,
    },
    analyzer: { name: flags.analyzer, profile: analyzer },
    switch: switchChoice ? { name: flags.switch, profile: switchChoice } : null,
    fixture: flags.fixture !== undefined ? loadFixtureMap(flags.fixture, board) : undefined,
    level: flags.level !== undefined ? positiveQuantity('--level', flags.level, 'V') : undefined,
    averages: flags.averages !== undefined ? parseCount(flags.averages, '--averages', 1_000_000) : DEFAULT_AVERAGES,
    grid: { ...DEFAULT_GRID, maxPoints: points, initialPoints: Math.min(DEFAULT_GRID.initialPoints, points) },
    probeMoveS: flags.probeTime !== undefined ? positiveQuantity('--probe-time', flags.probeTime, 's') : switchChoice ? undefined : DEFAULT_PROBE_MOVE_S,
  };
}

/** Each window starts with at least 3 points and the mode frequencies come on top; fewer than 8 is no sweep. */
function sweepPoints(text: string): number {
  const n = Number(text);
  if (!Number.isInteger(n) || n < MIN_SWEEP_POINTS || n > MAX_SWEEP_POINTS) throw new UsageError(`--points ${text}: expected a whole number from ${MIN_SWEEP_POINTS} to ${MAX_SWEEP_POINTS}`);
  return n;
}

function bandMethod(flags: PlanFlags): PlanRequest['bands'] {
  if (flags.bands === 'monte-carlo') {
    if (flags.combine !== undefined) throw new UsageError('--combine: goes with --bands first-order; the Monte Carlo band combines nothing');
    const samples = flags.samples !== undefined ? parseCount(flags.samples, '--samples', MAX_SAMPLES) : DEFAULT_SAMPLES;
    return { method: 'monte-carlo', samples, seed: flags.seed !== undefined ? wholeNumber('--seed', flags.seed) : 1 };
  }
  if (flags.bands === 'first-order') {
    if (flags.samples !== undefined) throw new UsageError('--samples: goes with --bands monte-carlo; the first-order band draws no samples');
    if (flags.seed !== undefined) throw new UsageError('--seed: goes with --bands monte-carlo; the first-order band draws no samples');
    const combine = flags.combine ?? 'quadrature';
    if (combine !== 'quadrature' && combine !== 'worst-case') throw new UsageError(`--combine ${combine}: expected quadrature or worst-case`);
    return { method: 'first-order', combine };
  }
  throw new UsageError(`--bands ${flags.bands}: expected monte-carlo or first-order`);
}

function analyzerProfile(name: string): AnalyzerProfile {
  const profile = profileFrom(name);
  if (profile.kind !== 'analyzer') throw new UsageError(`--analyzer ${name}: is a ${profile.kind} profile; give an analyzer profile`);
  return profile;
}

function switchProfile(name: string): SwitchProfile | undefined {
  if (name === 'none') return undefined;
  const profile = profileFrom(name);
  if (profile.kind !== 'switch') throw new UsageError(`--switch ${name}: is an ${profile.kind} profile; give a switch profile, or none for an operator-probed plan`);
  return profile;
}

function positiveQuantity(flag: string, text: string, unit: UnitName): number {
  return quantityFlag(flag, () => parseQuantity(text.trim(), unit), text);
}

function quantityFlag(flag: string, parse: () => number, text: string): number {
  try {
    return parse();
  } catch (err) {
    throw new UsageError(`${flag} ${text}: ${(err as Error).message}`);
  }
}

/** Degrees: a plain number, or one followed by deg or °. */
function parseDegrees(text: string): number {
  const m = /^\s*(\d+\.?\d*|\.\d+)\s*(?:deg|°)?\s*$/i.exec(text);
  const value = m ? Number(m[1]) : NaN;
  if (!(value >= 0) || value >= 180) throw new UsageError(`--floor-phase ${text}: expected degrees from 0 to below 180, e.g. 2 or 2deg`);
  return value;
}

function wholeNumber(flag: string, text: string): number {
  const n = Number(text);
  if (text.trim() === '' || !Number.isSafeInteger(n)) throw new UsageError(`${flag} ${text}: expected a whole number`);
  return n;
}
