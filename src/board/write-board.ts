// Writes a Board as a board file the loader reads back to the same parts: YAML with every part listed
// explicitly under `components` (a lattice is written out part by part), values as SI text such as
// "10.2nF", "22uH" or "276mΩ", each with the fewest digits that give back exactly the same number.
// Node positions and a lattice's unit cell are not part of an explicit board file and are not written;
// the loader numbers the nodes in order of first appearance.
//
// Writing never destroys what is there: an existing file is kept unless `overwrite` is set, and then
// the new text goes to a temporary file first and replaces the old one in one rename, so a failed write
// leaves the old file whole.
import { existsSync, renameSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { Document, YAMLMap } from 'yaml';
import { parsePercent, parseQuantity } from '../units/quantity.js';
import { prefixForExponent } from '../units/si-prefixes.js';
import { parseBoardText } from './load.js';
import { UNIT_OF_KIND } from './part-values.js';
import { GROUND, type Board, type Part, type PartKind } from './types.js';

export interface WriteBoardOptions {
  /** The board's `description` field. */
  description?: string;
  /** A comment for the head of the file (one or more lines). */
  comment?: string;
  /** Replace an existing file. Default false: an existing file is an error. */
  overwrite?: boolean;
}

/** A board that cannot be written, or a file that cannot be written to; one line naming the file. Exit 2. */
export class BoardWriteError extends Error {
  readonly exitCode = 2;
  constructor(
    readonly file: string,
    problem: string,
  ) {
    super(`${file}: ${problem}`);
    this.name = 'BoardWriteError';
  }
}

const SYMBOL: Record<PartKind, string> = { C: 'F', L: 'H', R: 'Ω' };

/** The board file text; checked by reading it back, so what is returned always loads to the same parts. */
export function boardToYaml(board: Board, options: WriteBoardOptions = {}, file = '<board>'): string {
  const used = new Set(board.parts.flatMap((p) => p.nodes));
  const lonely = board.nodes.find((n) => !used.has(n.name));
  if (lonely) throw new BoardWriteError(file, `node ${lonely.name} has no parts; a board file cannot hold it`);
  if (board.parts.length === 0) throw new BoardWriteError(file, `board ${board.name} has no parts to write`);

  const data: Record<string, unknown> = { name: board.name };
  if (options.description !== undefined) data.description = options.description;
  data.components = board.parts.map(componentOf);
  const doc = new Document(data);
  const components = doc.get('components') as { items: unknown[] };
  // One line per part keeps a board of hundreds of parts readable and easy to compare.
  for (const item of components.items) if (item instanceof YAMLMap) item.flow = true;
  if (options.comment) doc.commentBefore = options.comment.split('\n').map((line) => ` ${line}`).join('\n');
  const text = doc.toString({ lineWidth: 0 });
  checkRoundTrip(board, text, file);
  return text;
}

/** Writes the board to `path` (YAML). Throws BoardWriteError. */
export function writeBoard(board: Board, path: string, options: WriteBoardOptions = {}): void {
  if (!/\.ya?ml$/i.test(path)) throw new BoardWriteError(path, 'a board is written as YAML; give the file a .yaml or .yml name');
  const text = boardToYaml(board, options, path);
  try {
    if (!options.overwrite) {
      writeFileSync(path, text, { encoding: 'utf8', flag: 'wx' });
      return;
    }
    const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
    try {
      writeFileSync(temporary, text, { encoding: 'utf8', flag: 'wx' });
      renameSync(temporary, path);
    } finally {
      if (existsSync(temporary)) unlinkSync(temporary);
    }
  } catch (error) {
    throw new BoardWriteError(path, `cannot write the board: ${describeFsError(error)}`);
  }
}

function componentOf(part: Part): Record<string, unknown> {
  const entry: Record<string, unknown> = {
    ref: part.ref,
    kind: part.kind,
    nodes: part.nodes.map((n) => (n === GROUND ? 'gnd' : n)),
    value: siText(part.value, part.kind),
  };
  if (part.tolerance !== undefined) entry.tolerance = percentText(part.tolerance);
  // A resistor has no separate series resistance (the loader refuses one).
  if (part.kind !== 'R' && part.esr !== undefined) entry.esr = part.esr === 0 ? 0 : siText(part.esr, 'R');
  return entry;
}

/**
 * Engineering notation with the fewest significant digits that parse back to exactly `value`: the
 * decimal digits come from toExponential, which at 17 digits always identifies a double uniquely.
 */
export function siText(value: number, kind: PartKind): string {
  const unit = kind === 'R' ? 'ohm' : UNIT_OF_KIND[kind];
  for (let digits = 1; digits <= 17; digits++) {
    const text = engineering(value, digits, SYMBOL[kind]);
    if (parseQuantity(text, unit, { allowZero: true }) === value) return text;
  }
  return String(value);
}

function engineering(value: number, digits: number, symbol: string): string {
  const [mantissa, exponentText] = value.toExponential(digits - 1).split('e');
  const exponent = Number(exponentText);
  const engineeringExponent = Math.floor(exponent / 3) * 3;
  const prefix = engineeringExponent === 0 ? '' : prefixForExponent(engineeringExponent)?.symbol;
  if (prefix === undefined) return `${mantissa}e${exponent}${symbol}`;
  return `${shiftDecimal(mantissa, exponent - engineeringExponent)}${prefix === 'µ' ? 'u' : prefix}${symbol}`;
}

/** Moves the decimal point of "d.ddd" right by 0, 1 or 2 places, as text (no rounding). */
function shiftDecimal(mantissa: string, places: number): string {
  const [whole, fraction = ''] = mantissa.split('.');
  const digits = fraction.padEnd(places, '0');
  const moved = whole + digits.slice(0, places);
  const rest = digits.slice(places);
  return rest ? `${moved}.${rest}` : moved;
}

/** A tolerance as "5%", with the fewest digits that parse back to exactly the same fraction. */
function percentText(tolerance: number): string {
  for (let digits = 1; digits <= 17; digits++) {
    const text = `${plainDecimal(Number((tolerance * 100).toPrecision(digits)))}%`;
    if (parsePercent(text) === tolerance) return text;
  }
  return `${plainDecimal(tolerance * 100)}%`;
}

/** A number without exponent notation (the percent reader takes plain decimals only). */
function plainDecimal(x: number): string {
  const text = String(x);
  if (!/e/i.test(text)) return text;
  return x.toFixed(Math.min(100, Math.max(0, -Math.floor(Math.log10(Math.abs(x))) + 16))).replace(/\.?0+$/, '');
}

function checkRoundTrip(board: Board, text: string, file: string): void {
  let back: Board;
  try {
    back = parseBoardText(text, file);
  } catch (error) {
    throw new BoardWriteError(file, `the board does not make a valid board file: ${error instanceof Error ? error.message : String(error)}`);
  }
  if (back.parts.length !== board.parts.length) throw new BoardWriteError(file, 'the board file would not hold the same parts');
  board.parts.forEach((part, k) => {
    const other = back.parts[k];
    const same =
      other !== undefined &&
      other.ref === part.ref &&
      other.kind === part.kind &&
      other.nodes[0] === part.nodes[0] &&
      other.nodes[1] === part.nodes[1] &&
      other.value === part.value &&
      other.tolerance === part.tolerance &&
      (part.kind === 'R' || (other.esr ?? 0) === (part.esr ?? 0));
    if (!same) throw new BoardWriteError(file, `part ${part.ref} would not read back to the same values`);
  });
}

function describeFsError(error: unknown): string {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === 'EEXIST') return 'the file exists already (choose another name or allow overwriting)';
  if (code === 'ENOENT') return 'no such folder';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  if (code === 'EISDIR') return 'is a directory';
  return error instanceof Error ? error.message : String(error);
}
