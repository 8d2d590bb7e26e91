#!/usr/bin/env node
// The whole job on a demo board, dry, against the simulated bench with one seeded assembly fault:
// predict -> plan -> run -> check -> diagnose -> report. Ends with the report's path.
import { spawnSync } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
// Outputs go to out/demo, or to the folder given as the one argument (the demo test uses a temporary one).
const out = path.resolve(process.argv[2] ?? path.join(root, 'out', 'demo'));
mkdirSync(out, { recursive: true });
const board = 'shared/boards/chain-24.yaml';
const fault = 'C_intra_0=open'; // the open joint our bench seeds: the 10 nF between n1 and n2
const plan = path.join(out, 'chain-24.plan.json');
const log = path.join(out, `chain-24-${new Date().toISOString().replace(/[:.]/g, '-')}.csv`);
const report = path.join(out, 'chain-24-report.html');

function topoprobe(title, args, okCodes = [0], stdout = 'inherit') {
  process.stderr.write(`\n=== ${title}\n$ topoprobe ${args.join(' ')}\n`);
  const r = spawnSync(process.execPath, [path.join(root, 'bin', 'topoprobe.mjs'), ...args], { cwd: root, stdio: ['inherit', stdout, 'inherit'] });
  if (!okCodes.includes(r.status ?? -1)) {
    process.stderr.write(`demo stopped: topoprobe ${args[0]} exited with ${r.status}\n`);
    process.exit(r.status ?? 1);
  }
}

topoprobe('1. predict: the edge modes of the chain and the impedance peak at its ends', ['predict', board, '--modes', '2', '--near', '160k', '--node', 'n1', '--node', 'n2', '--node', 'n12', '--node', 'n24']);
topoprobe('2. plan: a scan derived from the predicted mode profile, with tolerance bands', ['plan', board, '-o', plan, '--transfer']);
topoprobe(`3. run: the plan on the simulated bench, with the seeded fault ${fault} (exit 1: deviations flagged)`, ['run', plan, '--sim', '--fault', fault, '--timing', 'instant', '--log', log], [0, 1]);
topoprobe('4. check: the logged scan against the board snapshot in its metadata', ['check', log], [0, 1]);
topoprobe('5. diagnose: which part explains the deviations', ['diagnose', log]);
topoprobe('6. report: one self-contained HTML page', ['report', log, '-o', report, '--fit'], [0], 'ignore');
process.stderr.write(`\ndemo done; the report is at\n`);
process.stdout.write(`${report}\n`);
