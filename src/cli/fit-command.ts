// `topoprobe fit <log>`: fit component values, losses and spread to a logged scan; write the fitted board.
import { Command } from 'commander';
import { fitBoard } from '../analysis/fit.js';
import { FitSpecError, type FitSpecField } from '../analysis/fit-errors.js';
import { boardAsDiagnosed } from '../analysis/board-as-diagnosed.js';
import { diagnose } from '../analysis/diagnose.js';
import type { CommonLeads } from '../analysis/diagnose-leads.js';
import { DIAGNOSE_FLOOR_OHMS } from './diagnose-command.js';
import { fitBasisText } from './fit-basis.js';
import type { FitSpec } from '../analysis/fit-spec.js';
import { loadScan } from '../analysis/load-scan.js';
import { writeBoard } from '../board/write-board.js';
import { formatQuantity } from '../units/quantity.js';
import { EXIT, UsageError } from './exit-codes.js';
import { parseFrequency } from './frequency-options.js';
import { textTable } from './text-table.js';

interface FitOptions {
  scale?: string;
  coilResistance?: boolean;
  coilQ?: string;
  parts?: string;
  allParts?: boolean;
  output?: string;
  overwrite?: boolean;
  json?: boolean;
  asDiagnosed?: boolean;
}

export function fitCommand(): Command {
  return new Command('fit')
    .description('fit component values, losses and spread to a logged scan (Levenberg-Marquardt on adjoint sensitivities)')
    .argument('<log>', 'scan log (CSV) written by topoprobe run, with its .meta.json beside it')
    .option('--scale <C,L>', 'global scale factors to fit: C, L or C,L')
    .option('--coil-resistance', 'fit one series resistance shared by every inductor')
    .option('--coil-q <freq>', 'fit the inductors\' Q at this frequency instead of a resistance')
    .option('--parts <refs>', 'fit the values of these parts, comma separated')
    .option('--all-parts', 'fit every part (each held weakly toward nominal by its tolerance); reports the spread')
    .option('-o, --output <file>', 'write the fitted board as a board file (YAML)')
    .option('--overwrite', 'replace the output file if it exists')
    .option('--as-diagnosed', 'diagnose the scan first, then fit over the board with the blamed part changed as found, seen through the fitted fixture')
    .option('--json', 'print the fit result as JSON')
    .addHelpText(
      'after',
      `
Without a parameter flag the global scales and the coil resistance are fitted (--scale C,L --coil-resistance).
Residuals are in log|Z| and phase; uncertainties come from the Jacobian at the solution. On a scan with a
faulty part, fit with --as-diagnosed (or after the repair): otherwise every parameter bends to imitate the fault.

Examples:
  topoprobe fit scan.csv
  topoprobe fit scan.csv --all-parts -o fitted.yaml
  topoprobe fit scan.csv --as-diagnosed
  topoprobe fit scan.csv --parts C_intra_3,L_tanka_5 --json`,
    )
    .action((file: string, options: FitOptions) => {
      const scan = loadScan(file);
      const spec = fitSpec(options);
      let board = scan.board;
      let leads: CommonLeads | undefined;
      let basis = '';
      if (options.asDiagnosed) {
        const diagnosis = diagnose(scan.board, scan.readings, { floorOhms: DIAGNOSE_FLOOR_OHMS });
        const found = boardAsDiagnosed(scan.board, diagnosis);
        board = found?.board ?? board;
        leads = diagnosis.leads;
        basis = fitBasisText(found, leads !== undefined);
      }
      const result = withFlagNames(() => fitBoard(board, scan.readings, spec, { leads }), options);
      if (options.output && result.converged) writeBoard(result.board, options.output, { overwrite: options.overwrite, comment: `fitted by topoprobe fit to ${file}` });
      if (options.json) {
        const { board: _board, ...rest } = result;
        process.stdout.write(JSON.stringify(options.asDiagnosed ? { basis, ...rest } : rest, null, 2) + '\n');
      } else {
        const rows = result.parameters.map((p) => [
          p.label,
          p.unit ? formatQuantity(p.nominal, p.unit as 'F') : p.nominal.toPrecision(4),
          p.unit ? formatQuantity(p.value, p.unit as 'F') : p.value.toPrecision(6),
          Number.isFinite(p.sigma) ? `± ${(100 * p.relativeSigma).toPrecision(2)} %` : 'not identifiable',
        ]);
        process.stdout.write(`${basis ? `${basis}\n` : ''}${result.message}\n\n` + textTable(['parameter', 'nominal', 'fitted', 'uncertainty (1 sigma)'], rows, [false, true, true, true]));
        for (const s of result.spread ?? []) {
          process.stdout.write(`spread of ${s.kind} parts: ${(100 * s.partSpread).toPrecision(2)} % over ${s.counted} parts${s.tolerance !== undefined ? ` (stated tolerance ${(100 * s.tolerance).toPrecision(2)} %)` : ''}\n`);
        }
        if (options.output && result.converged) process.stderr.write(`fitted board written to ${options.output}\n`);
      }
      if (!result.converged) process.exitCode = EXIT.badInput;
    });
}

/** The fit names its spec's fields ("fit spec: parts[0]: ..."); on the command line the user gave flags. */
function flagOf(field: FitSpecField, o: FitOptions): string {
  switch (field) {
    case 'parts':
      return `--parts ${o.parts ?? ''}`;
    case 'capacitanceScale':
      return '--scale C';
    case 'inductanceScale':
      return '--scale L';
    case 'inductorResistance':
      return o.coilQ !== undefined ? `--coil-q ${o.coilQ}` : '--coil-resistance';
  }
}

function withFlagNames<T>(fit: () => T, o: FitOptions): T {
  try {
    return fit();
  } catch (error) {
    if (error instanceof FitSpecError) throw new UsageError(`${flagOf(error.field, o)}${error.rest}`);
    throw error;
  }
}

function fitSpec(o: FitOptions): FitSpec {
  const spec: FitSpec = {};
  if (o.scale !== undefined) {
    for (const s of o.scale.split(',').map((x) => x.trim().toUpperCase())) {
      if (s === 'C') spec.capacitanceScale = true;
      else if (s === 'L') spec.inductanceScale = true;
      else throw new UsageError(`--scale ${o.scale}: expected C, L or C,L`);
    }
  }
  if (o.coilResistance && o.coilQ) throw new UsageError('give --coil-resistance or --coil-q, not both');
  if (o.coilResistance) spec.inductorResistance = { form: 'ohms' };
  if (o.coilQ) spec.inductorResistance = { form: 'q', atHz: parseFrequency(o.coilQ, '--coil-q') };
  if (o.parts) spec.parts = o.parts.split(',').map((s) => s.trim()).filter(Boolean);
  if (o.allParts) spec.allParts = true;
  if (Object.keys(spec).length === 0) return { capacitanceScale: true, inductanceScale: true, inductorResistance: { form: 'ohms' } };
  return spec;
}
