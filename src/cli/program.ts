// The `topoprobe` program: one verb per module, every error through one reporter. No side effects on import,
// so tests can run the whole CLI in process (`main(argv)` returns the exit code).
import { Command, CommanderError } from 'commander';
import { predictCommand } from './predict-command.js';
import { planCommand } from './plan-command.js';
import { simCommand } from './sim-command.js';
import { portsCommand } from './ports-command.js';
import { runCommand } from './run-command.js';
import { checkCommand } from './check-command.js';
import { diagnoseCommand } from './diagnose-command.js';
import { fitCommand } from './fit-command.js';
import { reportCommand } from './report-command.js';
import { reportError } from './report-error.js';
import { EXIT } from './exit-codes.js';
import { VERSION } from '../version.js';

export function buildProgram(): Command {
  const program = new Command('topoprobe')
    .description(
      'Check circuit-Laplacian lattice boards: predict what every node should read, plan a probing sequence ' +
        'from the mode profile, run it on a switch matrix and impedance analyzer (or the simulated bench), ' +
        'and find the faulty part.',
    )
    .version(VERSION, '-V, --version')
    .addCommand(predictCommand())
    .addCommand(planCommand())
    .addCommand(simCommand())
    .addCommand(portsCommand())
    .addCommand(runCommand())
    .addCommand(checkCommand())
    .addCommand(diagnoseCommand())
    .addCommand(fitCommand())
    .addCommand(reportCommand());
  program.exitOverride().configureOutput({ outputError: oneLineError('topoprobe --help') });
  for (const cmd of program.commands) {
    cmd.exitOverride().configureOutput({ outputError: oneLineError(`topoprobe ${cmd.name()} --help`) });
  }
  return program;
}

/** A flag error is one line like any other error, with where to read more on the same line. */
function oneLineError(helpCommand: string): (message: string, write: (s: string) => void) => void {
  return (message, write) => {
    const text = message.trim().replace(/^error:\s*/, '').replace(/\s*\n\s*/g, '; ');
    write(`topoprobe: ${text} (run "${helpCommand}" for usage)\n`);
  };
}

export async function main(argv: string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv, { from: 'user' });
    return typeof process.exitCode === 'number' ? process.exitCode : EXIT.ok;
  } catch (err) {
    if (err instanceof CommanderError) {
      // commander has already printed its one-line message (or the help/version text).
      if (err.code === 'commander.helpDisplayed' || err.code === 'commander.version') return EXIT.ok;
      return err.exitCode === 0 ? EXIT.ok : EXIT.badInput;
    }
    return reportError(err);
  }
}

