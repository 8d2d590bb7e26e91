// Reads a board file from disk and turns its text into plain data: JSON or YAML, picked by the file
// extension, or by the first character when the extension says nothing. Syntax errors become problems
// with a line and column.

import { readFileSync, statSync } from 'node:fs';
import { LineCounter, parseDocument } from 'yaml';
import { BoardError, pathText, ProblemLog } from './errors.js';
import { jsonErrorOffset } from './json-error-position.js';

export type BoardFormat = 'json' | 'yaml';

/** The text of a board file; a missing or unreadable file is a BoardError naming it. */
export function readBoardFile(path: string): string {
  const log = new ProblemLog(path);
  try {
    if (statSync(path).isDirectory()) log.add('', 'is a directory, not a board file');
    else return readFileSync(path, 'utf8');
  } catch (error) {
    log.add('', `cannot read the file: ${describeFsError(error)}`);
  }
  throw new BoardError(log.problems);
}

export function formatOf(text: string, file: string): BoardFormat {
  const lower = file.toLowerCase();
  if (lower.endsWith('.json')) return 'json';
  if (lower.endsWith('.yaml') || lower.endsWith('.yml')) return 'yaml';
  return /^\s*[{[]/.test(text.replace(/^\uFEFF/, '')) ? 'json' : 'yaml';
}

/** Parses the text into plain data, adding syntax problems to `log` (undefined when there are any). */
export function parseBoardDocument(text: string, file: string, log: ProblemLog): unknown {
  const body = text.replace(/^\uFEFF/, '');
  if (body.trim() === '') {
    log.add('', 'the file is empty');
    return undefined;
  }
  return formatOf(body, file) === 'json' ? parseJson(body, log) : parseYaml(body, log);
}

function parseJson(text: string, log: ProblemLog): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    const offset = jsonErrorOffset(text) ?? text.length;
    const found = offset >= text.length ? 'the text ends too early' : `unexpected ${JSON.stringify(text[offset])}`;
    log.add(lineAndColumn(text, offset), `JSON syntax error: ${found}`);
    return undefined;
  }
}

function parseYaml(text: string, log: ProblemLog): unknown {
  const lines = new LineCounter();
  // logLevel 'error': the yaml library would print its warnings (a list used as a key) on stderr itself.
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true, logLevel: 'error' });
  const linesReported = new Set<number>();
  for (const error of doc.errors) {
    const { line, col } = lines.linePos(error.pos[0]);
    // One mistake often yields several errors on its line (an unclosed bracket breaks two levels);
    // the first one says it.
    if (linesReported.has(line)) continue;
    linesReported.add(line);
    log.add(`line ${line}, column ${col}`, `YAML syntax error: ${yamlMessage(error.message)}`);
  }
  if (doc.errors.length > 0) return undefined;
  let data: unknown;
  try {
    data = doc.toJS({ maxAliasCount: 1000 });
  } catch (error) {
    // An alias to an anchor that does not exist shows up only when the data is built.
    log.add('', `YAML error: ${error instanceof Error ? error.message : String(error)}`);
    return undefined;
  }
  const odd = firstNonPlain(data, []);
  if (odd) {
    log.add(pathText(odd.path), odd.message);
    return undefined;
  }
  return data;
}

/**
 * YAML tags such as !!binary, !!set, !!omap or !!timestamp build values no checker downstream expects, and an
 * alias inside its own anchor (`a: &x [*x]`) builds a cycle; both are refused here, with where they are.
 */
function firstNonPlain(value: unknown, path: PropertyKey[], open = new Set<object>(), done = new Set<object>()): { path: PropertyKey[]; message: string } | undefined {
  if (value === null || typeof value !== 'object' || done.has(value)) return undefined;
  if (open.has(value)) return { path, message: 'YAML alias to the list or mapping it sits in; the data would never end' };
  const proto = Object.getPrototypeOf(value);
  if (!Array.isArray(value) && proto !== Object.prototype && proto !== null) {
    const what = (value as object).constructor?.name ?? 'special value';
    return { path, message: `YAML tag gives a ${what}; only text, numbers, true/false, lists and mappings are read here` };
  }
  open.add(value);
  const entries: [PropertyKey, unknown][] = Array.isArray(value) ? value.map((v, i) => [i, v]) : Object.entries(value);
  for (const [key, inner] of entries) {
    const found = firstNonPlain(inner, [...path, key], open, done);
    if (found) return found;
  }
  open.delete(value);
  done.add(value);
  return undefined;
}

function yamlMessage(message: string): string {
  return message.replace(/; please use YAML\.parseAllDocuments\(\)/, ' (a board file holds one document)');
}

function lineAndColumn(text: string, offset: number): string {
  const before = text.slice(0, offset);
  const line = before.split('\n').length;
  const column = offset - before.lastIndexOf('\n');
  return `line ${line}, column ${column}`;
}

function describeFsError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  return error instanceof Error ? error.message : String(error);
}
