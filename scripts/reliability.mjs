#!/usr/bin/env node
// `npm run reliability`: runs the reliability suites (test/reliability) and prints what they tried in one
// table: faults injected and survived, kills and readings lost, bad inputs tried and clear errors, properties
// checked and cases run, safety checks held. Exit status is vitest's, so a broken promise is a red run.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-reliability-'));
const tallyFile = path.join(dir, 'tally.jsonl');
const vitest = spawnSync(process.execPath, ['node_modules/vitest/vitest.mjs', 'run', 'test/reliability', ...process.argv.slice(2)], {
  stdio: 'inherit',
  env: { ...process.env, TOPOPROBE_TALLY_FILE: tallyFile },
});
const entries = existsSync(tallyFile)
  ? readFileSync(tallyFile, 'utf8').split('\n').filter((l) => l !== '').map((l) => JSON.parse(l))
  : [];
rmSync(dir, { recursive: true, force: true });

const areas = [
  { area: 'fault', label: 'faults injected (pty, TCP, disk)', good: 'survived or stopped safe' },
  { area: 'kill', label: 'kill -9 then resume', good: 'resumed whole' },
  { area: 'bad-input', label: 'bad inputs (files, flags)', good: 'one clear line, exit 2' },
  { area: 'property', label: 'properties (fast-check)', good: 'no counterexample' },
  { area: 'safety', label: 'safety and security checks', good: 'held' },
];
const rows = areas.map(({ area, label, good }) => {
  const mine = entries.filter((e) => e.area === area);
  const sum = (k) => mine.reduce((s, e) => s + (e[k] ?? 0), 0);
  return {
    label,
    tried: mine.length,
    cases: sum('cases'),
    ok: `${mine.filter((e) => e.ok).length} ${good}`,
    lost: sum('lost'),
    duplicated: sum('duplicated'),
  };
});
const header = ['what', 'tried', 'cases run', 'came out right', 'readings lost', 'readings twice'];
const table = [header, ...rows.map((r) => [r.label, String(r.tried), String(r.cases), r.ok, String(r.lost), String(r.duplicated)])];
const widths = header.map((_, i) => Math.max(...table.map((row) => row[i].length)));
const line = (row) => `| ${row.map((c, i) => c.padEnd(widths[i])).join(' | ')} |`;
process.stdout.write(`\n${line(header)}\n|${widths.map((w) => '-'.repeat(w + 2)).join('|')}|\n`);
for (const row of table.slice(1)) process.stdout.write(`${line(row)}\n`);
const failed = entries.filter((e) => !e.ok);
for (const e of failed) process.stdout.write(`NOT RIGHT: ${e.area}: ${e.name}\n`);
if (entries.length === 0) process.stderr.write('reliability: no suite reported anything\n');
process.exit(vitest.status === 0 && failed.length === 0 && entries.length > 0 ? 0 : 1);
