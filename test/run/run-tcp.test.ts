// `topoprobe run` against `topoprobe sim --tcp` with link trouble (simulators/misbehaviour.ts): a line
// that drops is reconnected and the scan continues where it stopped; an instrument that only answers
// garbage ends the run as failed, exit 3, with everything read so far kept; an instrument that is not
// there is one line, exit 3, before any log exists. The traffic trace records the conversation.
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { hasStackTrace, runCli } from '../support/run-cli.js';
import { startSim, type SimProcess } from '../support/sim-process.js';
import { loggedRows, planKeys, readMetaFile } from './support/run-process.js';
import { savePlan, testPlan } from './support/test-plan.js';

let dir: string;
let planFile: string;
let sim: SimProcess | undefined;
const board = loadBoard('shared/boards/chain-24.yaml');

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-run-tcp-'));
  const nodes = ['n1', 'n2', 'n3', 'n12', 'n13', 'n24'];
  planFile = savePlan(path.join(dir, 'chain.plan.json'), testPlan(board, { frequencies: [100e3, 150e3, 220e3], steps: nodes.map((hi) => ({ hi })) }));
});
afterEach(async () => {
  await sim?.stop();
  sim = undefined;
});

describe('trouble on a TCP line', () => {
  it('a dropped line is reconnected and the scan goes on where it stopped', async () => {
    sim = await startSim(['--tcp', '0', '--timing', 'instant', '--misbehave', 'analyzer:disconnect=30']);
    const log = path.join(dir, 'dropped.csv');
    const trace = path.join(dir, 'dropped.trace');
    const r = runCli(['run', planFile, '--analyzer', sim.endpoints.analyzer, '--switch', sim.endpoints.switch, '--log', log, '--trace', trace]);
    expect(r.stderr).toMatch(/reconnected to 127\.0\.0\.1:\d+/);
    expect([0, 1]).toContain(r.status);
    expect(loggedRows(log).map((x) => `${x.step}:${x.point}`)).toEqual(planKeys(planFile));
    expect(readMetaFile(log).status).toBe('complete');
    const traced = readFileSync(trace, 'utf8');
    expect(traced).toMatch(/ > \*IDN\?/);
    expect(traced).toMatch(/ < Topoprobe Lab,SIM-ZA100,/);
  });

  it('an analyzer answering only garbage ends the run as failed, exit 3, keeping what was read', async () => {
    // The first 60 messages pass (identification, setup, the first readings), then every answer is garbage.
    sim = await startSim(['--tcp', '0', '--timing', 'instant', '--misbehave', 'analyzer:garbage=1', '--misbehave', 'analyzer:spare=60']);
    const log = path.join(dir, 'garbage.csv');
    const r = runCli(['run', planFile, '--analyzer', sim.endpoints.analyzer, '--switch', sim.endpoints.switch, '--log', log]);
    expect(r.status).toBe(3);
    expect(hasStackTrace(r.stderr)).toBe(false);
    expect(r.stdout).toMatch(/scan failed: .*still after 3 retries/);
    const meta = readMetaFile(log);
    expect(meta.status).toBe('failed');
    expect(loggedRows(log).length).toBe(meta.readings);
    expect(meta.readings).toBeGreaterThan(0);
  });

  it('an instrument that is not there is one line, exit 3, and no log is made', () => {
    const log = path.join(dir, 'nobody.csv');
    const r = runCli(['run', planFile, '--analyzer', '127.0.0.1:9', '--switch', '127.0.0.1:9', '--log', log]);
    expect(r.status).toBe(3);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(/^topoprobe: 127\.0\.0\.1:9: /);
    expect(existsSync(log)).toBe(false);
  });
});
