// `topoprobe run` as a user calls it, on the simulated bench in process: flags, the board check, --json,
// operator-probed mode with Enter on stdin, exit codes (the README's contract: 0 clean, 1 deviations,
// 2 bad input, 3 instrument failure, 130 interrupted) and the log left behind.
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { hasStackTrace, runCli } from '../support/run-cli.js';
import { loadBoard } from '../../src/board/index.js';
import { loggedRows, planKeys, readMetaFile } from './support/run-process.js';
import { savePlan, testPlan } from './support/test-plan.js';

let dir: string;
let planFile: string;
let operatorPlan: string;
const board = loadBoard('shared/boards/chain-24.yaml');

beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-run-cli-'));
  planFile = savePlan(path.join(dir, 'chain.plan.json'), testPlan(board, { frequencies: [100e3, 220e3], steps: ['n1', 'n2', 'n12', 'n24'].map((hi) => ({ hi })) }));
  operatorPlan = savePlan(path.join(dir, 'chain-operator.plan.json'), testPlan(board, { frequencies: [100e3, 220e3], steps: ['n1', 'n7', 'n24'].map((hi) => ({ hi })), switchMatrix: null }));
});

const oneLine = (stderr: string) => stderr.trim().split('\n');

describe('bad input', () => {
  it.each([
    [['PLAN'], /give --sim, or --analyzer ADDRESS/],
    [['PLAN', '--sim', '--analyzer', '/dev/ttyUSB0'], /--sim measures the simulated bench: leave out --analyzer/],
    [['PLAN', '--analyzer', '127.0.0.1:5025', '--fault', 'C_intra_0=open'], /--fault goes with --sim/],
    [['PLAN', '--sim', '--timing', 'fast'], /--timing fast: expected realistic or instant/],
    [['PLAN', '--sim', '--seed', 'x'], /--seed x: expected a whole number/],
    [['PLAN', '--sim', '--resume'], /--resume needs --log FILE/],
    [['PLAN', '--sim', '--fault', 'C_nothing_9=open'], /no part "C_nothing_9"/],
    [['PLAN', '--analyzer', 'not an address', '--switch', '127.0.0.1:5026'], /--analyzer: "not an address" is neither a serial port nor HOST:PORT/],
    [['PLAN', '--sim', '--no-such-flag'], /unknown option/],
  ])('%j is one line, exit 2', (args, message) => {
    const r = runCli(['run', ...args.map((a) => (a === 'PLAN' ? planFile : a))], { cwd: dir });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message);
    expect(hasStackTrace(r.stderr)).toBe(false);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stdout).toBe('');
  });

  it('a damaged plan is refused with its problems, exit 2', () => {
    const bad = path.join(dir, 'bad.plan.json');
    const text = JSON.parse(readFileSync(planFile, 'utf8'));
    text.steps[1].points[0].band.mag_lo_ohm = 'low';
    writeFileSync(bad, JSON.stringify(text));
    const r = runCli(['run', bad, '--sim'], { cwd: dir });
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/bad\.plan\.json: steps\[1\]\.points\[0\]\.band\.mag_lo_ohm/);
    expect(hasStackTrace(r.stderr)).toBe(false);
  });

  it('a plan made for one board refuses another, in one line, before anything is measured', () => {
    const log = path.join(dir, 'refused.csv');
    const r = runCli(['run', planFile, '--sim', '--board', 'shared/boards/corner-8x8.yaml', '--log', log]);
    expect(r.status).toBe(2);
    expect(oneLine(r.stderr)).toHaveLength(1);
    expect(r.stderr).toMatch(/--board shared\/boards\/corner-8x8\.yaml: board corner-8x8 .* is not the board chain-24 .* that .*chain\.plan\.json was made for/);
    expect(loggedRows(log)).toEqual([]);
    // The board it was made for passes.
    const ok = runCli(['run', planFile, '--sim', '--timing', 'instant', '--board', 'shared/boards/chain-24.yaml', '--log', path.join(dir, 'accepted.csv')]);
    expect(ok.status).toBe(0);
  });

  it('an existing log is never overwritten without --resume', () => {
    const log = path.join(dir, 'exists.csv');
    writeFileSync(log, 'precious\r\n');
    const r = runCli(['run', planFile, '--sim', '--timing', 'instant', '--log', log]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/exists already; give --resume/);
    expect(readFileSync(log, 'utf8')).toBe('precious\r\n');
  });
});

describe('--json', () => {
  it('emits one parseable event per line on stdout and nothing else there', () => {
    const log = path.join(dir, 'json.csv');
    const r = runCli(['run', planFile, '--sim', '--timing', 'instant', '--fault', 'C_intra_0=open', '--json', '--log', log]);
    expect(r.status).toBe(1);
    const lines = r.stdout.split('\n').filter((l) => l !== '');
    expect(r.stdout.endsWith('\n')).toBe(true);
    const events = lines.map((l) => JSON.parse(l) as { event: string; step?: number; point?: number; flag?: string });
    expect(events[0].event).toBe('started');
    expect(events.at(-1)).toMatchObject({ event: 'done', status: 'complete', safe: true });
    for (const e of events) expect(['started', 'step-started', 'reading', 'deviation', 'warning', 'done']).toContain(e.event);
    const readings = events.filter((e) => e.event === 'reading');
    expect(readings.map((e) => `${e.step}:${e.point}`)).toEqual(planKeys(planFile));
    // Every reading reported is in the log, with the same verdict.
    expect(loggedRows(log).map((r) => `${r.step}:${r.point}:${r.flag}`)).toEqual(readings.map((e) => `${e.step}:${e.point}:${e.flag}`));
    expect(events.filter((e) => e.event === 'deviation').length).toBe(readings.filter((e) => e.flag === 'deviation').length);
  });
});

describe('the log and its meta file', () => {
  it('hold every reading and what the run was made with; a clean scan exits 0', () => {
    const log = path.join(dir, 'clean.csv');
    const r = runCli(['run', planFile, '--sim', '--timing', 'instant', '--log', log]);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/scan complete: 8 readings, 0 deviations, 0 invalid/);
    const meta = JSON.parse(readFileSync(`${log}.meta.json`, 'utf8'));
    expect(meta).toMatchObject({ status: 'complete', readings: 8, deviations: 0, mode: 'switched', board: { name: 'chain-24' }, software: { name: 'topoprobe' } });
    expect(meta.plan.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(meta.instruments.analyzer.identity.raw).toMatch(/^Topoprobe Lab,SIM-ZA100,/);
    expect(meta.instruments.switch.identity.raw).toMatch(/^Topoprobe Lab,SIM-SW256,/);
    expect(meta.board.snapshot.parts.length).toBe(board.parts.length);
    expect(readMetaFile(log).runs.map((x) => x.status)).toEqual(['complete']);
  });

  it('without --log goes to a timestamped file in the current folder, and says which', () => {
    const here = mkdtempSync(path.join(tmpdir(), 'topoprobe-run-cwd-'));
    copyFileSync(planFile, path.join(here, 'p.json'));
    const r = runCli(['run', 'p.json', '--sim', '--timing', 'instant'], { cwd: here });
    expect(r.status).toBe(0);
    const named = /logging to (\S+scan-chain-24-\d{8}T\d{6}Z\.csv)/.exec(r.stderr);
    expect(named).not.toBeNull();
    expect(path.dirname(named![1])).toBe(here);
    expect(loggedRows(named![1]).length).toBe(8);
  });
});

describe('operator-probed mode', () => {
  it('says where HI and LO go and measures after Enter on stdin', () => {
    const log = path.join(dir, 'operator.csv');
    const r = runCli(['run', operatorPlan, '--sim', '--timing', 'instant', '--log', log], { input: '\n\n\n' });
    expect(r.status).toBe(0);
    for (const node of ['n1', 'n7', 'n24']) expect(r.stderr).toContain(`put HI to ${node}, LO to gnd, then press Enter`);
    expect(loggedRows(log).map((x) => x.flag)).toEqual(Array(6).fill('ok'));
    expect(readMetaFile(log).status).toBe('complete');
  });

  it('--operator on a switched plan asks too; stdin closing early ends the run as interrupted', () => {
    const log = path.join(dir, 'operator-short.csv');
    const r = runCli(['run', planFile, '--sim', '--operator', '--timing', 'instant', '--log', log], { input: '\n' });
    expect(r.status).toBe(130);
    expect(r.stdout).toMatch(/scan interrupted \(stdin closed while waiting for the operator/);
    expect(loggedRows(log).length).toBe(2);
    expect(readMetaFile(log).status).toBe('interrupted');
  });
});
