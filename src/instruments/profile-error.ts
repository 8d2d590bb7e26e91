// Problems of a profile file, collected like the board module's: every problem is one line
// "file: path: message". It is a BoardError so the CLI prints all of them and exits with 2, exactly as
// for a board or fixture map file.
import { BoardError, type Problem } from '../board/errors.js';

export class ProfileError extends BoardError {
  readonly exitCode = 2;
  constructor(problems: Problem[]) {
    super(problems);
    this.name = 'ProfileError';
  }
}
