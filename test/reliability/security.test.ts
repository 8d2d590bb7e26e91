// Security of the tool and its simulator:
//   - the simulated bench listens on loopback only, and refuses to be told otherwise;
//   - the report shows every string from a file as text: a board named <script>…</script>, a part and a node
//     named as markup, and file names with markup in them render literally in headless Chromium, with no
//     script run, no element made from them and no console error;
//   - no user string reaches a shell: child processes are started from an argument array only (checked in
//     the source), and paths written as shell commands create nothing (checked at run time).
// Escaping follows the HTML living standard's rules for text and attribute values (common practice: escape
// & < > " '). Every check is tallied (area "safety").
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import net from 'node:net';
import { networkInterfaces, tmpdir } from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { toolAvailable } from '../support/requirements.js';
import { tally } from '../support/reliability-tally.js';
import { runCliInProcess } from '../support/run-cli-in-process.js';
import { hasStackTrace, ROOT, runCli } from '../support/run-cli.js';
import { startSim, type SimProcess } from '../support/sim-process.js';
import { connectScpi, splitEndpoint } from './support/bench-client.js';

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-security-'));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Resolves with the error code of a TCP connection attempt, or "connected". */
function tryConnect(host: string, port: number): Promise<string> {
  return new Promise((resolve) => {
    const socket = net.connect({ host, port });
    const timer = setTimeout(() => (socket.destroy(), resolve('no answer')), 5_000);
    socket.once('connect', () => (clearTimeout(timer), socket.destroy(), resolve('connected')));
    socket.once('error', (e: NodeJS.ErrnoException) => (clearTimeout(timer), resolve(e.code ?? e.message)));
  });
}

describe('the simulator listens on loopback only', () => {
  let sim: SimProcess;
  beforeAll(async () => {
    sim = await startSim(['--tcp', '0', '--timing', 'instant']);
  });
  afterAll(async () => {
    await sim?.stop();
  });

  it('prints 127.0.0.1 addresses, answers there, and refuses connections on every other address of this machine', async () => {
    const endpoints = [sim.endpoints.analyzer, sim.endpoints.switch];
    const client = await connectScpi(sim.endpoints.switch);
    const identity = await client.ask('*IDN?');
    client.close();
    // Every address of this machine that is not loopback (IPv4 and IPv6; link-local IPv6 needs its scope).
    const others = Object.entries(networkInterfaces()).flatMap(([name, list]) =>
      (list ?? []).filter((a) => !a.internal).map((a) => (a.family === 'IPv6' && a.address.startsWith('fe80') ? `${a.address}%${name}` : a.address)),
    );
    const attempts = await Promise.all(others.flatMap((host) => endpoints.map(async (e) => ({ host, port: splitEndpoint(e)[1], result: await tryConnect(host, splitEndpoint(e)[1]) }))));
    const ok = endpoints.every((e) => /^127\.0\.0\.1:\d+$/.test(e)) && /^Topoprobe Lab,SIM-SW/.test(identity) && attempts.every((a) => a.result === 'ECONNREFUSED');
    tally({ area: 'safety', name: `security: simulator on loopback only (${others.length} other address${others.length === 1 ? '' : 'es'} tried)`, ok });
    for (const e of endpoints) expect(e).toMatch(/^127\.0\.0\.1:\d+$/);
    expect(identity).toMatch(/^Topoprobe Lab,SIM-SW/);
    if (others.length === 0) process.stderr.write('security: this machine has no address besides loopback; only the printed addresses were checked\n');
    for (const a of attempts) expect(a, `${a.host}:${a.port}`).toMatchObject({ result: 'ECONNREFUSED' });
  });

  it.each([
    [['--tcp', '0.0.0.0:5025'], /--tcp 0\.0\.0\.0:5025: give a port only; the simulated bench listens on 127\.0\.0\.1/],
    [['--tcp', '[::]:5025'], /--tcp \[::\]:5025: give a port only/],
    [['--tcp', 'localhost:5025'], /--tcp localhost:5025: give a port only/],
    [['--tcp', '192.0.2.2'], /--tcp 192\.0\.2\.2: give a port only/],
    [['--tcp', '0', '--host', '0.0.0.0'], /unknown option '--host'/],
    [['--tcp', '0', '--bind', '0.0.0.0'], /unknown option '--bind'/],
  ])('sim %j is refused with one line, exit 2', async (args, message) => {
    const r = await runCliInProcess(['sim', ...args]);
    const ok = r.status === 2 && r.stderr.trim().split('\n').length === 1 && message.test(r.stderr) && !hasStackTrace(r.stderr) && r.stdout === '';
    tally({ area: 'safety', name: `security: sim ${args.join(' ')} refused`, ok });
    expect(r.status).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(message);
    expect(r.stdout).toBe('');
  });
});

const EVIL_BOARD = '<script>window.__pwned=1</script>';
const EVIL_PART = '<img src=x onerror=window.__pwned=3>';
const EVIL_NODE = '<svg/onload=window.__pwned=4>';
// File names may carry markup too (the report shows the board, plan and log paths).
const EVIL_FILE = `<pwn-tag title="x" onclick='window.__pwned=5'>&amp;`;

describe.skipIf(!toolAvailable('chromium'))('the report escapes every string from a file (headless Chromium)', () => {
  it('a scan of a board named as markup, with parts, nodes and files named as markup, shows them all as text and runs nothing', async () => {
    const work = path.join(dir, 'report');
    rmSync(work, { recursive: true, force: true });
    mkdirSync(work);
    const board = {
      name: EVIL_BOARD,
      description: '<iframe src="javascript:window.__pwned=2">',
      components: [
        { ref: EVIL_PART, kind: 'C', nodes: ['n1', EVIL_NODE], value: '10nF', tolerance: '5%' },
        { ref: 'C2', kind: 'C', nodes: [EVIL_NODE, 'gnd'], value: '33nF', tolerance: '5%' },
        { ref: 'C3', kind: 'C', nodes: ['n1', 'gnd'], value: '33nF', tolerance: '5%' },
        { ref: 'L1', kind: 'L', nodes: ['n1', 'gnd'], value: '22uH', tolerance: '10%', q: 50, q_at: '100kHz' },
        { ref: 'L2', kind: 'L', nodes: [EVIL_NODE, 'gnd'], value: '22uH', tolerance: '10%', q: 50, q_at: '100kHz' },
      ],
    };
    const boardFile = path.join(work, `board-${EVIL_FILE}.json`);
    const planFile = path.join(work, `plan-${EVIL_FILE}.json`);
    const logFile = path.join(work, `scan-${EVIL_FILE}.csv`);
    const reportFile = path.join(work, 'report.html');
    writeFileSync(boardFile, JSON.stringify(board));
    for (const args of [
      ['plan', boardFile, '-o', planFile, '--samples', '30'],
      // C2 off by half as much again: the diagnosis names it, and the deviation rows name the evil node.
      ['run', planFile, '--sim', '--timing', 'instant', '--fault', 'C2=47nF', '--log', logFile],
      ['report', logFile, '-o', reportFile, '--fit'],
    ]) {
      const r = await runCliInProcess(args);
      expect([0, 1], `${args[0]}: ${r.stderr}`).toContain(r.status);
    }

    const browser = await chromium.launch({
      executablePath: '/usr/bin/chromium',
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const page = await browser.newPage();
      const url = pathToFileURL(reportFile).href;
      const problems: string[] = [];
      page.on('console', (m) => {
        if (m.type() === 'error' || m.type() === 'warning') problems.push(`console ${m.type()}: ${m.text()}`);
      });
      page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
      page.on('dialog', (d) => (problems.push(`dialog: ${d.message()}`), void d.dismiss()));
      page.on('request', (r) => {
        if (r.url() !== url) problems.push(`request: ${r.url()}`);
      });
      await page.goto(url, { waitUntil: 'load' });
      // Click everything that could carry a handler made from a file string.
      await page.locator('h1').click();
      const seen = await page.evaluate(() => ({
        pwned: (window as unknown as { __pwned?: unknown }).__pwned,
        text: document.body.innerText,
        title: document.title,
        made: document.querySelectorAll('script, img, iframe, pwn-tag, [onload], [onerror], [onclick]').length,
      }));
      const shows = (s: string) => seen.text.includes(s);
      const ok =
        seen.pwned === undefined &&
        seen.made === 0 &&
        seen.title.includes(EVIL_BOARD) &&
        shows(EVIL_BOARD) &&
        shows(EVIL_PART) &&
        shows(EVIL_NODE) &&
        shows(EVIL_FILE) &&
        problems.length === 0;
      tally({ area: 'safety', name: 'security: report shows markup from files as text in Chromium', ok });
      expect(seen.pwned).toBeUndefined();
      expect(seen.made).toBe(0);
      expect(seen.title).toBe(`Scan report: ${EVIL_BOARD}`);
      for (const s of [EVIL_BOARD, EVIL_PART, EVIL_NODE, EVIL_FILE]) expect(shows(s), s).toBe(true);
      // The part leads the diagnosis or the fit by its name, as text.
      expect(await page.locator('table', { hasText: 'C2' }).count()).toBeGreaterThan(0);
      expect(problems).toEqual([]);
    } finally {
      await browser.close();
    }
  });
});

describe('no user string reaches a shell', () => {
  /** Every .ts/.mjs/.js file under the folders the product is made of. */
  function sources(): string[] {
    const out: string[] = [];
    const walk = (d: string) => {
      for (const name of readdirSync(d)) {
        const p = path.join(d, name);
        if (statSync(p).isDirectory()) walk(p);
        else if (/\.(ts|mts|mjs|js)$/.test(name)) out.push(p);
      }
    };
    for (const folder of ['src', 'simulators', 'bin', 'scripts']) walk(path.join(ROOT, folder));
    return out;
  }

  it('child processes are spawned with an argument array, never through a shell', () => {
    const findings: string[] = [];
    let spawners = 0;
    for (const file of sources()) {
      const text = readFileSync(file, 'utf8');
      const where = path.relative(ROOT, file);
      if (!/child_process|node:child_process/.test(text)) continue;
      spawners++;
      // exec/execSync always run a shell; execFile is fine only without shell: true.
      for (const m of text.matchAll(/\b(exec|execSync)\s*\(/g)) findings.push(`${where}: ${m[0]}`);
      for (const m of text.matchAll(/\bshell\s*:\s*(?!false)/g)) findings.push(`${where}: ${m[0]}`);
      // spawn/spawnSync/execFile/execFileSync/fork: the program, then an array literal of arguments.
      for (const m of text.matchAll(/\b(spawn|spawnSync|execFile|execFileSync)\s*\(([^,()]+),\s*([^\s])/g)) {
        if (m[3] !== '[') findings.push(`${where}: ${m[1]}(${m[2]}, ${m[3]}… without an argument array`);
      }
    }
    const ok = findings.length === 0 && spawners > 0;
    tally({ area: 'safety', name: 'security: no shell in child processes (source scan)', ok });
    expect(spawners).toBeGreaterThan(0); // the scan finds the spawning modules (pty server, scripts)
    expect(findings).toEqual([]);
  });

  it('paths written as shell commands are only names: nothing is run, nothing but those files is made', async () => {
    const work = path.join(dir, 'shell');
    rmSync(work, { recursive: true, force: true });
    mkdirSync(work);
    const planName = 'x;touch PWNED1.plan.json';
    const logName = '$(touch PWNED2).csv';
    const traceName = '`touch PWNED3`.trace';
    const reportName = 'r|touch PWNED4&.html';
    const board = path.join(ROOT, 'shared/boards/tank-3.json');
    const inWork = (f: string) => path.join(work, f);
    const planned = await runCliInProcess(['plan', board, '-o', inWork(planName), '--samples', '20']);
    // The real launcher for the run, in the folder, so that a shell anywhere in its start would show there.
    const ran = runCli(['run', planName, '--sim', '--timing', 'instant', '--log', logName, '--trace', traceName], { cwd: work });
    const reported = await runCliInProcess(['report', inWork(logName), '-o', inWork(reportName)]);
    const predicted = await runCliInProcess(['predict', inWork('nope;touch PWNED5.yaml')]);
    const simmed = await runCliInProcess(['sim', '--board', inWork('$(touch PWNED6).yaml'), '--tcp', '0']);
    const made = readdirSync(work).sort();
    // A shell would have made them in the folder it ran in: the work folder or, in process, the project root.
    const pwned = [...made, ...readdirSync(ROOT)].filter((f) => /^PWNED/.test(f));
    const ok =
      pwned.length === 0 &&
      planned.status === 0 &&
      [0, 1].includes(ran.status ?? -1) &&
      reported.status === 0 &&
      [planName, logName, traceName, reportName].every((f) => made.includes(f)) &&
      predicted.status === 2 &&
      simmed.status === 2;
    tally({ area: 'safety', name: 'security: shell-like paths create no file by a shell', ok });
    expect(planned.status, planned.stderr).toBe(0);
    expect([0, 1], ran.stderr).toContain(ran.status);
    expect(reported.status, reported.stderr).toBe(0);
    expect(predicted.status).toBe(2);
    expect(predicted.stderr).toMatch(/nope;touch PWNED5\.yaml/);
    expect(simmed.status).toBe(2);
    expect(simmed.stderr).toMatch(/\$\(touch PWNED6\)\.yaml/);
    for (const f of [planName, logName, traceName, reportName]) expect(made).toContain(f);
    expect(pwned).toEqual([]);
  });
});
