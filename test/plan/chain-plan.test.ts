// `topoprobe plan` on the demo chain, run as a user runs it: what the plan holds, checked against the
// physics of the board (edge-mode frequency, Ohm's law for the excitation current) and against counts
// made here from the plan's own steps.
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import { boardHash } from '../../src/plan/board-hash.js';
import { loadPlan } from '../../src/plan/read-plan.js';
import type { PlanStep, ScanPlan } from '../../src/plan/types.js';
import { hasStackTrace, ROOT, runCli } from '../support/run-cli.js';

const BOARD = 'shared/boards/chain-24.yaml';
const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-plan-'));
// f0 = 1/(2π√(L·C_node)) with every node carrying 43 nF against 22 µH (common practice).
const F_EDGE = 1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9));

/** Relays that change state from step to step, and all opened at the end: counted here from the channels. */
function relayOperations(steps: readonly Pick<PlanStep, 'channels'>[]): number {
  let closed = new Set<number>();
  let ops = 0;
  for (const s of steps) {
    const next = new Set(s.channels);
    for (const c of closed) if (!next.has(c)) ops++;
    for (const c of next) if (!closed.has(c)) ops++;
    closed = next;
  }
  return ops + closed.size;
}

function frequencyChanges(steps: readonly PlanStep[]): number {
  let last: number | undefined;
  let n = 0;
  for (const s of steps) for (const p of s.points) {
    if (p.frequency_hz !== last) n++;
    last = p.frequency_hz;
  }
  return n;
}

describe('topoprobe plan shared/boards/chain-24.yaml', () => {
  const file = path.join(dir, 'chain-24.plan.json');
  let run: ReturnType<typeof runCli>;
  let plan: ScanPlan;

  beforeAll(() => {
    run = runCli(['plan', BOARD, '-o', file]);
    plan = loadPlan(file);
  });

  it('writes the plan and a summary, exit 0', () => {
    expect(run.stderr).toBe('');
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^plan for board chain-24 written to /);
    expect(run.stdout).toMatch(/Monte Carlo, 200 samples \(seed 1\)/);
  });

  it('reads every node to ground at the edge-mode frequency, 1/(2π√(22 µH · 43 nF))', () => {
    const profile = plan.steps.filter((s) => s.purpose === 'profile');
    expect(profile.map((s) => s.hi).sort()).toEqual(Array.from({ length: 24 }, (_, i) => `n${i + 1}`).sort());
    for (const s of profile) {
      expect(s.kind).toBe('to-ground');
      expect(s.lo).toBe('gnd');
      expect(s.points).toHaveLength(1);
      expect(s.points[0].frequency_hz / F_EDGE).toBeCloseTo(1, 4);
    }
    // The edge modes are chosen, and at their frequency the end nodes read far above the bulk.
    expect(plan.modes).toHaveLength(2);
    const at = (node: string) => profile.find((s) => s.hi === node)!.points[0];
    expect(Math.hypot(at('n1').pred_re, at('n1').pred_im)).toBeGreaterThan(1000 * Math.hypot(at('n12').pred_re, at('n12').pred_im));
  });

  it('sweeps n1 and n24, where the edge modes live, and two bulk nodes as reference', () => {
    expect(plan.steps.filter((s) => s.purpose === 'sweep').map((s) => s.hi).sort()).toEqual(['n1', 'n24']);
    expect(plan.steps.filter((s) => s.purpose === 'reference').map((s) => s.hi).sort()).toEqual(['n12', 'n13']);
    for (const s of plan.steps.filter((s) => s.purpose === 'sweep')) expect(s.points.length).toBeGreaterThan(50);
  });

  it('puts every predicted value inside its own band', () => {
    for (const s of plan.steps) for (const p of s.points) {
      const mag = Math.hypot(p.pred_re, p.pred_im);
      expect(mag).toBeGreaterThanOrEqual(p.band.mag_lo_ohm);
      expect(mag).toBeLessThanOrEqual(p.band.mag_hi_ohm);
    }
  });

  it('records the board it was made for: its hash and snapshot', () => {
    const board = loadBoard(path.join(ROOT, BOARD));
    expect(plan.board.hash).toBe(boardHash(board));
    expect(plan.board.snapshot.parts).toHaveLength(board.parts.length);
  });

  it('closes the default map channels of each step, HI first (hi 1000 + k, gnd lo 2000)', () => {
    const n5 = plan.steps.find((s) => s.purpose === 'profile' && s.hi === 'n5')!;
    expect(n5.channels).toEqual([1005, 2000]);
  });

  it('orders the steps to need fewer relay operations than the derived order, and counts them right', () => {
    const ordered = relayOperations(plan.steps);
    expect(plan.estimate.relay_operations).toBe(ordered);
    expect(plan.estimate.frequency_changes).toBe(frequencyChanges(plan.steps));
    expect(plan.estimate.readings).toBe(plan.steps.reduce((n, s) => n + s.points.length, 0));
    // The naive order: all profiles in node order, then the sweeps, then the references.
    const rank = { profile: 0, sweep: 1, reference: 2, neighbour: 3, transfer: 4 };
    const node = (s: PlanStep) => Number(s.hi.slice(1));
    const naive = [...plan.steps].sort((a, b) => rank[a.purpose] - rank[b.purpose] || node(a) - node(b));
    expect(ordered).toBeLessThan(relayOperations(naive));
    expect(plan.steps.map((s) => s.step)).toEqual(plan.steps.map((_, i) => i + 1));
  });

  it('estimates the duration from the profile timing: settles, frequency changes, readings with their averages', () => {
    const analyzer = builtinProfile('generic-analyzer') as AnalyzerProfile;
    const matrix = builtinProfile('generic-switch') as SwitchProfile;
    let relaySets = 0;
    let closed = '';
    for (const s of plan.steps) {
      const key = [...s.channels].sort().join();
      if (key !== closed) relaySets++;
      closed = key;
    }
    // Per reading and per frequency change about 1 ms of command turnaround; every contact change is an open
    // and a close (break before make), each operating the relays and settling: 4 settle times.
    const turnaroundMs = 1;
    const readings = plan.steps.reduce((t, s) => t + s.points.length * (analyzer.timing.measurementMs + s.averages * analyzer.timing.perAverageMs + turnaroundMs), 0);
    const expected = (readings + relaySets * 4 * matrix.timing.settleAfterRelayMs + frequencyChanges(plan.steps) * (analyzer.timing.afterFrequencyChangeMs + turnaroundMs)) / 1000;
    expect(plan.estimate.duration_s).toBeCloseTo(expected, 9);
  });

  it('keeps the excitation current, level / |Z| (Ohm\'s law), within the analyzer\'s 20 mA at every point', () => {
    for (const s of plan.steps) for (const p of s.points) expect(s.level_v / Math.hypot(p.pred_re, p.pred_im)).toBeLessThanOrEqual(0.02 * (1 + 1e-12));
    // The high-impedance end nodes keep the full default level; the low-impedance bulk gets less.
    expect(plan.steps.find((s) => s.purpose === 'profile' && s.hi === 'n1')!.level_v).toBe(0.1);
    expect(plan.steps.find((s) => s.purpose === 'profile' && s.hi === 'n2')!.level_v).toBeLessThan(0.02);
  });

  it('writes exactly what loadPlan reads back', () => {
    expect(JSON.parse(readFileSync(file, 'utf8'))).toEqual(plan);
  });

  it('passes its own check', () => {
    const check = runCli(['plan', '--check', file]);
    expect(check.status).toBe(0);
    expect(check.stdout).toMatch(/a sound topoprobe-plan\/1 plan for board chain-24 .*28 steps, 668 readings/);
  });
});

describe('plan variants of chain-24', () => {
  it('--switch none: an operator-probed plan without channels, counting probe moves instead of relays', () => {
    const file = path.join(dir, 'probes.plan.json');
    const r = runCli(['plan', BOARD, '-o', file, '--switch', 'none', '--bands', 'first-order']);
    expect(r.status).toBe(0);
    const plan = loadPlan(file);
    expect(plan.instruments.switch).toBeNull();
    expect(plan.steps.every((s) => s.channels.length === 0)).toBe(true);
    expect(plan.estimate.relay_operations).toBe(0);
    // One placement per node: the profile and the sweep of n1 (and of n24, n12, n13) share theirs.
    expect(plan.estimate.probe_moves).toBe(24);
    expect(plan.fixture).toEqual({ nodes: {}, gnd: {} });
  });

  it('--transfer maps the edge mode with its sign: the a sites alternate in sign away from the driven end', () => {
    const file = path.join(dir, 'transfer.plan.json');
    const r = runCli(['plan', BOARD, '-o', file, '--transfer', '--bands', 'first-order']);
    expect(r.status).toBe(0);
    const plan = loadPlan(file);
    const transfer = plan.steps.filter((s) => s.purpose === 'transfer');
    expect(transfer).toHaveLength(24);
    expect(new Set(transfer.map((s) => s.hi))).toEqual(new Set(['n1']));
    // Near an isolated resonance the transfer impedance is dominated by the mode, Z_k1 ∝ φ_k φ_1
    // (common practice); the chain's left edge mode goes +, −, +, − over n1, n3, n5, n7 (ratio −10/33).
    const value = (node: string) => transfer.find((s) => s.sense === node)!.points[0].pred_re;
    expect([value('n1'), value('n3'), value('n5'), value('n7')].map(Math.sign)).toEqual([1, -1, 1, -1]);
    expect(Math.abs(value('n3') / value('n1'))).toBeCloseTo(10 / 33, 1);
    // Transfer steps close HI of the driven node, LO of ground and SENSE of the sensed node.
    expect(transfer.find((s) => s.sense === 'n5')!.channels).toEqual([1001, 2000, 3005]);
  });

  it('--neighbours reads across each of the 23 capacitors between two nodes', () => {
    const file = path.join(dir, 'neighbours.plan.json');
    const r = runCli(['plan', BOARD, '-o', file, '--neighbours', '--bands', 'first-order']);
    expect(r.status).toBe(0);
    const steps = loadPlan(file).steps.filter((s) => s.purpose === 'neighbour');
    expect(steps).toHaveLength(23);
    expect(steps.every((s) => s.kind === 'two-point' && s.lo !== 'gnd')).toBe(true);
    expect(steps.find((s) => s.hi === 'n1')).toMatchObject({ lo: 'n2', channels: [1001, 2002] });
  });

  it('--fixture uses the fixture map of our bench for the channels', () => {
    const file = path.join(dir, 'fixture.plan.json');
    const r = runCli(['plan', BOARD, '-o', file, '--fixture', 'shared/fixtures/chain-24.yaml', '--bands', 'first-order']);
    expect(r.status).toBe(0);
    const plan = loadPlan(file);
    expect(plan.steps.find((s) => s.purpose === 'profile' && s.hi === 'n7')!.channels).toEqual([107, 225]);
    expect(plan.fixture.gnd).toEqual({ hi: 125, lo: 225, sense: 325 });
  });

  it('-o - writes the plan to stdout and the summary to stderr', () => {
    const r = runCli(['plan', 'test/fixtures/plans/pair-board.yaml', '-o', '-', '--bands', 'first-order', '--points', '12']);
    expect(r.status).toBe(0);
    expect(JSON.parse(r.stdout).board.name).toBe('pair');
    expect(r.stderr).toMatch(/^plan for board pair written to stdout/);
    expect(hasStackTrace(r.stderr)).toBe(false);
  });
});
