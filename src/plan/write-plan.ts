// Writes a plan file: readable JSON (plan-json-text.ts), put in place by renaming a finished temporary
// file, so a plan on disk is always whole (an interrupted write leaves the old file, not half a new one).
import { renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { PlanError } from './plan-error.js';
import { readableJson } from './plan-json-text.js';
import type { ScanPlan } from './types.js';

export function planText(plan: ScanPlan): string {
  return `${readableJson(plan)}\n`;
}

/** Writes `plan` to `path`; returns the absolute path. Throws PlanError naming the file. */
export function writePlan(plan: ScanPlan, path: string): string {
  const absolute = resolve(path);
  const temporary = join(dirname(absolute), `.${basename(absolute)}.${process.pid}.tmp`);
  try {
    writeFileSync(temporary, planText(plan), 'utf8');
    renameSync(temporary, absolute);
  } catch (error) {
    rmSync(temporary, { force: true });
    const code = (error as NodeJS.ErrnoException).code;
    const reason = code === 'ENOENT' ? 'no such folder' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : code === 'EISDIR' ? 'is a directory' : code === 'ENOTDIR' ? 'a part of the path is a file, not a folder' : (error as Error).message;
    throw new PlanError([{ file: path, path: '', message: `cannot write the plan: ${reason}` }]);
  }
  return absolute;
}
