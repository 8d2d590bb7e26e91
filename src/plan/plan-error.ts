// Problems of a plan file, collected like the board module's: every problem is one line
// "file: path: message". It is a BoardError so the CLI prints all of them and exits with 2.
import { BoardError, type Problem } from '../board/errors.js';

/** A broken plan can have thousands of broken points; the first ones say what is wrong. */
export const MAX_PLAN_PROBLEMS = 40;

export class PlanError extends BoardError {
  readonly exitCode = 2;
  constructor(problems: Problem[]) {
    const shown = problems.length > MAX_PLAN_PROBLEMS
      ? [...problems.slice(0, MAX_PLAN_PROBLEMS), { file: problems[0].file, path: '', message: `and ${problems.length - MAX_PLAN_PROBLEMS} more problems` }]
      : problems;
    super(shown);
    this.name = 'PlanError';
  }
}
