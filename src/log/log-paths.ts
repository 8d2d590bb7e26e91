// Where a log and its meta file live: the meta file sits beside the log; an unnamed log gets a name from
// the board and the start time (UTC, to the second) in the current folder, so two runs never share one.
import path from 'node:path';

export const metaPathOf = (logPath: string): string => `${logPath}.meta.json`;

export function defaultLogName(boardName: string, at: Date = new Date()): string {
  const stamp = at.toISOString().replace(/\.\d+Z$/, 'Z').replace(/[-:]/g, '');
  const safe = boardName.replace(/[^A-Za-z0-9._-]+/g, '_') || 'board';
  return path.resolve(`scan-${safe}-${stamp}.csv`);
}
