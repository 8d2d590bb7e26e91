// Reads a plan file (JSON, whatever its name) and checks it completely: its shape (plan-schema.ts), then
// what spans fields (plan-checks.ts). Every problem is one line "file: path: message"; they all come in
// one PlanError, so one round of fixes deals with all of them.
import { readFileSync, statSync } from 'node:fs';
import { ProblemLog } from '../board/errors.js';
import { jsonErrorOffset } from '../board/json-error-position.js';
import { describeInput, readShape } from '../board/shape-check.js';
import { checkPlan } from './plan-checks.js';
import { PlanError } from './plan-error.js';
import { PlanShape } from './plan-schema.js';
import type { ScanPlan } from './types.js';

export { PlanError } from './plan-error.js';

/** Reads and checks the plan at `path`. Throws PlanError listing every problem. */
export function loadPlan(path: string): ScanPlan {
  return parsePlanText(readPlanFile(path), path);
}

/** Same as loadPlan for text in memory; `file` names it in messages. */
export function parsePlanText(text: string, file: string): ScanPlan {
  const log = new ProblemLog(file);
  const data = parseJson(text.replace(/^\uFEFF/, ''), log);
  if (log.count > 0) throw new PlanError(log.problems);
  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    log.add('', `must hold one JSON object (a topoprobe scan plan), got ${describeInput(data)}`);
    throw new PlanError(log.problems);
  }
  const shaped = readShape(PlanShape, data, '', log);
  if (shaped && log.count === 0) checkPlan(data as ScanPlan, log);
  if (log.count > 0 || !shaped) throw new PlanError(log.problems);
  // The data as read (it has the shape exactly), so fields keep the file's order.
  return data as ScanPlan;
}

function parseJson(text: string, log: ProblemLog): unknown {
  if (text.trim() === '') {
    log.add('', 'the file is empty');
    return undefined;
  }
  try {
    return JSON.parse(text);
  } catch {
    const offset = jsonErrorOffset(text) ?? text.length;
    const found = offset >= text.length ? 'the text ends too early' : `unexpected ${JSON.stringify(text[offset])}`;
    const before = text.slice(0, offset);
    log.add(`line ${before.split('\n').length}, column ${offset - before.lastIndexOf('\n')}`, `JSON syntax error: ${found} (a plan file is JSON)`);
    return undefined;
  }
}

function readPlanFile(path: string): string {
  const log = new ProblemLog(path);
  try {
    if (statSync(path).isDirectory()) log.add('', 'is a directory, not a plan file');
    else return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    log.add('', `cannot read the plan: ${code === 'ENOENT' ? 'no such file' : code === 'EACCES' || code === 'EPERM' ? 'permission denied' : (error as Error).message}`);
  }
  throw new PlanError(log.problems);
}
