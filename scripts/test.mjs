#!/usr/bin/env node
// The README's test command. Runs every vitest suite. Suites that need outside tools (socat for the serial
// path, Chromium for the report) check for them themselves: without the tool they skip and say so loudly,
// unless TOPOPROBE_REQUIRE_ALL=1 (as CI sets), in which case a missing tool fails the run.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const tools = { socat: ['/usr/bin/socat', '/usr/local/bin/socat'], chromium: ['/usr/bin/chromium'] };
const missing = Object.entries(tools).filter(([, paths]) => !paths.some((p) => existsSync(p))).map(([t]) => t);
const strict = process.env.TOPOPROBE_REQUIRE_ALL === '1';
if (missing.length > 0) {
  const banner = `!!! ${missing.join(' and ')} not found: the suites that need ${missing.length > 1 ? 'them' : 'it'} will ${strict ? 'FAIL (TOPOPROBE_REQUIRE_ALL=1)' : 'be SKIPPED'} !!!`;
  process.stderr.write(`\n${'!'.repeat(banner.length)}\n${banner}\n${'!'.repeat(banner.length)}\n\n`);
}
const vitest = spawnSync(process.execPath, ['node_modules/vitest/vitest.mjs', 'run', ...process.argv.slice(2)], {
  stdio: 'inherit',
});
process.exit(vitest.status ?? 1);
