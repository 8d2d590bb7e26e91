// `topoprobe report <log> -o FILE.html`: one self-contained HTML page of a scan: the board coloured by
// measured and predicted |Z|, the profile with its bands, the sweeps, the signed transfer profile, the
// deviations, the diagnosis and (with --fit) the fit.
import { existsSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { Command } from 'commander';
import { diagnose } from '../analysis/diagnose.js';
import { fitBoard } from '../analysis/fit.js';
import { boardAsDiagnosed } from '../analysis/board-as-diagnosed.js';
import { fitBasisText } from './fit-basis.js';
import { loadScan } from '../analysis/load-scan.js';
import { loadPlan } from '../plan/read-plan.js';
import type { ScanPlan } from '../plan/types.js';
import { sha256OfFile } from '../log/plan-file-hash.js';
import { renderReport } from '../report/render-report.js';
import type { ReportBand, ReportInput } from '../report/report-input.js';
import { VERSION } from '../version.js';
import { UsageError } from './exit-codes.js';
import { DIAGNOSE_FLOOR_OHMS } from './diagnose-command.js';

interface ReportOptions {
  output?: string;
  plan?: string;
  fit?: boolean;
}

export function reportCommand(): Command {
  return new Command('report')
    .description('write a self-contained HTML report of a logged scan (nothing is fetched when it is opened)')
    .argument('<log>', 'scan log (CSV) written by topoprobe run, with its .meta.json beside it')
    .requiredOption('-o, --output <file.html>', 'where to write the report')
    .option('--plan <file>', 'the plan the scan ran (default: the plan file named in the log metadata, if it is still there and unchanged)')
    .option('--fit', 'also fit the global scales and coil resistance and show the result')
    .addHelpText('after', `
Examples:
  topoprobe report scan.csv -o scan.html
  topoprobe report scan.csv -o scan.html --fit`)
    .action((file: string, options: ReportOptions) => {
      const out = runReport(file, options);
      process.stdout.write(`${out}\n`);
    });
}

export function runReport(file: string, options: ReportOptions): string {
  if (!options.output || !/\.html?$/i.test(options.output)) throw new UsageError(`-o ${options.output ?? ''}: give an output file ending in .html`);
  const scan = loadScan(file);
  const plan = findPlan(scan.meta.plan.file, scan.meta.plan.sha256, options.plan, file);
  const bands: ReportBand[] = [];
  for (const step of plan?.steps ?? []) step.points.forEach((p, i) => bands.push({ step: step.step, point: i + 1, ...p.band }));
  const diagnosis = diagnose(scan.board, scan.readings, { floorOhms: DIAGNOSE_FLOOR_OHMS });
  // The fit measures the rest of the board: over the board as diagnosed, seen through the fitted fixture.
  const basis = boardAsDiagnosed(scan.board, diagnosis);
  const fitted = options.fit
    ? fitBoard(basis?.board ?? scan.board, scan.readings, { capacitanceScale: true, inductanceScale: true, inductorResistance: { form: 'ohms' } }, { leads: diagnosis.leads })
    : undefined;
  const fit = fitted ? { ...fitted, message: `${fitBasisText(basis, diagnosis.leads !== undefined)} ${fitted.message}` } : undefined;
  const input: ReportInput = {
    board: scan.board,
    readings: scan.readings,
    bands,
    modes: plan?.modes ?? [],
    diagnosis,
    ...(fit ? { fit } : {}),
    meta: {
      board: scan.meta.board.name,
      started: scan.meta.started,
      ended: scan.meta.ended,
      status: scan.meta.status,
      instruments: [
        { role: 'analyzer', identity: scan.meta.instruments.analyzer.identity?.raw ?? null, profile: scan.meta.instruments.analyzer.profile, address: scan.meta.instruments.analyzer.address },
        ...(scan.meta.instruments.switch
          ? [{ role: 'switch', identity: scan.meta.instruments.switch.identity?.raw ?? null, profile: scan.meta.instruments.switch.profile, address: scan.meta.instruments.switch.address }]
          : []),
      ],
      software: { name: 'topoprobe', version: VERSION },
      plan: { file: scan.meta.plan.file, sha256: scan.meta.plan.sha256 },
      log: file,
      simulated: scan.meta.simulated ? { faults: scan.meta.simulated.faults, seed: scan.meta.simulated.seed } : null,
    },
  };
  const html = renderReport(input);
  try {
    writeFileSync(options.output, html);
  } catch (err) {
    throw new UsageError(`${options.output}: cannot write the report: ${(err as Error).message}`);
  }
  return path.resolve(options.output);
}

/** The plan of the scan, for its bands and modes; a changed or missing plan is skipped, with a note. */
function findPlan(recorded: string, sha256: string, given: string | undefined, log: string): ScanPlan | undefined {
  const candidates = given ? [given] : [recorded, path.resolve(path.dirname(log), recorded)];
  for (const file of candidates) {
    if (!existsSync(file)) {
      // A plan named on the command line that is not there is a mistake, not a reason to leave bands out.
      if (given) throw new UsageError(`--plan ${given}: no such file`);
      continue;
    }
    if (sha256OfFile(file) !== sha256) {
      if (given) throw new UsageError(`--plan ${given}: not the plan this scan ran (its sha256 differs from the log's)`);
      process.stderr.write(`topoprobe: ${file} has changed since the scan; the report leaves out its bands and modes\n`);
      return undefined;
    }
    return loadPlan(file);
  }
  process.stderr.write(`topoprobe: the plan ${recorded} is not found; the report leaves out its bands and modes\n`);
  return undefined;
}
