// The analysis verbs on a real logged scan: plan -> run --sim with a seeded open joint -> check, diagnose,
// fit, report, all through the launcher as a user runs them. The physics reference is the engine's
// prediction; the seeded fault (C_intra_0 between n1 and n2, open) cuts n1 off from the chain, so the
// deviations must sit at the left end and the diagnosis must name that part first.
import { mkdtempSync, readFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { hasStackTrace, runCli } from '../support/run-cli.js';

const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-analysis-'));
const plan = path.join(dir, 'chain.plan.json');
const log = path.join(dir, 'scan.csv');

beforeAll(() => {
  const p = runCli(['plan', 'shared/boards/chain-24.yaml', '-o', plan, '--bands', 'first-order']);
  expect(p.status).toBe(0);
  const r = runCli(['run', plan, '--sim', '--fault', 'C_intra_0=open', '--timing', 'instant', '--log', log]);
  expect(r.status).toBe(1); // deviations flagged
}, 180_000);

describe('check', () => {
  it('finds deviations at the cut-off end only and exits 1', () => {
    const r = runCli(['check', log, '--json']);
    expect(r.status).toBe(1);
    const doc = JSON.parse(r.stdout);
    expect(doc.deviations.length).toBeGreaterThan(0);
    const nodes = new Set<string>(doc.deviations.map((d: { hi: string }) => d.hi));
    expect(nodes.has('n1')).toBe(true);
    // far from the fault (the right half of the chain, away from the other edge) nothing deviates
    for (const far of ['n12', 'n13', 'n14', 'n15', 'n16']) expect(nodes.has(far)).toBe(false);
  });
});

describe('diagnose', () => {
  it('ranks the open joint first', () => {
    const r = runCli(['diagnose', log, '--json']);
    expect(r.status).toBe(0);
    const d = JSON.parse(r.stdout);
    expect(d.candidates[0].ref).toBe('C_intra_0');
    expect(d.candidates[0].change.kind).toBe('open');
    // The simulated fixture (contacts, leads, strays) is fitted apart, so the open joint explains it all.
    expect(d.verdict).toBe('single-part');
  });
});

describe('fit', () => {
  it('converges and writes a fitted board that loads again', () => {
    const out = path.join(dir, 'fitted.yaml');
    const r = runCli(['fit', log, '--json', '-o', out]);
    expect(r.status).toBe(0);
    const f = JSON.parse(r.stdout);
    expect(f.converged).toBe(true);
    expect(f.parameters.length).toBe(3);
    expect(existsSync(out)).toBe(true);
    expect(runCli(['predict', out, '--freq', '163.6k', '--node', 'n12', '--json']).status).toBe(0);
  });

  it('--as-diagnosed measures the rest of the board: the bench built every other part at its nominal value', () => {
    // The truth is the simulated bench's board as built: nominal parts (coil esr as stated) but C_intra_0.
    const r = runCli(['fit', log, '--json', '--as-diagnosed']);
    expect(r.status).toBe(0);
    const f = JSON.parse(r.stdout);
    expect(f.basis).toMatch(/^Fitted over the board as diagnosed \(C_intra_0 \(n1–n2\): open/);
    for (const p of f.parameters as { nominal: number; value: number; sigma: number }[]) {
      expect(Math.abs(p.value - p.nominal)).toBeLessThan(Math.max(3 * p.sigma, 1e-4 * p.nominal));
    }
  });
});

describe('report', () => {
  it('writes one self-contained HTML file naming the board and the leading candidate', () => {
    const out = path.join(dir, 'scan.html');
    const r = runCli(['report', log, '-o', out]);
    expect(r.status).toBe(0);
    expect(r.stdout.trim()).toBe(out);
    const html = readFileSync(out, 'utf8');
    expect(html).toContain('chain-24');
    expect(html).toContain('C_intra_0');
    expect(html).not.toMatch(/<script[^>]+src=|<link[^>]+href=["']https?:/i);
  });
});

describe('bad input: one line, exit 2', () => {
  it.each([
    [['check', path.join(dir, 'missing.csv')], /missing\.csv/],
    [['diagnose', log, '--noise', '7'], /--noise 7/],
    [['fit', log, '--scale', 'R'], /--scale R/],
    [['report', log, '-o', path.join(dir, 'x.pdf')], /\.html/],
    [['check', plan], /plan|meta|columns/],
  ])('%j', (args, message) => {
    const r = runCli(args as string[]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message as RegExp);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(hasStackTrace(r.stderr)).toBe(false);
  });
});
