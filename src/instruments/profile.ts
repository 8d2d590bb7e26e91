// Instrument profiles: one YAML or JSON file per instrument model says how to drive it (identity,
// terminators, timeouts, command templates, answer formats, limits, timing). A new instrument is a new
// file, not new code. Problems are collected, one line each: "file: path: message".

import { readFileSync, readdirSync, statSync } from 'node:fs';
import { basename, extname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { z } from 'zod';
import { ProblemLog } from '../board/errors.js';
import { parseBoardDocument } from '../board/read-source.js';
import { describeInput, readShape } from '../board/shape-check.js';
import { closestName } from '../board/spelling.js';
import { buildAnalyzer, buildSwitch } from './profile-build.js';
import { ProfileError } from './profile-error.js';
import { AnalyzerShape, SwitchShape } from './profile-schema.js';
import type { InstrumentProfile } from './profile-types.js';
import type { Identity } from './identity.js';

export type { AnalyzerProfile, InstrumentProfile, SwitchProfile } from './profile-types.js';
export { ProfileError } from './profile-error.js';

/** The folder of the profiles that come with topoprobe. */
export const BUILTIN_PROFILE_DIR = fileURLToPath(new URL('../../shared/profiles/', import.meta.url));

const KINDS = ['analyzer', 'switch'] as const;

/** Reads and checks the profile at `path`. Throws ProfileError listing every problem. */
export function loadProfile(path: string): InstrumentProfile {
  return parseProfileText(readProfileFile(path), path);
}

/** Same as loadProfile for text in memory; `file` names it in messages and picks JSON or YAML. */
export function parseProfileText(text: string, file: string): InstrumentProfile {
  const log = new ProblemLog(file);
  const data = parseBoardDocument(text, file, log);
  const profile = log.count === 0 ? readProfile(data, file, log) : undefined;
  if (log.count > 0 || !profile) throw new ProfileError(log.problems);
  return profile;
}

/** The names of the built-in profiles: generic-analyzer, generic-switch, ... */
export function builtinProfileNames(): string[] {
  return readdirSync(BUILTIN_PROFILE_DIR)
    .filter((f) => /\.(ya?ml|json)$/i.test(f))
    .map((f) => basename(f, extname(f)))
    .sort();
}

/** A built-in profile by name ("generic-analyzer"); an unknown name is a one-line error listing them. */
export function builtinProfile(name: string): InstrumentProfile {
  const names = builtinProfileNames();
  if (!names.includes(name)) {
    const guess = closestName(name, names);
    const log = new ProblemLog(name);
    log.add('', `no built-in profile of that name${guess ? ` (did you mean "${guess}"?)` : ''}; built in: ${names.join(', ')}`);
    throw new ProfileError(log.problems);
  }
  const file = readdirSync(BUILTIN_PROFILE_DIR).find((f) => basename(f, extname(f)) === name) as string;
  return loadProfile(join(BUILTIN_PROFILE_DIR, file));
}

/** A profile file path, or the name of a built-in one. */
export function profileFrom(nameOrPath: string): InstrumentProfile {
  return /[/\\]|\.(ya?ml|json)$/i.test(nameOrPath) ? loadProfile(nameOrPath) : builtinProfile(nameOrPath);
}

/** True when the *IDN? answer matches the profile's identity pattern. */
export function matchesIdentity(profile: InstrumentProfile, idn: string | Identity): boolean {
  return profile.identity.test(typeof idn === 'string' ? idn : idn.raw);
}

function readProfile(data: unknown, file: string, log: ProblemLog): InstrumentProfile | undefined {
  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    log.add('', `must hold a mapping of fields (kind, identity, commands, ...), got ${describeInput(data)}`);
    return undefined;
  }
  const kind = (data as Record<string, unknown>).kind;
  const stem = basename(file, extname(file));
  if (kind === 'analyzer') {
    const raw = readAsFarAsPossible(AnalyzerShape, data, log);
    return raw ? buildAnalyzer(raw, file, stem, log) : undefined;
  }
  if (kind === 'switch') {
    const raw = readAsFarAsPossible(SwitchShape, data, log);
    return raw ? buildSwitch(raw, file, stem, log) : undefined;
  }
  const guess = typeof kind === 'string' ? closestName(kind, KINDS) : undefined;
  log.add('kind', kind === undefined ? 'missing; expected analyzer or switch' : `unknown kind ${JSON.stringify(kind)}; expected analyzer or switch${guess ? ` (did you mean "${guess}"?)` : ''}`);
  return undefined;
}

/**
 * The shape problems go to the log; then the fields at fault are left out and, if what remains still has
 * the shape (the faulty fields were optional), it is returned, so the checks behind the shape also run
 * and one round of fixes can deal with every problem in the file.
 */
function readAsFarAsPossible<S extends z.ZodType>(schema: S, data: unknown, log: ProblemLog): z.infer<S> | undefined {
  const raw = readShape(schema, data, '', log);
  if (raw) return raw;
  const first = schema.safeParse(data);
  if (first.success) return first.data;
  const pruned = structuredClone(data) as Record<PropertyKey, unknown>;
  for (const issue of first.error.issues) {
    const keys = issue.code === 'unrecognized_keys' ? issue.keys.map((k) => [...issue.path, k]) : [issue.path];
    for (const path of keys) removeAt(pruned, path);
  }
  const again = schema.safeParse(pruned);
  return again.success ? again.data : undefined;
}

function removeAt(data: Record<PropertyKey, unknown>, path: readonly PropertyKey[]): void {
  if (path.length === 0) return;
  let target: unknown = data;
  for (const segment of path.slice(0, -1)) {
    if (target === null || typeof target !== 'object') return;
    target = (target as Record<PropertyKey, unknown>)[segment];
  }
  if (target !== null && typeof target === 'object') delete (target as Record<PropertyKey, unknown>)[path[path.length - 1]];
}

function readProfileFile(path: string): string {
  const log = new ProblemLog(path);
  try {
    if (statSync(path).isDirectory()) log.add('', 'is a directory, not a profile file');
    else return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    log.add('', code === 'ENOENT' ? 'cannot read the profile: no such file' : `cannot read the profile: ${(error as Error).message}`);
  }
  throw new ProfileError(log.problems);
}
