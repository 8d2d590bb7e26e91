// Outside tools some suites need. Without them a suite is skipped with a loud notice, except under
// TOPOPROBE_REQUIRE_ALL=1 (CI), where the missing tool makes the suite fail instead.
import { existsSync } from 'node:fs';

const locations: Record<string, string[]> = {
  socat: ['/usr/bin/socat', '/usr/local/bin/socat'],
  chromium: ['/usr/bin/chromium'],
};

export const requireAll = process.env.TOPOPROBE_REQUIRE_ALL === '1';

/** True when the tool is present; otherwise warns (or throws under TOPOPROBE_REQUIRE_ALL=1). */
export function toolAvailable(tool: keyof typeof locations): boolean {
  if (locations[tool].some((p) => existsSync(p))) return true;
  if (requireAll) throw new Error(`${tool} is required (TOPOPROBE_REQUIRE_ALL=1) but not installed`);
  process.stderr.write(`\n!!! SKIPPING: ${tool} is not installed; install it to run this suite !!!\n\n`);
  return false;
}
