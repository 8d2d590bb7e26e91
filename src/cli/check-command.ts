// `topoprobe check <log>`: the deviations of a logged scan against the board it was made on, recomputed
// from the log's own board snapshot. Exit 1 when there are deviations.
import { Command } from 'commander';
import { checkScan } from '../analysis/check-scan.js';
import { loadScan } from '../analysis/load-scan.js';
import { DEFAULT_FLOOR } from '../plan/derive-plan.js';
import { formatQuantity } from '../units/quantity.js';
import { EXIT, UsageError } from './exit-codes.js';
import { textTable } from './text-table.js';

interface CheckOptions {
  json?: boolean;
  floor?: string;
}

export function checkCommand(): Command {
  return new Command('check')
    .description('compare a logged scan with the prediction recomputed from the board snapshot in its metadata')
    .argument('<log>', 'scan log (CSV) written by topoprobe run, with its .meta.json beside it')
    .option('--floor <rel,ohm,deg>', `measurement floor added to the tolerance band (default ${DEFAULT_FLOOR.relative},${DEFAULT_FLOOR.absolute_ohm},${DEFAULT_FLOOR.phase_deg}: 2 % + 0.5 ohm, 2 degrees)`)
    .option('--json', 'print the checked readings as JSON')
    .addHelpText('after', `
Each reading is judged against a first-order band from the parts' stated tolerances (combined in
quadrature, 99 % coverage) widened by the measurement floor. Exit code 1 when any reading deviates.

Examples:
  topoprobe check scan.csv
  topoprobe check scan.csv --json --floor 0.01,0.2,1`)
    .action((file: string, options: CheckOptions) => {
      const scan = loadScan(file);
      if (scan.torn) process.stderr.write(`topoprobe: ${file}: ignoring a torn last line (the run was killed mid-write)\n`);
      const floor = parseFloor(options.floor);
      const result = checkScan(scan.board, scan.readings, floor);
      if (result.stalePredictions > 0) {
        process.stderr.write(`topoprobe: warning: ${result.stalePredictions} logged predictions differ from the board snapshot's; the plan may not match this board\n`);
      }
      if (options.json) {
        process.stdout.write(JSON.stringify({ board: scan.board.name, readings: result.checked.length, deviations: result.deviations.map((d) => ({ ...d.reading, predicted: d.predicted, band: d.band, ratio: d.ratio })), invalid: result.invalid, stale_predictions: result.stalePredictions }, null, 2) + '\n');
      } else {
        const rows = result.deviations.map((d) => [
          String(d.reading.step),
          String(d.reading.point),
          d.reading.sense ? `${d.reading.hi}->${d.reading.sense}` : `${d.reading.hi}:${d.reading.lo}`,
          formatQuantity(d.reading.frequency_hz, 'Hz'),
          formatQuantity(Math.hypot(d.reading.re, d.reading.im), 'ohm'),
          formatQuantity(Math.hypot(d.predicted.re, d.predicted.im), 'ohm'),
          `${formatQuantity(d.band.mag_lo_ohm, 'ohm')} .. ${formatQuantity(d.band.mag_hi_ohm, 'ohm')}`,
          d.ratio.toFixed(3),
        ]);
        process.stdout.write(
          `board ${scan.board.name}: ${result.checked.length} readings, ${result.deviations.length} deviations, ${result.invalid} invalid\n` +
            (rows.length ? '\n' + textTable(['step', 'point', 'terminals', 'frequency', 'measured |Z|', 'predicted |Z|', 'band', 'ratio'], rows, [true, true, false, true, true, true, false, true]) : ''),
        );
      }
      process.exitCode = result.deviations.length > 0 ? EXIT.deviations : EXIT.ok;
    });
}

function parseFloor(text: string | undefined) {
  if (text === undefined) return DEFAULT_FLOOR;
  const f = text.split(',').map(Number);
  if (f.length !== 3 || f.some((x) => !Number.isFinite(x) || x < 0)) throw new UsageError(`--floor ${text}: expected three non-negative numbers REL,OHM,DEG, e.g. 0.02,0.5,2`);
  return { relative: f[0], absolute_ohm: f[1], phase_deg: f[2] };
}
