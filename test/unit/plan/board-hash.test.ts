// The board fingerprint: canonical JSON (RFC 8785 scheme) hashed with sha256.
import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { parseBoardText } from '../../../src/board/index.js';
import { boardHash } from '../../../src/plan/board-hash.js';
import { canonicalJson } from '../../../src/plan/canonical-json.js';

const BOARD = `
name: two
components:
  - { ref: C1, kind: C, nodes: [a, gnd], value: 10n, tolerance: 5%, esr: 0.02 }
  - { ref: L1, kind: L, nodes: [a, b], value: 22u }
  - { ref: R1, kind: R, nodes: [b, gnd], value: 1k, rating: 50V }
`;

describe('canonicalJson', () => {
  it('sorts keys and writes numbers in their shortest form, like the RFC 8785 example (from memory)', () => {
    // RFC 8785 section 3.2.3 (from memory): keys sorted, 4.50 -> 4.5, 2e-3 -> 0.002, 1E30 -> 1e+30.
    const value = { numbers: [333333333.33333329, 1e30, 4.5, 2e-3, 1e-27], literals: [null, true, false], string: '€$\u000f\nA' };
    expect(canonicalJson(value)).toBe('{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA"}');
  });

  it('gives the same text whatever order the fields were built in, and leaves undefined fields out', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, 2], c: undefined } })).toBe(canonicalJson({ a: { d: [1, 2] }, b: 1 }));
  });
});

describe('boardHash', () => {
  const board = parseBoardText(BOARD, 'two.yaml');

  it('is the sha256 of the canonical parts and node names, checked against a hand-written canonical text', () => {
    // sha256 (FIPS 180-4) as node's crypto computes it; the canonical text is written out by hand here.
    const text =
      '{"nodes":["a","b"],"parts":[' +
      '{"esr":0.02,"kind":"C","nodes":["a","gnd"],"ref":"C1","tolerance":0.05,"value":1e-8},' +
      '{"kind":"L","nodes":["a","b"],"ref":"L1","value":0.000022},' +
      '{"kind":"R","nodes":["b","gnd"],"rating_v":50,"ref":"R1","value":1000}]}';
    expect(boardHash(board)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
    expect(boardHash(board)).toMatch(/^[0-9a-f]{64}$/);
  });

  it('ignores the file name, part order, origins and descriptions', () => {
    const lines = BOARD.trim().split('\n');
    const parts = lines.filter((l) => l.startsWith('  -')).reverse();
    const reordered = parseBoardText(['name: two', 'description: the same parts in another order', 'components:', ...parts].join('\n'), 'elsewhere/other.yaml');
    expect(reordered.parts.map((p) => p.ref)).toEqual(['R1', 'L1', 'C1']);
    expect(boardHash(reordered)).toBe(boardHash(board));
  });

  it('changes when any part value, tolerance, esr, rating or end changes', () => {
    const variants = [
      BOARD.replace('value: 10n', 'value: 11n'),
      BOARD.replace('tolerance: 5%', 'tolerance: 2%'),
      BOARD.replace('esr: 0.02', 'esr: 0.03'),
      BOARD.replace('rating: 50V', 'rating: 25V'),
      BOARD.replace('nodes: [a, b]', 'nodes: [b, a]'),
    ];
    const hashes = new Set([boardHash(board), ...variants.map((text) => boardHash(parseBoardText(text, 'two.yaml')))]);
    expect(hashes.size).toBe(variants.length + 1);
  });
});
