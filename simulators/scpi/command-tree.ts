// The command tree of an instrument, written as SCPI-99 header patterns such as "[SOURce#:]FREQuency[:CW]":
// the upper-case part of a keyword is its short form, "[...]" marks an optional node, "#" a numeric suffix
// 1..1 and "#N" one of 1..N. Header resolution follows the SCPI-99 path rules (vol. 1, 6.2.4 (from memory)).

import type { Header } from './lexer.js';
import { convertParameters, mnemonicMatches, type Limit, type ParamSpec, type ParamValue } from './parameters.js';
import { ScpiError } from './scpi-error.js';

/** What a handler gets: the header as typed, the numeric suffixes and the checked parameter values. */
export interface CommandCall {
  readonly header: string;
  /** One per suffixed node on the resolved path, 1 where the suffix was left out (SCPI-99 (from memory)). */
  readonly suffixes: readonly number[];
  readonly values: readonly ParamValue[];
  number(index: number): number;
  choice(index: number): string;
  flag(index: number): boolean;
  channels(index: number): readonly number[];
  text(index: number): string;
  limit(index: number): Limit | undefined;
}

/** A set handler returns nothing; a query handler returns its response data (or throws a ScpiError). */
export type HandlerResult = string | void | Promise<string | void>;

export interface Handler {
  params?: readonly ParamSpec[];
  run(call: CommandCall): HandlerResult;
}

export interface CommandSpec {
  header: string;
  set?: Handler;
  query?: Handler;
}

export interface TreeNode {
  long: string;
  optional: boolean;
  /** 0: no numeric suffix; N: suffixes 1..N. */
  suffixMax: number;
  parent?: TreeNode;
  children: TreeNode[];
  set?: Handler;
  query?: Handler;
}

interface PatternNode {
  long: string;
  optional: boolean;
  suffixMax: number;
}

/** Builds the tree. A malformed pattern or a duplicate handler is a programming mistake and throws. */
export function buildTree(specs: readonly CommandSpec[]): TreeNode {
  const root: TreeNode = { long: '', optional: false, suffixMax: 0, children: [] };
  for (const spec of specs) {
    let node = root;
    for (const p of parsePattern(spec.header)) {
      let child = node.children.find((c) => c.long.toUpperCase() === p.long.toUpperCase());
      if (child === undefined) {
        child = { ...p, parent: node, children: [] };
        node.children.push(child);
      } else if (child.optional !== p.optional || child.suffixMax !== p.suffixMax) {
        throw new Error(`command tree: ${p.long} in "${spec.header}" disagrees with an earlier pattern on [ ] or #`);
      }
      node = child;
    }
    for (const form of ['set', 'query'] as const) {
      const handler = spec[form];
      if (handler === undefined) continue;
      if (node[form] !== undefined) throw new Error(`command tree: "${spec.header}" has two ${form} handlers`);
      node[form] = handler;
    }
  }
  return root;
}

function parsePattern(pattern: string): PatternNode[] {
  // "[SOURce#:]FREQuency[:CW]" -> "[SOURce#]:FREQuency:[CW]" -> one piece per node.
  const pieces = pattern.replace(/\[:/g, ':[').replace(/:\]/g, ']:').split(':').filter((p) => p !== '');
  return pieces.map((piece) => {
    const m = /^(\[)?([A-Za-z][A-Za-z_]*)(#(\d*))?(\])?$/.exec(piece);
    if (!m || Boolean(m[1]) !== Boolean(m[5])) throw new Error(`command tree: cannot read "${piece}" in "${pattern}"`);
    return { long: m[2], optional: Boolean(m[1]), suffixMax: m[3] === undefined ? 0 : m[4] === '' ? 1 : Number(m[4]) };
  });
}

export interface Resolved {
  node: TreeNode;
  suffixes: number[];
  /** The current path for the next command of the message (SCPI-99 path rules). */
  nextPath: TreeNode;
}

/**
 * Finds the node a header names, starting at `path` (or the root after a leading ":"). Optional nodes may be
 * left out anywhere. The next path is the node holding the last keyword that was typed, i.e. the parent of
 * that keyword, counted among typed keywords only, so that an implied optional node does not narrow it.
 */
export function resolveHeader(root: TreeNode, path: TreeNode, header: Header): Resolved {
  const start = header.absolute ? root : path;
  const typed: TreeNode[] = [];
  const suffixes: number[] = [];
  let suffixProblem: string | undefined;

  const walk = (node: TreeNode, i: number): TreeNode | undefined => {
    if (i === header.keywords.length) {
      if (node.set !== undefined || node.query !== undefined) return node;
      for (const child of node.children) {
        if (!child.optional) continue;
        if (child.suffixMax > 0) suffixes.push(1);
        const found = walk(child, i);
        if (found) return found;
        if (child.suffixMax > 0) suffixes.pop();
      }
      return undefined;
    }
    const keyword = header.keywords[i];
    for (const child of node.children) {
      const suffix = matchKeyword(child, keyword.text, keyword.stem, keyword.suffix);
      if (suffix === 'out-of-range') suffixProblem = `${keyword.text} (suffix 1${child.suffixMax > 1 ? `..${child.suffixMax}` : ' only'})`;
      if (typeof suffix === 'number') {
        if (child.suffixMax > 0) suffixes.push(suffix);
        typed.push(child);
        const found = walk(child, i + 1);
        if (found) return found;
        typed.pop();
        if (child.suffixMax > 0) suffixes.pop();
      }
      if (child.optional) {
        if (child.suffixMax > 0) suffixes.push(1);
        const found = walk(child, i);
        if (found) return found;
        if (child.suffixMax > 0) suffixes.pop();
      }
    }
    return undefined;
  };

  const node = walk(start, 0);
  if (node === undefined) {
    if (suffixProblem !== undefined) throw new ScpiError(-114, `${header.text}: ${suffixProblem}`);
    throw new ScpiError(-113, header.text);
  }
  const nextPath = typed.length >= 2 ? typed[typed.length - 2] : start;
  return { node, suffixes, nextPath };
}

/** The suffix the keyword carries (1 when left out) if it names `node`; 'out-of-range' if only the suffix is wrong. */
function matchKeyword(node: TreeNode, text: string, stem: string, suffix: number | undefined): number | 'out-of-range' | undefined {
  if (node.suffixMax === 0) return mnemonicMatches(text, node.long) ? 1 : undefined;
  if (suffix === undefined) return mnemonicMatches(text, node.long) ? 1 : undefined;
  if (!mnemonicMatches(stem, node.long)) return undefined;
  return suffix >= 1 && suffix <= node.suffixMax ? suffix : 'out-of-range';
}

/** Checks the parameters against the handler and builds the call its `run` receives. */
export function makeCall(header: Header, handler: Handler, suffixes: readonly number[], data: Parameters<typeof convertParameters>[2]): CommandCall {
  const values = convertParameters(header.text, handler.params ?? [], data);
  const typedValue = <T>(index: number, check: (v: ParamValue) => boolean): T => {
    const v = values[index];
    if (!check(v)) throw new Error(`command handler for ${header.text}: parameter ${index} is not of the expected type`);
    return v as T;
  };
  return {
    header: header.text,
    suffixes,
    values,
    number: (i) => typedValue<number>(i, (v) => typeof v === 'number'),
    choice: (i) => typedValue<string>(i, (v) => typeof v === 'string'),
    flag: (i) => typedValue<boolean>(i, (v) => typeof v === 'boolean'),
    channels: (i) => typedValue<readonly number[]>(i, (v) => Array.isArray(v)),
    text: (i) => typedValue<string>(i, (v) => typeof v === 'string'),
    limit: (i) => values[i] as Limit | undefined,
  };
}
