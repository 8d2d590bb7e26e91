// Problems of a fixture map file, collected like the board module's: every problem is one line
// "file: path: message". It is a BoardError so the CLI prints all its problems and exits with 2,
// exactly as for a board file.
import { BoardError, type Problem } from '../board/errors.js';

export class FixtureMapError extends BoardError {
  constructor(problems: Problem[]) {
    super(problems);
    this.name = 'FixtureMapError';
  }
}
