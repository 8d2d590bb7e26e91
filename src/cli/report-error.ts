// Turns any error escaping a verb into short lines on stderr and an exit code; never a stack trace
// (set TOPOPROBE_DEBUG=1 to see one when developing).
import { BoardError, formatProblem } from '../board/errors.js';
import { EXIT } from './exit-codes.js';

export function reportError(err: unknown): number {
  if (process.env.TOPOPROBE_DEBUG && err instanceof Error) process.stderr.write(`${err.stack}\n`);
  if (err instanceof BoardError) {
    for (const p of err.problems) process.stderr.write(`topoprobe: ${formatProblem(p)}\n`);
    return EXIT.badInput;
  }
  const code = (err as { exitCode?: unknown })?.exitCode;
  const message = err instanceof Error ? err.message : String(err);
  process.stderr.write(`topoprobe: ${firstLine(message)}\n`);
  if (typeof code === 'number') return code;
  // Anything unexpected is still one line; it is our bug, not the user's input, but 2 keeps scripts honest.
  return EXIT.badInput;
}

function firstLine(s: string): string {
  const i = s.indexOf('\n');
  return i < 0 ? s : s.slice(0, i);
}
