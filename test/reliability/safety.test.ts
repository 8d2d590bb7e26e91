// Safety of a run, checked on the simulated bench from the bench's side (its own record of what reached it,
// and its answers when we ask it ourselves over TCP), not from what the runner says about itself:
//   - a plan beyond a limit (the analyzer profile's level or current, a part's rating) is refused with one
//     line, exit 2, before the instruments hear anything at all;
//   - relays left closed by an earlier session are opened, and confirmed open by a query, before anything
//     is closed, with the excitation already at its minimum;
//   - however a run stops (complete, Ctrl-C, SIGTERM, instrument failure), every relay is open afterwards;
//   - full scans of both demo boards, transfer readings included, never tie two nodes to one bus.
// The rules are the trade's (common practice for instrument switching): break before make, switch with the
// source at its minimum, never two nodes on one bus. Every check is tallied (area "safety").
import { copyFileSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import type { ScanPlan } from '../../src/plan/types.js';
import { SimulatedSwitchMatrix, type ChannelRoute } from '../../simulators/switch-matrix.js';
import { tally } from '../support/reliability-tally.js';
import { runCliInProcess } from '../support/run-cli-in-process.js';
import { hasStackTrace, ROOT } from '../support/run-cli.js';
import { startSim, type SimProcess } from '../support/sim-process.js';
import { loggedRows, readMetaFile, startRun } from '../run/support/run-process.js';
import { savePlan, testPlan } from '../run/support/test-plan.js';
import { connectScpi, expandChannelList, readTraffic, type TrafficLine } from './support/bench-client.js';

let dir: string;
const sims: SimProcess[] = [];
const chain = loadBoard(path.join(ROOT, 'shared/boards/chain-24.yaml'));

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-safety-'));
});
afterAll(async () => {
  await Promise.all(sims.map((s) => s.stop()));
  if (dir) rmSync(dir, { recursive: true, force: true });
});

async function sim(args: string[]): Promise<SimProcess> {
  const s = await startSim(args);
  sims.push(s);
  return s;
}

function readPlan(file: string): ScanPlan {
  return JSON.parse(readFileSync(file, 'utf8')) as ScanPlan;
}

function writeTampered(name: string, plan: ScanPlan): string {
  const file = path.join(dir, name);
  writeFileSync(file, JSON.stringify(plan, null, 1));
  return file;
}

/** What the matrix itself says: the closed channels, the given channels' states, the conflict count. */
async function askMatrix(endpoint: string, channels: readonly number[]): Promise<{ closedList: number[]; states: string[]; conflicts: number }> {
  const client = await connectScpi(endpoint);
  try {
    const closedList = expandChannelList(await client.ask('ROUTe:CLOSe:LIST?'));
    const states = (await client.ask(`ROUTe:CLOSe? (@${channels.join(',')})`)).split(',');
    const conflicts = Number(await client.ask('DIAGnostic:BUS:CONFlicts?'));
    return { closedList, states, conflicts };
  } finally {
    client.close();
  }
}

/** Every channel a plan can close (its fixture's and its steps'), as the runner confirms them. */
function planChannels(plan: ScanPlan): number[] {
  const all = new Set<number>();
  for (const c of [...Object.values(plan.fixture.nodes), plan.fixture.gnd]) for (const v of Object.values(c)) if (typeof v === 'number') all.add(v);
  for (const s of plan.steps) for (const c of s.channels) all.add(c);
  return [...all].sort((a, b) => a - b);
}

const relayCommand = /^(ROUTe:(CLOSe|OPEN)( |:ALL)|ROUT:(CLOS|OPEN)( |:ALL)|\*RST)/i;

describe('a plan beyond a limit is refused before anything is sent', () => {
  let source: string;
  let ratedPlan: string;
  let benchSim: SimProcess;
  let traffic: string;

  beforeAll(async () => {
    // Example plan of the lab (made by `topoprobe plan`), copied so the tampering stays in our folder.
    source = path.join(dir, 'chain-24.plan.json');
    copyFileSync(path.join(ROOT, 'sequences/chain-24.plan.json'), source);
    // A board with a voltage rating on C3 (t3 to ground), planned by topoprobe itself.
    const tank = JSON.parse(readFileSync(path.join(ROOT, 'shared/boards/tank-3.json'), 'utf8')) as { name: string; components: { ref: string; rating?: string }[] };
    tank.name = 'tank-3-rated';
    tank.components.find((c) => c.ref === 'C3')!.rating = '500mV';
    const boardFile = path.join(dir, 'tank-3-rated.json');
    writeFileSync(boardFile, JSON.stringify(tank));
    ratedPlan = path.join(dir, 'tank-3-rated.plan.json');
    const made = await runCliInProcess(['plan', boardFile, '-o', ratedPlan, '--samples', '30']);
    expect(made.status, made.stderr).toBe(0);
    traffic = path.join(dir, 'limits.traffic');
    benchSim = await sim(['--tcp', '0', '--timing', 'instant', '--traffic', traffic]);
  });

  /** Runs `plan` against the TCP bench and in process with --sim; both must refuse, and nothing reaches an instrument. */
  async function expectRefused(name: string, planFile: string, message: RegExp) {
    const trace = path.join(dir, `${path.basename(planFile)}.trace`);
    const overTcp = await runCliInProcess(['run', planFile, '--analyzer', benchSim.endpoints.analyzer, '--switch', benchSim.endpoints.switch, '--log', path.join(dir, `${name}-tcp.csv`), '--trace', trace]);
    const simulated = await runCliInProcess(['run', planFile, '--sim', '--timing', 'instant', '--log', path.join(dir, `${name}-sim.csv`), '--trace', trace]);
    const heard = readTraffic(traffic).filter((l) => l.direction === 'in');
    const oneLine = (r: { stderr: string }) => r.stderr.trim().split('\n').length === 1 && !hasStackTrace(r.stderr);
    const ok =
      overTcp.status === 2 &&
      simulated.status === 2 &&
      oneLine(overTcp) &&
      oneLine(simulated) &&
      message.test(overTcp.stderr) &&
      /nothing was sent/.test(overTcp.stderr) &&
      heard.length === 0 &&
      !existsSync(trace) &&
      !existsSync(path.join(dir, `${name}-tcp.csv`));
    tally({ area: 'safety', name: `limits: ${name} refused before any command`, ok });
    expect(overTcp.status, overTcp.stderr).toBe(2);
    expect(simulated.status, simulated.stderr).toBe(2);
    expect(oneLine(overTcp)).toBe(true);
    expect(oneLine(simulated)).toBe(true);
    expect(overTcp.stderr).toMatch(message);
    expect(overTcp.stderr).toMatch(/nothing was sent/);
    // The instruments' own record: not one message reached either of them. The client's trace was never opened.
    expect(heard).toEqual([]);
    expect(existsSync(trace)).toBe(false);
    expect(existsSync(path.join(dir, `${name}-tcp.csv`))).toBe(false);
  }

  it('a level above the analyzer profile\'s limits.level.max (1 V) is refused', async () => {
    const plan = readPlan(source);
    plan.steps[4].level_v = 2;
    const file = writeTampered('level.plan.json', plan);
    // The plan's own checks still pass: its hash covers only the board, so this reaches the limit check.
    const check = await runCliInProcess(['plan', '--check', file]);
    expect(check.status, check.stderr).toBe(0);
    await expectRefused('level above profile max', file, /steps\[4\] \(step 5\): level 2 V, outside limits\.level 5 mV \.\. 1 V of profile generic-analyzer/);
  });

  it('levels that drive more current into the predicted impedance than limits.current (20 mA) are refused', async () => {
    const plan = readPlan(source);
    // Every level doubled stays within 5 mV .. 1 V and within the 1 V / 50 Ω short-circuit current, but the
    // plan's own prediction (level / |Z|, Ohm's law) now asks up to twice the 18.7 mA it was made with.
    for (const s of plan.steps) s.level_v *= 2;
    expect(Math.max(...plan.steps.map((s) => s.level_v))).toBeLessThanOrEqual(1);
    const file = writeTampered('current.plan.json', plan);
    await expectRefused('predicted current above profile limit', file, /drives [\d.]+ mA into the predicted .* outside limits\.current 20 mA of profile generic-analyzer/);
  });

  it('a level above the rating of a part straight across the terminals is refused', async () => {
    const plan = readPlan(ratedPlan);
    const rated = plan.board.snapshot.parts.find((p) => p.ref === 'C3')!;
    expect(rated.rating_v).toBe(0.5);
    // The step at t3 with the highest predicted |Z| (the resonance): 600 mV there stays far inside 20 mA.
    const index = plan.steps.findIndex((s) => s.hi === 't3' && s.kind === 'to-ground' && s.points.every((p) => 0.6 / Math.hypot(p.pred_re, p.pred_im) < 0.02));
    expect(index).toBeGreaterThanOrEqual(0);
    expect(plan.steps[index].level_v).toBeLessThanOrEqual(0.5);
    plan.steps[index].level_v = 0.6;
    const file = writeTampered('rating.plan.json', plan);
    await expectRefused('level above a part rating', file, new RegExp(`steps\\[${index}\\] .*level 600 mV is across C3 \\(t3 to gnd\\), above its rating 500 mV`));
  });

  it('the untampered plans run, and then the bench does hear them (so the empty record above can fail)', async () => {
    const log = path.join(dir, 'untampered.csv');
    const r = await runCliInProcess(['run', source, '--analyzer', benchSim.endpoints.analyzer, '--switch', benchSim.endpoints.switch, '--log', log]);
    const rated = await runCliInProcess(['run', ratedPlan, '--sim', '--timing', 'instant', '--log', path.join(dir, 'rated.csv')]);
    const heard = readTraffic(traffic).filter((l) => l.direction === 'in');
    const ok = [0, 1].includes(r.status ?? -1) && [0, 1].includes(rated.status ?? -1) && heard.some((l) => l.instrument === 'analyzer') && heard.some((l) => l.instrument === 'switch');
    tally({ area: 'safety', name: 'limits: the untampered plans run (control)', ok });
    expect([0, 1], r.stderr).toContain(r.status);
    expect([0, 1], rated.stderr).toContain(rated.status);
    expect(heard.some((l) => l.instrument === 'analyzer' && /^\*IDN\?$/.test(l.text))).toBe(true);
    expect(heard.some((l) => l.instrument === 'switch' && /^ROUTe:CLOSe \(/.test(l.text))).toBe(true);
  });
});

describe('relays left closed by an earlier session are opened first', () => {
  it('the first relay command opens everything, a query confirms it before any close, with the excitation at its minimum', async () => {
    const traffic = path.join(dir, 'crash.traffic');
    // HI on n5, LO on n12, SENSE on n7: as a crashed two-point reading with a sense lead could leave them.
    const leftClosed = [1005, 2012, 3007];
    const s = await sim(['--tcp', '0', '--timing', 'instant', '--closed', leftClosed.join(','), '--traffic', traffic]);
    const before = await askMatrix(s.endpoints.switch, leftClosed);
    const planFile = savePlan(path.join(dir, 'crash.plan.json'), testPlan(chain, { frequencies: [150e3, 163.6e3], steps: [{ hi: 'n1' }, { hi: 'n24', sense: 'n22' }, { hi: 'n12' }] }));
    const plan = readPlan(planFile);
    const start = readTraffic(traffic).length;
    const r = await runCliInProcess(['run', planFile, '--analyzer', s.endpoints.analyzer, '--switch', s.endpoints.switch, '--log', path.join(dir, 'crash.csv')]);
    const heard = readTraffic(traffic).slice(start);
    const after = await askMatrix(s.endpoints.switch, planChannels(plan));

    const switchIn = heard.map((l, i) => ({ ...l, i })).filter((l) => l.instrument === 'switch' && l.direction === 'in');
    const firstRelay = switchIn.find((l) => relayCommand.test(l.text));
    const firstClose = switchIn.find((l) => /^ROUTe:CLOSe \(/.test(l.text));
    // The confirming query: asked between the opening and the first close, covering every channel left closed.
    const confirm = switchIn.find((l) => firstRelay && firstClose && l.i > firstRelay.i && l.i < firstClose.i && /^ROUTe:CLOSe\? /.test(l.text));
    const confirmed = confirm ? expandChannelList(confirm.text.replace(/^ROUTe:CLOSe\? /, '')) : [];
    const answer = confirm ? heard.slice(confirm.i + 1).find((l) => l.instrument === 'switch' && l.direction === 'out') : undefined;
    const minimumAt = heard.findIndex((l: TrafficLine) => l.instrument === 'analyzer' && l.direction === 'in' && /^SOURce:VOLTage:LEVel 0\.005$/.test(l.text));
    const ok =
      before.closedList.join() === leftClosed.join() &&
      [0, 1].includes(r.status ?? -1) &&
      firstRelay?.text === 'ROUTe:OPEN:ALL' &&
      leftClosed.every((c) => confirmed.includes(c)) &&
      answer !== undefined &&
      answer.text.split(',').every((v) => v === '0') &&
      minimumAt >= 0 &&
      minimumAt < (firstRelay?.i ?? -1) &&
      after.closedList.length === 0 &&
      after.conflicts === 0;
    tally({ area: 'safety', name: 'relays left closed: opened and confirmed before any close', ok });

    expect(before.closedList).toEqual(leftClosed); // the simulated crash left them closed
    expect([0, 1], r.stderr).toContain(r.status);
    expect(firstRelay?.text).toBe('ROUTe:OPEN:ALL');
    expect(firstClose).toBeDefined();
    expect(confirm, 'a ROUTe:CLOSe? between the opening and the first close').toBeDefined();
    for (const c of leftClosed) expect(confirmed).toContain(c);
    expect(answer!.text.split(',').every((v) => v === '0')).toBe(true);
    expect(minimumAt).toBeGreaterThanOrEqual(0);
    expect(minimumAt).toBeLessThan(firstRelay!.i);
    expect(after.closedList).toEqual([]);
    expect(after.conflicts).toBe(0);
  });

  it('closed at start in process: the matrix reports them closed, and a conflict they make is on the record', async () => {
    const route = (c: number): ChannelRoute | undefined => ({ bus: (['hi', 'lo', 'sense'] as const)[Math.floor(c / 1000) - 1], node: c % 1000 === 0 ? 'gnd' : `n${c % 1000}` });
    const clean = new SimulatedSwitchMatrix({ routes: route, closedAtStart: [1005, 2000] });
    const tangled = new SimulatedSwitchMatrix({ routes: route, closedAtStart: [1005, 1006, 2000] });
    const ok = (await clean.receive('ROUT:CLOS:LIST?')) === '(@1005,2000)' && clean.conflicts().length === 0 && tangled.conflicts().length === 1 && clean.cycles(1005) === 0;
    tally({ area: 'safety', name: 'switch matrix: relays closed at start', ok });
    expect(await clean.receive('ROUT:CLOS:LIST?')).toBe('(@1005,2000)');
    expect(clean.cycles(1005)).toBe(0); // not an operation of this session
    expect(clean.conflicts()).toEqual([]);
    expect(tangled.conflicts()).toEqual([{ operation: 0, command: 'left closed at start', bus: 'hi', nodes: ['n5', 'n6'], channels: [1005, 1006] }]);
    expect(await tangled.receive('DIAG:BUS:CONF?')).toBe('1');
  });
});

describe('every way a run stops leaves every relay open (asked of the matrix itself)', () => {
  let slow: SimProcess;
  let shortPlan: string;
  let longPlan: string;
  let channels: number[];

  beforeAll(async () => {
    // Realistic timing (5 ms relays, 20 ms + 5 ms per average readings) so a signal lands mid-scan.
    slow = await sim(['--tcp', '0', '--timing', 'realistic']);
    shortPlan = savePlan(path.join(dir, 'short.plan.json'), testPlan(chain, { frequencies: [150e3, 163.6e3], steps: [{ hi: 'n1' }, { hi: 'n12' }] }));
    const nodes = ['n1', 'n2', 'n3', 'n4', 'n12', 'n13', 'n23', 'n24'];
    const frequencies = Array.from({ length: 25 }, (_, i) => 140e3 + i * 2e3);
    longPlan = savePlan(path.join(dir, 'long.plan.json'), testPlan(chain, { frequencies, steps: nodes.map((hi) => ({ hi })) }));
    channels = planChannels(readPlan(longPlan));
  });

  /** Leaves relays closed as a crash would, so that each run starts from a dirty matrix. */
  async function dirty(endpoint: string) {
    const client = await connectScpi(endpoint);
    await client.send('ROUTe:CLOSe (@1007,2000,3009)');
    client.close();
  }

  async function stoppedRun(name: string, planFile: string, stop: 'complete' | 'SIGINT' | 'SIGTERM', expected: number[]) {
    await dirty(slow.endpoints.switch);
    const log = path.join(dir, `${name}.csv`);
    const run = startRun([planFile, '--analyzer', slow.endpoints.analyzer, '--switch', slow.endpoints.switch, '--log', log, '--json']);
    if (stop !== 'complete') {
      // By observed progress: a few readings in, never by a fixed sleep.
      await run.lines(6);
      run.child.kill(stop);
    }
    const { code } = await run.exited;
    const matrix = await askMatrix(slow.endpoints.switch, channels);
    const meta = readMetaFile(log);
    const rows = loggedRows(log).length;
    const total = readPlan(planFile).steps.reduce((n, s) => n + s.points.length, 0);
    const status = stop === 'complete' ? 'complete' : 'interrupted';
    const ok =
      expected.includes(code ?? -1) &&
      matrix.closedList.length === 0 &&
      matrix.states.every((v) => v === '0') &&
      matrix.conflicts === 0 &&
      meta.status === status &&
      rows === meta.readings &&
      (stop === 'complete' ? rows === total : rows > 0 && rows < total);
    tally({ area: 'safety', name: `stop by ${name}: every relay open afterwards`, ok });
    expect(expected, run.stderr()).toContain(code);
    expect(meta.status).toBe(status);
    expect(rows).toBe(meta.readings);
    if (stop === 'complete') expect(rows).toBe(total);
    else {
      expect(rows).toBeGreaterThan(0);
      expect(rows).toBeLessThan(total);
    }
    expect(matrix.closedList).toEqual([]);
    expect(matrix.states.every((v) => v === '0')).toBe(true);
    expect(matrix.conflicts).toBe(0);
  }

  it('a run that completes', async () => {
    await stoppedRun('completion', shortPlan, 'complete', [0, 1]);
  });

  it('Ctrl-C (SIGINT) mid-scan', async () => {
    await stoppedRun('Ctrl-C', longPlan, 'SIGINT', [130]);
  });

  it('SIGTERM mid-scan', async () => {
    await stoppedRun('SIGTERM', longPlan, 'SIGTERM', [130]);
  });

  it('an instrument failure (a relay stuck open, found by the confirming query), exit 3', async () => {
    // n3's HI relay (1003) never closes: the matrix says so when asked, and the run stops at step 3.
    const broken = await sim(['--tcp', '0', '--timing', 'instant', '--stuck', '1003=open', '--sense-contacts']);
    await dirty(broken.endpoints.switch);
    const log = path.join(dir, 'failure.csv');
    const r = await runCliInProcess(['run', longPlan, '--analyzer', broken.endpoints.analyzer, '--switch', broken.endpoints.switch, '--log', log]);
    const matrix = await askMatrix(broken.endpoints.switch, channels);
    const meta = readMetaFile(log);
    const ok = r.status === 3 && meta.status === 'failed' && meta.readings > 0 && matrix.closedList.length === 0 && matrix.states.every((v) => v === '0') && matrix.conflicts === 0;
    tally({ area: 'safety', name: 'stop by instrument failure: every relay open afterwards', ok });
    expect(r.status, r.stderr).toBe(3);
    expect(meta.status).toBe('failed');
    expect(meta.readings).toBeGreaterThan(0);
    expect(r.stderr + r.stdout).toMatch(/1003/);
    expect(matrix.closedList).toEqual([]);
    expect(matrix.states.every((v) => v === '0')).toBe(true);
    expect(matrix.conflicts).toBe(0);
  });
});

describe('never two nodes on one bus: full scans of the demo boards, transfer readings included', () => {
  for (const board of ['chain-24', 'corner-8x8']) {
    it(`${board}: the matrix records no moment with two nodes on HI, LO or SENSE`, async () => {
      const planFile = path.join(dir, `${board}-transfer.plan.json`);
      const made = await runCliInProcess(['plan', path.join(ROOT, `shared/boards/${board}.yaml`), '-o', planFile, '--transfer', '--samples', '20']);
      expect(made.status, made.stderr).toBe(0);
      const plan = readPlan(planFile);
      const transfers = plan.steps.filter((s) => s.kind === 'transfer').length;
      const s = await sim(['--board', path.join(ROOT, `shared/boards/${board}.yaml`), '--tcp', '0', '--timing', 'instant']);
      const r = await runCliInProcess(['run', planFile, '--analyzer', s.endpoints.analyzer, '--switch', s.endpoints.switch, '--log', path.join(dir, `${board}-full.csv`)]);
      const client = await connectScpi(s.endpoints.switch);
      const conflicts = Number(await client.ask('DIAGnostic:BUS:CONFlicts?'));
      const cycles = (await client.ask(`DIAGnostic:RELay:CYCLes? (@${planChannels(plan).join(',')})`)).split(',').map(Number);
      // The zero can fail: two nodes closed onto HI by hand are counted at once.
      const hi = Object.values(plan.fixture.nodes).map((c) => c.hi!).slice(0, 2);
      await client.send(`ROUTe:CLOSe (@${hi.join(',')})`);
      const provoked = Number(await client.ask('DIAGnostic:BUS:CONFlicts?'));
      await client.send('ROUTe:OPEN:ALL');
      client.close();
      const ok = [0, 1].includes(r.status ?? -1) && transfers > 0 && conflicts === 0 && cycles.some((c) => c > 0) && provoked === 1;
      tally({ area: 'safety', name: `${board}: full scan with transfer readings, no two nodes on one bus`, ok });
      tally({ area: 'safety', name: `${board}: two nodes closed onto HI by hand are counted`, ok: provoked === 1 });
      expect([0, 1], r.stderr).toContain(r.status);
      expect(transfers).toBeGreaterThan(0);
      expect(loggedRows(path.join(dir, `${board}-full.csv`)).length).toBe(plan.steps.reduce((n, x) => n + x.points.length, 0));
      expect(cycles.reduce((a, b) => a + b, 0)).toBeGreaterThan(plan.steps.length);
      expect(conflicts).toBe(0);
      expect(provoked).toBe(1);
    });
  }
});
