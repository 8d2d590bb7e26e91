// Fault injection against the simulated bench over the real paths: `topoprobe sim --pty` (socat
// pseudo-terminals, serialport on both ends) and `topoprobe sim --tcp`, with `topoprobe run --json` in its
// own process. One case per kind of trouble: late answers, lost answers, garbage bytes (in place of the
// answer and in front of it), a dropped link mid-scan, spurious error-queue entries, a relay stuck open and
// one stuck closed, an instrument that reboots with another identity, and a full disk for the log.
//
// For each: the run either finishes (exit 0 or 1, log complete, every planned reading in it) or stops in the
// safe state (exit 3, one line on stderr naming the instrument or the log file, log failed, every relay
// open as the matrix itself reports afterwards, excitation at its minimum); it never hangs (the test
// timeout); and every reading it reported on stdout is in the log exactly once, with the value reported,
// the log holding no (step, point) twice. The matrix runs with --sense-contacts, so what it reports
// afterwards is what its contacts did, not only what it was told.
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile } from '../../src/instruments/index.js';
import { LOG_LIMIT_VARIABLE } from '../../src/log/log-file-ops.js';
import { tally } from '../support/reliability-tally.js';
import { toolAvailable } from '../support/requirements.js';
import { hasStackTrace } from '../support/run-cli.js';
import { startSim, type SimProcess } from '../support/sim-process.js';
import { savePlan, testPlan } from '../run/support/test-plan.js';
import { serveBench } from './support/bench-in-process.js';
import { account, askInstrument, key, logRows, planKeys, readMeta, reportedReadings, spawnRun, type ReportedReading } from './support/scan-checks.js';

const ptyAvailable = toolAvailable('socat');
const board = loadBoard('shared/boards/chain-24.yaml');
/** The analyzer's lowest level, where the safe state leaves the excitation. */
const MINIMUM_V = (builtinProfile('generic-analyzer') as AnalyzerProfile).limits.levelV.min;

let dir: string;
let planFile: string;
let profiles: string[];

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-faults-'));
  // Ten nodes to ground at six frequencies: 60 readings, about 330 messages, so every fault lands mid-scan.
  const nodes = ['n1', 'n2', 'n3', 'n4', 'n5', 'n6', 'n7', 'n8', 'n9', 'n10'];
  planFile = savePlan(
    path.join(dir, 'chain.plan.json'),
    testPlan(board, { frequencies: [100e3, 120e3, 150e3, 180e3, 220e3, 270e3], steps: nodes.map((hi) => ({ hi })), level_v: 0.01 }),
  );
  // The built-in profiles with a 500 ms answer timeout instead of 2 s, so a late or lost answer costs
  // half a second instead of two: the same recovery, a shorter suite.
  const fast = (name: string) => {
    const text = readFileSync(path.join('shared', 'profiles', `${name}.yaml`), 'utf8').replace(/timeouts: \{[^}]*\}/, 'timeouts: { command: 500 ms, connect: 2 s }');
    const file = path.join(dir, `fast-${name}.yaml`);
    writeFileSync(file, text);
    return file;
  };
  profiles = ['--analyzer-profile', fast('generic-analyzer'), '--switch-profile', fast('generic-switch')];
});

type Over = 'pty' | 'tcp';

interface FaultCase {
  name: string;
  over: Over;
  /** As `topoprobe sim --misbehave` and `--stuck`. */
  misbehave?: string[];
  stuck?: string[];
  /** Serve the bench with the real `topoprobe sim` process (its flags end to end) rather than in this process. */
  cli?: boolean;
  /** `stop`: the run must stop safe (exit 3) with a message matching `message`; `either`: finish or stop safe. */
  expect: 'either' | 'stop';
  message?: RegExp;
  /** A relay stuck closed stays closed whatever the runner does: the one channel the matrix may report. */
  stuckClosed?: number;
  /** Environment of the run (the full-disk seam). */
  env?: Record<string, string>;
  /** Resume the log afterwards on a healthy disk: it must complete with every reading once. */
  resume?: boolean;
}

// The first 12 messages of every connection are spared, so that identification and setup get through and
// the trouble lands in the scan. Rates are per query; the seed fixes which ones.
const spare = 'both:spare=12';
const linkFaults = (over: Over): FaultCase[] => [
  { name: 'late answers', over, misbehave: ['analyzer:late=0.05:1200', spare], expect: 'either' },
  { name: 'lost answers', over, misbehave: ['analyzer:drop=0.03', spare], expect: 'either' },
  { name: 'garbage bytes in place of answers', over, misbehave: ['analyzer:garbage=0.05:replace', spare], expect: 'either' },
  { name: 'garbage bytes in front of answers', over, misbehave: ['switch:garbage=0.08:prefix', spare], expect: 'either' },
  { name: 'a disconnect mid-scan', over, misbehave: ['both:disconnect=70', spare], expect: 'either' },
  { name: 'spurious error-queue entries', over, misbehave: ['both:errors=23', spare], expect: 'either' },
];

const cases: FaultCase[] = [
  ...linkFaults('pty'),
  ...linkFaults('tcp'),
  // Channel 1003 is n3's HI relay, closed by step 3; 1005 is n5's, which must be open from the start.
  { name: 'a relay stuck open', over: 'pty', stuck: ['1003=open'], expect: 'stop', message: /switch: after close the matrix reports channel 1003 still open/ },
  { name: 'a relay stuck closed', over: 'pty', stuck: ['1005=closed'], cli: true, expect: 'stop', message: /switch: after ROUTe:OPEN:ALL the matrix reports channel 1005 still closed/, stuckClosed: 1005 },
  { name: 'an analyzer that reboots with another identity', over: 'pty', misbehave: ['analyzer:reboot=80'], cli: true, expect: 'stop', message: /analyzer: analyzer identity changed after reconnect: was "[^"]+", now "[^"]+-boot1"; stopped/ },
  { name: 'a switch matrix that reboots with another identity', over: 'tcp', misbehave: ['switch:reboot=60'], expect: 'stop', message: /127\.0\.0\.1:\d+: switch identity changed after reconnect/ },
  {
    name: 'a full disk for the log',
    over: 'pty',
    // Room for the header and about twenty rows.
    env: { [LOG_LIMIT_VARIABLE]: '3000' },
    expect: 'stop',
    message: /\.csv: writing the log failed \(ENOSPC, the disk is full\); \d+ readings are safe in it/,
    resume: true,
  },
];

describe.skipIf(!ptyAvailable).concurrent('faults injected into a scan', () => {
  const stops: (() => Promise<unknown>)[] = [];
  afterAll(async () => {
    await Promise.all(stops.map((stop) => stop()));
  });

  for (const c of cases) {
    it(`${c.name} over ${c.over}: ${c.expect === 'stop' ? 'stops in the safe state' : 'recovers or stops in the safe state'}, nothing lost or twice`, async () => {
      const flags = [...(c.misbehave ?? []).flatMap((m) => ['--misbehave', m]), ...(c.stuck ?? []).flatMap((x) => ['--stuck', x])];
      let contacts: (() => ReadonlySet<number>) | undefined;
      let endpoints: { analyzer: string; switch: string };
      if (c.cli) {
        const sim: SimProcess = await startSim([...(c.over === 'pty' ? ['--pty'] : ['--tcp', '0']), '--timing', 'instant', '--sense-contacts', '--seed', '7', ...flags]);
        stops.push(() => sim.stop());
        endpoints = sim.endpoints;
      } else {
        const served = await serveBench({ over: c.over, board, seed: 7, misbehave: c.misbehave, stuck: c.stuck, senseContacts: true });
        stops.push(() => served.close());
        endpoints = served.endpoints;
        contacts = () => served.bench.switchMatrix.closedChannels();
      }
      const { analyzer, switch: matrix } = endpoints;
      const log = path.join(dir, `${c.name.replace(/\W+/g, '-')}-${c.over}.csv`);
      const args = [planFile, '--analyzer', analyzer, '--switch', matrix, ...profiles, '--log', log, '--json'];

      const run = spawnRun(args, c.env);
      const { code } = await run.exited;
      const reported: ReportedReading[] = reportedReadings(run.stdout());
      const events = run.stdout().trim().split('\n').map((l) => JSON.parse(l) as { event: string; status?: string; safe?: boolean; readings?: number });
      const done = events.at(-1);
      const meta = readMeta(log);
      const problems = run.stderr().split('\n').filter((l) => l.startsWith('topoprobe: '));

      // How the bench was left, asked of the instruments over their own lines.
      const closedAfter = await askInstrument(matrix, 'switch', 'ROUTe:CLOSe:LIST?');
      const levelAfter = Number(await askInstrument(analyzer, 'analyzer', 'SOURce:VOLTage:LEVel?'));
      const expectedClosed = c.stuckClosed === undefined ? '(@)' : `(@${c.stuckClosed})`;

      const rowsAfterRun = logRows(log);
      let final = rowsAfterRun;
      if (c.resume) {
        const again = spawnRun([...args, '--resume']);
        const resumed = await again.exited;
        expect(resumed.code, again.stderr()).toBeLessThanOrEqual(1);
        reported.push(...reportedReadings(again.stdout()));
        final = logRows(log);
        expect(final.map(key).sort()).toEqual(planKeys(planFile).sort());
      }
      const { lost, duplicated, duplicateKeys } = account(reported, final);

      const finished = (code === 0 || code === 1) && meta.status === 'complete' && done?.status === 'complete';
      const stoppedSafe =
        code === 3 &&
        meta.status === 'failed' &&
        done?.status === 'failed' &&
        problems.length === 1 &&
        (problems[0].includes(analyzer) || problems[0].includes(matrix) || problems[0].includes(log)) &&
        (c.message === undefined || c.message.test(problems[0]));
      const leftSafe = closedAfter === expectedClosed && levelAfter === MINIMUM_V;
      const outcomeRight = c.expect === 'stop' ? stoppedSafe : finished || stoppedSafe;
      tally({ area: 'fault', name: `${c.name} over ${c.over}`, ok: outcomeRight && leftSafe && lost === 0 && duplicated === 0 && duplicateKeys.length === 0, lost, duplicated });

      const context = `exit ${code}; stderr: ${run.stderr()}`;
      expect(hasStackTrace(run.stderr()), context).toBe(false);
      expect(outcomeRight, context).toBe(true);
      if (finished) expect(rowsAfterRun.map(key)).toEqual(planKeys(planFile));
      if (stoppedSafe) {
        // The done event and the meta agree with the log: what was reported is what is there.
        expect(done?.readings).toBe(meta.readings);
        expect(rowsAfterRun.length).toBe(meta.readings);
      }
      // A stuck-closed relay cannot be opened: the runner must say the bench is not safe, naming it.
      expect(done?.safe, `${context}; stdout tail: ${run.stdout().slice(-1500)}`).toBe(c.stuckClosed === undefined);
      if (c.stuckClosed !== undefined) expect(run.stdout()).toMatch(new RegExp(`could not open every relay .*channel ${c.stuckClosed} still read closed; check the bench by hand`));
      expect(closedAfter).toBe(expectedClosed);
      // In process, the contacts themselves: the matrix's answer above is not taken on trust.
      if (contacts) expect([...contacts()]).toEqual(c.stuckClosed === undefined ? [] : [c.stuckClosed]);
      expect(levelAfter).toBe(MINIMUM_V);
      expect({ lost, duplicated, duplicateKeys }).toEqual({ lost: 0, duplicated: 0, duplicateKeys: [] });
      // Every fault but the relay stuck from the start lands mid-scan, after readings were reported.
      if (c.stuckClosed === undefined) expect(reported.length).toBeGreaterThan(0);
    }, 120_000);
  }
});
