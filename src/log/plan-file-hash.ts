// The plan's fingerprint in a log: sha256 of the plan file's bytes as read (not of a re-serialisation),
// so any edit to the plan, even of a comment, is seen on resume.
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';

export function sha256OfFile(file: string): string {
  return createHash('sha256').update(readFileSync(file)).digest('hex');
}
