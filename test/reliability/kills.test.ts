// kill -9 of the real `topoprobe run` process at 20 seeded random moments of one scan over the pty path
// (socat pseudo-terminals), resuming after each. The moments are chosen by observed progress (a random
// target count of log rows), never by wall-clock sleeps, so a busy machine moves them nowhere.
//
// A kill cannot be made to land inside the one write(2) that puts a row on disk, so a torn write is
// emulated: before some of the resumes the test appends the first part of a row itself, as a write cut
// off half way would leave it, and the resume must drop it and say so.
//
// At the end: the log holds exactly the (step, point) readings of an uninterrupted run, each once; every
// reading any killed run reported on stdout (--json) is in it once, with the value and time reported; no
// torn row survives; the meta file counts every reading and records each killed run as interrupted.
import { appendFileSync, existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { seededRandom } from '../support/make-board.js';
import { tally } from '../support/reliability-tally.js';
import { toolAvailable } from '../support/requirements.js';
import { hasStackTrace } from '../support/run-cli.js';
import { savePlan, testPlan } from '../run/support/test-plan.js';
import { serveBench, type ServedBench } from './support/bench-in-process.js';
import { account, key, logLineCount, logRows, planKeys, readMeta, reportedReadings, spawnRun, type ReportedReading } from './support/scan-checks.js';

const ptyAvailable = toolAvailable('socat');
const KILLS = 20;
/** Every fifth resume first finds a torn last line (emulated, see above). */
const TORN_EVERY = 5;

let dir: string;
let planFile: string;
let served: ServedBench;

beforeAll(async () => {
  if (!ptyAvailable) return;
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-kills-'));
  const board = loadBoard('shared/boards/chain-24.yaml');
  // Every node of the chain to ground at 14 frequencies: 336 readings, a few seconds with instant timing.
  const nodes = Array.from({ length: 24 }, (_, i) => ({ hi: `n${i + 1}` }));
  const frequencies = Array.from({ length: 14 }, (_, i) => 80e3 + i * 15e3);
  planFile = savePlan(path.join(dir, 'chain.plan.json'), testPlan(board, { frequencies, steps: nodes, level_v: 0.01 }));
  served = await serveBench({ over: 'pty', board, seed: 11 });
});
afterAll(async () => {
  await served?.close();
});

describe.skipIf(!ptyAvailable)('kill -9 at random moments of a scan, then resume', () => {
  it(`${KILLS} kills: the resumed log is the uninterrupted run's, every reported reading in it once, torn lines dropped and said`, async () => {
    const bench = ['--analyzer', served.endpoints.analyzer, '--switch', served.endpoints.switch];
    const whole = path.join(dir, 'whole.csv');
    const reference = spawnRun([planFile, ...bench, '--log', whole]);
    expect((await reference.exited).code, reference.stderr()).toBeLessThanOrEqual(1);
    const expected = logRows(whole).map(key);
    expect(expected).toEqual(planKeys(planFile));

    // The moments: 20 distinct row counts spread over the scan, well before its end so that each kill lands
    // while the scan is still going.
    const random = seededRandom(7919);
    const targets = new Set<number>();
    while (targets.size < KILLS) targets.add(3 + Math.floor(random() * (expected.length - 30)));
    const moments = [...targets].sort((a, b) => a - b);

    const log = path.join(dir, 'killed.csv');
    const killed: { reported: ReportedReading[]; target: number }[] = [];
    let tornWritten = 0;
    let tornSaid = 0;
    for (let k = 0; k <= KILLS; k++) {
      const resume = existsSync(`${log}.meta.json`);
      let torn = false;
      if (resume && k % TORN_EVERY === 0) {
        // The first part of a row, without its CR LF: what a write cut off half way leaves.
        const text = readFileSync(log, 'utf8');
        const last = text.slice(text.lastIndexOf('\r\n', text.length - 3) + 2, -2);
        appendFileSync(log, last.slice(0, 1 + Math.floor(random() * (last.length - 2))));
        torn = true;
        tornWritten++;
      }
      const run = spawnRun([planFile, ...bench, '--log', log, '--json', ...(resume ? ['--resume'] : [])]);
      let timer: NodeJS.Timeout | undefined;
      const target = k < KILLS ? Math.max(moments[k], logLineCount(log) + 1) : Infinity;
      if (k < KILLS) {
        timer = setInterval(() => {
          if (logLineCount(log) >= target) run.child.kill('SIGKILL');
        }, 2);
      }
      const { code, signal } = await run.exited;
      clearInterval(timer);
      if (/dropped a torn last line \(\d+ bytes/.test(run.stderr())) tornSaid++;
      // A resume that found no torn line must not claim one.
      if (!torn) expect(run.stderr()).not.toMatch(/torn/);
      expect(hasStackTrace(run.stderr()), run.stderr()).toBe(false);
      if (k < KILLS) {
        expect(signal, `run ${k} was to be killed at ${target} rows; exit ${code}; ${run.stderr()}`).toBe('SIGKILL');
        killed.push({ reported: reportedReadings(run.stdout()), target });
      } else {
        expect(code, run.stderr()).toBeLessThanOrEqual(1);
        killed.push({ reported: reportedReadings(run.stdout()), target });
      }
    }

    const final = logRows(log);
    const all = killed.flatMap((r) => r.reported);
    for (const [i, run] of killed.slice(0, KILLS).entries()) {
      const { lost, duplicated } = account(run.reported, final);
      tally({ area: 'kill', name: `kill ${i + 1} of ${KILLS} at ${run.target} log rows, then resume`, ok: lost === 0 && duplicated === 0, lost, duplicated });
    }
    const { lost, duplicated, duplicateKeys } = account(all, final);
    expect({ lost, duplicated, duplicateKeys }).toEqual({ lost: 0, duplicated: 0, duplicateKeys: [] });
    expect(final.map(key).sort()).toEqual([...expected].sort());
    // The killed runs did report readings (the kills landed mid-scan, not all before the first reading).
    expect(killed.slice(0, KILLS).filter((r) => r.reported.length > 0).length).toBeGreaterThanOrEqual(KILLS - 2);
    expect(tornSaid).toBe(tornWritten);
    expect(tornWritten).toBe(Math.floor(KILLS / TORN_EVERY));
    const text = readFileSync(log, 'utf8');
    expect(text.endsWith('\r\n')).toBe(true);
    const meta = readMeta(log);
    expect(meta.status).toBe('complete');
    expect(meta.readings).toBe(expected.length);
    // Every run that got as far as opening the log left its record; the killed ones read as interrupted.
    expect(meta.runs.length).toBe(KILLS + 1);
    expect(meta.runs.slice(0, -1).every((r) => r.status === 'interrupted')).toBe(true);
  }, 120_000);
});
