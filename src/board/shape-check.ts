// Runs a zod schema over raw data and turns its issues into our one-line problems. A misspelt field is
// reported and then ignored, so the rest of the part is still checked in the same run.

import type { z } from 'zod';
import { joinPath, type ProblemLog } from './errors.js';
import { closestName } from './spelling.js';

type Issue = z.core.$ZodIssue;
type RawIssue = z.core.$ZodRawIssue;

/** The data if it has the shape (misspelt fields dropped), else undefined; problems go to `log`. */
export function readShape<S extends z.ZodType>(schema: S, data: unknown, path: string, log: ProblemLog): z.infer<S> | undefined {
  const result = schema.safeParse(data, { reportInput: true, error: describeIssue });
  if (result.success) return result.data;
  for (const issue of result.error.issues) report(issue, schema, path, log);
  if (!result.error.issues.every((issue) => issue.code === 'unrecognized_keys')) return undefined;
  const again = schema.safeParse(withoutKeys(data, result.error.issues));
  return again.success ? again.data : undefined;
}

/**
 * Like readShape for an object schema, but when the object as a whole fails, the fields that are fine
 * on their own are still returned, so one wrong field does not hide the problems in its siblings.
 * Undefined only if the data is not a mapping at all.
 */
export function readFields<S extends z.ZodObject>(schema: S, data: unknown, path: string, log: ProblemLog): Partial<z.infer<S>> | undefined {
  const whole = readShape(schema, data, path, log);
  if (whole) return whole;
  if (data === null || typeof data !== 'object' || Array.isArray(data)) return undefined;
  const fields: Record<string, unknown> = {};
  for (const [key, field] of Object.entries(schema.shape as Record<string, z.ZodType>)) {
    const value = (data as Record<string, unknown>)[key];
    if (value === undefined) continue;
    const result = field.safeParse(value);
    if (result.success) fields[key] = result.data;
  }
  return fields as Partial<z.infer<S>>;
}

/** `within` is where a nested issue (from inside a union) sits, relative to the schema's root. */
function report(issue: Issue, schema: z.ZodType, base: string, log: ProblemLog, within: PropertyKey[] = []): void {
  const at = [...within, ...issue.path];
  if (issue.code === 'unrecognized_keys') {
    const known = fieldsAt(schema, at);
    for (const key of issue.keys) {
      const guess = closestName(key, known);
      const hint = guess ? ` (did you mean "${guess}"?)` : known.length > 0 ? ` (fields here: ${known.join(', ')})` : '';
      log.add(joinPath(base, ...at, key), `unknown field${hint}`);
    }
    return;
  }
  if (issue.code === 'invalid_union') {
    // When the input had the right type for one branch (say, a list) and failed only inside it,
    // that branch's own issues say more than "matches none of the choices".
    const inner = issue.errors.find((branch) => branch.length > 0 && branch.every((i) => i.path.length > 0));
    if (inner) {
      for (const nested of inner) report(nested, schema, base, log, at);
      return;
    }
  }
  log.add(joinPath(base, ...at), issue.message);
}

/** Our wording for zod's issues; schemas that carry their own message take precedence over this. */
function describeIssue(issue: RawIssue): string {
  if (issue.input === undefined && issue.code !== 'unrecognized_keys') return 'missing';
  switch (issue.code) {
    case 'invalid_type':
      return `must be ${typeWord(issue.expected)}, got ${describeInput(issue.input)}`;
    case 'too_small':
      return issue.origin === 'array' ? `needs at least ${issue.minimum} entries` : `must be at least ${issue.minimum}`;
    case 'too_big':
      return issue.origin === 'array' ? `allows at most ${issue.maximum} entries` : `must be at most ${issue.maximum}`;
    case 'invalid_value':
      return `must be ${issue.values.map((v) => JSON.stringify(v)).join(' or ')}, got ${describeInput(issue.input)}`;
    case 'invalid_key':
      return issue.issues.map((inner) => inner.message).join('; ');
    case 'invalid_format':
      return `is not in the expected form, got ${describeInput(issue.input)}`;
    default:
      return `is not valid, got ${describeInput(issue.input)}`;
  }
}

function typeWord(expected: string): string {
  const words: Record<string, string> = {
    string: 'text',
    number: 'a number',
    int: 'a whole number',
    boolean: 'true or false',
    array: 'a list',
    object: 'a mapping of fields',
    record: 'a mapping',
  };
  return words[expected] ?? expected;
}

export function describeInput(input: unknown): string {
  if (input === null) return 'nothing (null)';
  if (Array.isArray(input)) return 'a list';
  if (typeof input === 'object') return 'a mapping';
  if (typeof input === 'string') return JSON.stringify(input.length > 40 ? `${input.slice(0, 37)}...` : input);
  return String(input);
}

/** The field names an object schema allows at `path`, found by walking zod's schema definitions. */
function fieldsAt(schema: z.ZodType, path: readonly PropertyKey[]): string[] {
  let node: unknown = schema;
  for (const segment of [...path, undefined]) {
    // Unwrap wrappers (optional, nullable, default, union) until an object, array or record shows up.
    for (let guard = 0; guard < 10; guard++) {
      const def = defOf(node);
      if (!def) return [];
      if (def.type === 'optional' || def.type === 'nullable' || def.type === 'default') node = def.innerType;
      else if (def.type === 'union') node = (def.options as unknown[]).find((o) => ['object', 'array', 'record'].includes(defOf(o)?.type as string));
      else if (def.type === 'pipe') node = def.in;
      else break;
    }
    const def = defOf(node);
    if (!def) return [];
    if (segment === undefined) return def.type === 'object' ? Object.keys(def.shape as object) : [];
    if (def.type === 'object') node = (def.shape as Record<string, unknown>)[String(segment)];
    else if (def.type === 'array') node = def.element;
    else if (def.type === 'record') node = def.valueType;
    else return [];
  }
  return [];
}

function defOf(node: unknown): Record<string, unknown> | undefined {
  return (node as { _zod?: { def?: Record<string, unknown> } } | undefined)?._zod?.def;
}

function withoutKeys(data: unknown, issues: Issue[]): unknown {
  const copy = structuredClone(data);
  for (const issue of issues) {
    if (issue.code !== 'unrecognized_keys') continue;
    let target: unknown = copy;
    for (const segment of issue.path) target = (target as Record<PropertyKey, unknown>)[segment as string];
    for (const key of issue.keys) delete (target as Record<string, unknown>)[key];
  }
  return copy;
}
