// Splits one program message into program message units (IEEE 488.2 7.3 (from memory)): headers and their
// data elements, with no knowledge of any command tree. Pure, and total: whatever the input, it returns the
// units it could read and, if it had to stop, the failure as an error code. It never throws.

import type { ScpiErrorCode } from './error-codes.js';

export interface Keyword {
  /** As typed, e.g. "sour1". */
  text: string;
  /** The letters without a trailing numeric suffix, e.g. "sour". */
  stem: string;
  /** The trailing numeric suffix, when one was typed. */
  suffix?: number;
}

export interface Header {
  text: string;
  /** `*IDN?` and friends (IEEE 488.2 common commands). */
  common: boolean;
  /** Started with ":": resolved from the root of the tree. */
  absolute: boolean;
  keywords: Keyword[];
  query: boolean;
}

/** A decimal number kept as text so that a suffix multiplier can be applied in one rounding step. */
export interface DecimalText {
  significand: string;
  exponent: number;
}

export type DataElement =
  | { type: 'number'; text: string; decimal: DecimalText; suffix?: string }
  | { type: 'nondecimal'; text: string; value: number }
  | { type: 'word'; text: string }
  | { type: 'string'; text: string; value: string }
  | { type: 'channels'; text: string; ranges: [number, number][] }
  | { type: 'expression'; text: string };

export interface ProgramUnit {
  /** The unit as typed, trimmed, for error messages. */
  text: string;
  header: Header;
  data: DataElement[];
}

export interface LexFailure {
  code: ScpiErrorCode;
  detail: string;
}

export interface LexedMessage {
  units: ProgramUnit[];
  /** Why reading stopped after `units`; the rest of the message is not executed. */
  failure?: LexFailure;
}

/** IEEE 488.2 limits program mnemonics to 12 characters (from memory). */
export const MAX_MNEMONIC = 12;

class Stop {
  constructor(readonly failure: LexFailure) {}
}

export function lexMessage(message: string): LexedMessage {
  const units: ProgramUnit[] = [];
  const cursor = new Cursor(message);
  try {
    cursor.skipSpace();
    while (!cursor.atEnd()) {
      const start = cursor.pos;
      if (cursor.peek() === ';') cursor.fail(-102, `empty command at character ${start + 1}`);
      const header = readHeader(cursor);
      const data = readData(cursor, header);
      units.push({ text: message.slice(start, cursor.pos).trim(), header, data });
      // Past the unit: at the end, or just after its ";" (a trailing ";" is tolerated).
      if (cursor.peek() === ';') cursor.pos++;
      cursor.skipSpace();
    }
    return { units };
  } catch (stop) {
    if (stop instanceof Stop) return { units, failure: stop.failure };
    return { units, failure: { code: -102, detail: 'unreadable message' } };
  }
}

/** True when any unit that will be executed is a query. */
export function containsQuery(lexed: LexedMessage): boolean {
  return lexed.units.some((u) => u.header.query);
}

class Cursor {
  pos = 0;
  constructor(readonly text: string) {}
  atEnd(): boolean {
    return this.pos >= this.text.length;
  }
  peek(offset = 0): string {
    return this.text.charAt(this.pos + offset);
  }
  /** IEEE 488.2 white space: the control characters and space (from memory). */
  skipSpace(): boolean {
    const start = this.pos;
    while (!this.atEnd() && this.text.charCodeAt(this.pos) <= 0x20) this.pos++;
    return this.pos > start;
  }
  match(pattern: RegExp): string | undefined {
    return this.matchGroups(pattern)?.[0];
  }
  /** Matches a sticky pattern here and moves past it. */
  matchGroups(pattern: RegExp): RegExpExecArray | undefined {
    pattern.lastIndex = this.pos;
    const m = pattern.exec(this.text);
    if (!m) return undefined;
    this.pos += m[0].length;
    return m;
  }
  fail(code: ScpiErrorCode, detail: string): never {
    throw new Stop({ code, detail });
  }
  /** A short, quoted look at the text from here for error messages. */
  here(): string {
    const rest = this.text.slice(this.pos, this.pos + 12);
    return rest === '' ? 'the end of the message' : `"${rest}${this.pos + 12 < this.text.length ? '...' : ''}"`;
  }
}

const MNEMONIC = /[A-Za-z][A-Za-z0-9_]*/y;
const COMMON_MNEMONIC = /[A-Za-z]+/y;
const DECIMAL = /([+-]?(?:\d+\.?\d*|\.\d+))(?:[eE]([+-]?\d+))?/y;
const SUFFIX = /[A-Za-z]+/y;
const WORD = /[A-Za-z][A-Za-z0-9_]*/y;
const NON_DECIMAL = /#([HhQqBb])([0-9A-Fa-f]*)/y;

function readHeader(cursor: Cursor): Header {
  const start = cursor.pos;
  if (cursor.peek() === '*') {
    cursor.pos++;
    const name = cursor.match(COMMON_MNEMONIC);
    if (name === undefined) cursor.fail(-102, `expected a command name after "*" at character ${start + 1}`);
    checkLength(cursor, `*${name}`);
    const query = cursor.peek() === '?';
    if (query) cursor.pos++;
    return { text: cursor.text.slice(start, cursor.pos), common: true, absolute: true, keywords: [splitSuffix(name)], query };
  }
  const absolute = cursor.peek() === ':';
  if (absolute) cursor.pos++;
  const keywords: Keyword[] = [];
  for (;;) {
    const mnemonic = cursor.match(MNEMONIC);
    if (mnemonic === undefined) {
      cursor.fail(-102, keywords.length === 0 && !absolute ? `expected a command at ${cursor.here()}` : `expected a keyword after ":" in "${cursor.text.slice(start, cursor.pos)}"`);
    }
    checkLength(cursor, mnemonic);
    keywords.push(splitSuffix(mnemonic));
    if (cursor.peek() !== ':') break;
    cursor.pos++;
  }
  const query = cursor.peek() === '?';
  if (query) cursor.pos++;
  return { text: cursor.text.slice(start, cursor.pos), common: false, absolute, keywords, query };
}

function checkLength(cursor: Cursor, mnemonic: string): void {
  if (mnemonic.length > MAX_MNEMONIC) cursor.fail(-112, `${mnemonic.slice(0, 24)}${mnemonic.length > 24 ? '...' : ''} has ${mnemonic.length} characters, at most ${MAX_MNEMONIC} are allowed`);
}

function splitSuffix(mnemonic: string): Keyword {
  const m = /^(.*?[^0-9])([0-9]+)$/.exec(mnemonic);
  if (!m) return { text: mnemonic, stem: mnemonic };
  return { text: mnemonic, stem: m[1], suffix: Number(m[2]) };
}

function readData(cursor: Cursor, header: Header): DataElement[] {
  const data: DataElement[] = [];
  const spaced = cursor.skipSpace();
  if (cursor.atEnd() || cursor.peek() === ';') return data;
  // IEEE 488.2: header and data are separated by white space.
  if (!spaced) cursor.fail(-102, `${header.text}: unexpected ${cursor.here()} after the header`);
  for (;;) {
    data.push(readElement(cursor, header));
    cursor.skipSpace();
    if (cursor.atEnd() || cursor.peek() === ';') return data;
    if (cursor.peek() !== ',') cursor.fail(-102, `${header.text}: expected "," or ";" at ${cursor.here()}`);
    cursor.pos++;
    cursor.skipSpace();
    if (cursor.atEnd() || cursor.peek() === ';' || cursor.peek() === ',') cursor.fail(-102, `${header.text}: expected a value after ","`);
  }
}

function readElement(cursor: Cursor, header: Header): DataElement {
  const c = cursor.peek();
  const start = cursor.pos;
  if (c === '"' || c === "'") return readString(cursor, header);
  if (c === '(') return readParenthesised(cursor, header);
  if (c === '#') {
    const nd = cursor.matchGroups(NON_DECIMAL);
    if (nd === undefined) cursor.fail(-104, `${header.text}: block data is not accepted`);
    const radix = { h: 16, q: 8, b: 2 }[nd[1].toLowerCase() as 'h' | 'q' | 'b'];
    const digits = nd[2];
    if (digits === '' || [...digits].some((d) => Number.parseInt(d, 16) >= radix)) {
      cursor.fail(-102, `${header.text}: "${nd[0]}" is not a ${{ 16: 'hexadecimal', 8: 'octal', 2: 'binary' }[radix]} number`);
    }
    return { type: 'nondecimal', text: nd[0], value: Number.parseInt(digits, radix) };
  }
  if (/[0-9+\-.]/.test(c)) {
    const m = cursor.matchGroups(DECIMAL);
    if (m === undefined) cursor.fail(-102, `${header.text}: ${cursor.here()} is not a number`);
    const decimal = { significand: m[1], exponent: m[2] === undefined ? 0 : Number(m[2]) };
    // A suffix may follow after optional white space (IEEE 488.2 7.7.3 (from memory)).
    const beforeSpace = cursor.pos;
    cursor.skipSpace();
    const suffix = cursor.match(SUFFIX);
    if (suffix === undefined) cursor.pos = beforeSpace;
    return { type: 'number', text: cursor.text.slice(start, cursor.pos), decimal, ...(suffix === undefined ? {} : { suffix }) };
  }
  const word = cursor.match(WORD);
  if (word !== undefined) return { type: 'word', text: word };
  return cursor.fail(-102, `${header.text}: unexpected ${cursor.here()}`);
}

function readString(cursor: Cursor, header: Header): DataElement {
  const quote = cursor.peek();
  const start = cursor.pos;
  cursor.pos++;
  let value = '';
  for (;;) {
    if (cursor.atEnd()) cursor.fail(-102, `${header.text}: the string has no closing ${quote}`);
    const ch = cursor.peek();
    cursor.pos++;
    if (ch !== quote) {
      value += ch;
      continue;
    }
    // A doubled quote stands for one quote inside the string (IEEE 488.2 7.7.5 (from memory)).
    if (cursor.peek() === quote) {
      value += quote;
      cursor.pos++;
      continue;
    }
    return { type: 'string', text: cursor.text.slice(start, cursor.pos), value };
  }
}

function readParenthesised(cursor: Cursor, header: Header): DataElement {
  const start = cursor.pos;
  const close = cursor.text.indexOf(')', start);
  if (close < 0) cursor.fail(-171, `${header.text}: "(" without ")"`);
  const inside = cursor.text.slice(start + 1, close);
  cursor.pos = close + 1;
  const text = cursor.text.slice(start, cursor.pos);
  if (!inside.trimStart().startsWith('@')) return { type: 'expression', text };
  return { type: 'channels', text, ranges: readChannelRanges(cursor, header, inside.trimStart().slice(1), text) };
}

/** SCPI-99 vol. 1, 8.3.2 (from memory): `(@1,3:5)`, ranges inclusive in either direction; `(@)` is empty. */
function readChannelRanges(cursor: Cursor, header: Header, body: string, text: string): [number, number][] {
  if (body.trim() === '') return [];
  const ranges: [number, number][] = [];
  for (const entry of body.split(',')) {
    const m = /^\s*(\d+)\s*(?::\s*(\d+)\s*)?$/.exec(entry);
    if (!m) cursor.fail(-171, `${header.text}: "${entry.trim()}" in ${text} is not a channel or a range like 103:105`);
    const from = Number(m[1]);
    ranges.push([from, m[2] === undefined ? from : Number(m[2])]);
  }
  return ranges;
}
