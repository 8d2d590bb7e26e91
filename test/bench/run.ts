// Runs every benchmark module in this folder in turn: each *.ts file other than this one and the
// *.util.ts helpers must export `async function run(): Promise<void>`.
import { readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const self = fileURLToPath(import.meta.url);

const modules = readdirSync(here)
  .filter((f) => f.endsWith('.ts') && !f.endsWith('.util.ts') && !f.endsWith('.d.ts'))
  .map((f) => join(here, f))
  .filter((f) => f !== self)
  .sort();

let failed = 0;
for (const file of modules) {
  const mod = (await import(pathToFileURL(file).href)) as { run?: () => Promise<void> };
  if (typeof mod.run !== 'function') {
    console.error(`${file}: no exported run()`);
    failed++;
    continue;
  }
  try {
    await mod.run();
  } catch (err) {
    console.error(`${file}: ${err instanceof Error ? err.message : String(err)}`);
    failed++;
  }
}
if (failed > 0) process.exitCode = 1;
