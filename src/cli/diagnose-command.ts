// `topoprobe diagnose <log>`: which single part (or fixture path) best explains a scan's deviations.
import { Command } from 'commander';
import { diagnose } from '../analysis/diagnose.js';
import type { Diagnosis, Candidate } from '../analysis/diagnose-types.js';
import { loadScan } from '../analysis/load-scan.js';
import { formatQuantity } from '../units/quantity.js';
import { UsageError } from './exit-codes.js';
import { parseCount } from './frequency-options.js';
import { textTable } from './text-table.js';

interface DiagnoseOptions {
  json?: boolean;
  limit: string;
  noise?: string;
  parts?: string;
  floor: string;
}

/** The fixture's absolute floor assumed by default: the planner's measurement floor (contacts and leads). */
export const DIAGNOSE_FLOOR_OHMS = 0.5;

export function diagnoseCommand(): Command {
  return new Command('diagnose')
    .description('rank the parts (or fixture paths) that best explain the deviations of a logged scan')
    .argument('<log>', 'scan log (CSV) written by topoprobe run, with its .meta.json beside it')
    .option('--limit <n>', 'how many candidates to list', '5')
    .option('--noise <relative>', 'relative scatter of one reading to assume (default 1e-3); raise it for a noisy fixture')
    .option('--floor <ohms>', 'absolute floor of a reading (fixture contacts and leads): readings this small say little', String(DIAGNOSE_FLOOR_OHMS))
    .option('--parts <refs>', 'only consider these parts, comma separated')
    .option('--json', 'print the diagnosis as JSON')
    .addHelpText(
      'after',
      `
Each part is tried with the value change (searched over decades, so a part of the wrong decade shows as
such), open and short that best explain all readings together; each fixture path is tried with a series
resistance or an open contact. The share is how much of the deviation an explanation accounts for.

Examples:
  topoprobe diagnose scan.csv
  topoprobe diagnose scan.csv --json --limit 10`,
    )
    .action((file: string, options: DiagnoseOptions) => {
      const d = runDiagnose(file, options);
      process.stdout.write(options.json ? JSON.stringify(d, null, 2) + '\n' : diagnosisText(d));
    });
}

export function runDiagnose(file: string, options: Partial<DiagnoseOptions>): Diagnosis {
  const scan = loadScan(file);
  if (scan.torn) process.stderr.write(`topoprobe: ${file}: ignoring a torn last line (the run was killed mid-write)\n`);
  let noise: number | undefined;
  if (options.noise !== undefined) {
    noise = Number(options.noise);
    if (!(noise > 0 && noise < 1)) throw new UsageError(`--noise ${options.noise}: expected a relative scatter between 0 and 1, e.g. 3e-3`);
  }
  const limit = parseCount(options.limit ?? '5', '--limit', 1000);
  const floorOhms = Number(options.floor ?? DIAGNOSE_FLOOR_OHMS);
  if (!(floorOhms >= 0) || !Number.isFinite(floorOhms)) throw new UsageError(`--floor ${options.floor}: expected a resistance in ohms, e.g. 0.5`);
  const parts = options.parts?.split(',').map((s) => s.trim()).filter(Boolean);
  return diagnose(scan.board, scan.readings, { limit, floorOhms, ...(noise !== undefined ? { noise } : {}), ...(parts ? { parts } : {}) });
}

export function diagnosisText(d: Diagnosis): string {
  const rows = d.candidates.map((c, i) => [String(i + 1), c.ref, changeText(c), `${(100 * c.share).toFixed(1)} %`]);
  return (
    `diagnosis of board ${d.board} (${d.readings.used} readings, ${d.readings.skipped} invalid skipped): ${d.verdict}\n${d.message}\n\n` +
    textTable(['#', 'candidate', 'change', 'explains'], rows, [true, false, false, true]) +
    d.notes.map((n) => `note: ${n}\n`).join('')
  );
}

function changeText(c: Candidate): string {
  if (c.subject === 'fixture') {
    return c.change.kind === 'series-resistance' ? `series resistance ${formatQuantity(c.change.ohms, 'ohm')}` : 'open contact';
  }
  const unit = c.kind === 'C' ? 'F' : c.kind === 'L' ? 'H' : 'ohm';
  switch (c.change.kind) {
    case 'open':
      return 'open';
    case 'short':
      return `short (${formatQuantity(c.change.ohms, 'ohm')})`;
    case 'value': {
      const decades = c.change.decades === 0 ? '' : `, ${Math.abs(c.change.decades)} decade${Math.abs(c.change.decades) > 1 ? 's' : ''} ${c.change.decades > 0 ? 'high' : 'low'}`;
      return `${formatQuantity(c.nominal, unit)} placed, reads as ${formatQuantity(c.change.value, unit)} (nearest ${c.change.nearest.series} ${formatQuantity(c.change.nearest.value, unit)}${decades})`;
    }
  }
}
