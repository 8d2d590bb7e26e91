#!/usr/bin/env node
// The README's test command. Runs every vitest suite. Suites that need outside tools (socat for the serial
// path, Chromium for the report) check for them themselves: without the tool they skip and say so loudly,
// unless TOPOPROBE_REQUIRE_ALL=1 (as CI sets), in which case a missing tool fails the run.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

const tools = { socat: ['/usr/bin/socat', '/usr/local/bin/socat'], chromium: ['/usr/bin/chromium'] };
const missing = Object.entries(tools).filter(([, paths]) => !paths.some((p) => existsSync(p))).map(([t]) => t);
const strict = process.env.TOPOPROBE_REQUIRE_ALL === '1';
if (missing.length > 0) {
  const banner = `!!! ${missing.join(' and ')} not found: the suites that need ${missing.length > 1 ? 'them' : 'it'} will ${strict ? 'FAIL (TOPOPROBE_REQUIRE_ALL=1)' : 'be SKIPPED'} !!!`;
  process.stderr.write(`\n${'!'.repeat(banner.length)}\n${banner}\n${'!'.repeat(banner.length)}\n\n`);
}

// The json reporter gives exact counts for the closing line; the default reporter is what a person reads.
const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-test-'));
const summaryFile = path.join(dir, 'summary.json');
const vitest = spawnSync(
  process.execPath,
  ['node_modules/vitest/vitest.mjs', 'run', '--reporter=default', '--reporter=json', `--outputFile.json=${summaryFile}`, ...process.argv.slice(2)],
  { stdio: 'inherit' },
);
let status = vitest.status ?? 1;
if (existsSync(summaryFile)) {
  const s = JSON.parse(readFileSync(summaryFile, 'utf8'));
  const skipped = (s.numPendingTests ?? 0) + (s.numTodoTests ?? 0);
  process.stdout.write(`\ntests: ${s.numPassedTests} passed, ${s.numFailedTests} failed, ${skipped} skipped\n`);
  if (s.numTotalTests === 0) {
    process.stderr.write('no test ran\n');
    status = 1;
  }
}
rmSync(dir, { recursive: true, force: true });
process.exit(status);
