// Runs every benchmark module in this folder in turn: each *.ts file other than this one and the
// *.util.ts helpers must export `async function run(): Promise<void>`. Names given on the command line
// (`npm run bench -- runner-memory sweep`) run only the benchmarks whose file names contain one of them.
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
const wanted = process.argv.slice(2);
const chosen = wanted.length === 0 ? modules : modules.filter((f) => wanted.some((w) => f.includes(w)));
if (chosen.length === 0) {
  console.error(`no benchmark matches ${wanted.join(', ')}; there are: ${modules.map((f) => f.slice(here.length + 1, -3)).join(', ')}`);
  process.exit(2);
}

let failed = 0;
for (const file of chosen) {
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
