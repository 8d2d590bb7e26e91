// The whole job as `npm run demo` does it (predict, plan, run on the simulated bench with an open joint
// seeded at C_intra_0, check, diagnose, report): it must end with the report's path, and the report must show
// the fault and name the right part. The truth is the fault the demo gives the simulated bench.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { ROOT } from '../support/run-cli.js';

const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-demo-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('npm run demo', () => {
  it('ends with the path of a report that shows the seeded open joint and blames C_intra_0', () => {
    const r = spawnSync(process.execPath, [path.join(ROOT, 'scripts', 'demo.mjs'), dir], { cwd: ROOT, encoding: 'utf8', timeout: 120_000 });
    expect(r.status, r.stderr.slice(-2000)).toBe(0);
    const lines = r.stdout.trim().split('\n');
    const report = lines.at(-1)!;
    expect(report).toBe(path.join(dir, 'chain-24-report.html'));
    expect(existsSync(report)).toBe(true);
    const html = readFileSync(report, 'utf8');
    expect(html).toContain('one part explains the deviations: C_intra_0 (n1–n2): open (missing or not soldered)');
    expect(html).toContain('Fitted over the board as diagnosed (C_intra_0 (n1–n2): open');
    // The run flagged deviations (check exits 1 on them) and the diagnosis in the terminal agrees.
    expect(r.stdout).toMatch(/diagnosis of board chain-24 \(\d+ readings, 0 invalid skipped\): single-part/);
  });
});
