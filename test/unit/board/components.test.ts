import { describe, expect, it } from 'vitest';
import { BoardError, formatProblem, GROUND, parseBoardText } from '../../../src/board/index.js';

const YAML_BOARD = `
name: pair
components:
  - { ref: L1, kind: L, nodes: [n1, GND], value: 22uH, tolerance: 10%, q: 50, q_at: 100kHz }
  - { ref: C1, kind: C, nodes: [n1, n2], value: "10 nF", tolerance: 5%, esr: 0.02 }
  - { ref: L2, kind: L, nodes: [n2, Ground], value: 22u }
  - { ref: R1, kind: R, nodes: [n2, gnd], value: 2k2 }
  - { ref: C2, kind: C, nodes: [n2, 7], value: 1e-8 }
  - { ref: R2, kind: R, nodes: [7, gnd], value: 4R7 }
`;

describe('explicit components', () => {
  it('reads parts in SI base units, maps ground spellings to gnd and keeps file order', () => {
    const board = parseBoardText(YAML_BOARD, 'pair.yaml');
    expect(board.name).toBe('pair');
    expect(board.file).toBe('pair.yaml');
    expect(board.nodes.map((n) => n.name)).toEqual(['n1', 'n2', '7']);
    expect(board.nodes.map((n) => n.position)).toEqual([[0, 0, 0], [1, 0, 0], [2, 0, 0]]);
    expect(board.parts.map((p) => [p.ref, p.kind, p.nodes, p.value])).toEqual([
      ['L1', 'L', ['n1', GROUND], 22e-6],
      ['C1', 'C', ['n1', 'n2'], 10e-9],
      ['L2', 'L', ['n2', GROUND], 22e-6],
      ['R1', 'R', ['n2', GROUND], 2200],
      ['C2', 'C', ['n2', '7'], 1e-8],
      ['R2', 'R', ['7', GROUND], 4.7],
    ]);
    expect(board.parts[0].tolerance).toBe(0.1);
    // Series-resistance form of Q for an inductor, esr = ωL/Q (common practice).
    expect(board.parts[0].esr).toBeCloseTo((2 * Math.PI * 1e5 * 22e-6) / 50, 12);
    expect(board.parts[1]).toMatchObject({ tolerance: 0.05, esr: 0.02, origin: 'components[1]' });
    expect(board.parts[3].esr).toBeUndefined();
    expect(board.lattice).toBeUndefined();
  });

  it('turns a capacitor Q into esr = 1/(ωCQ) (series-resistance form; common practice)', () => {
    const board = parseBoardText('components:\n  - { ref: C1, kind: C, nodes: [a, gnd], value: 10n, q: 200, q_at: 1MHz }', 'q.yaml');
    expect(board.parts[0].esr).toBeCloseTo(1 / (2 * Math.PI * 1e6 * 10e-9 * 200), 12);
  });

  it('accepts esr 0 for an ideal part', () => {
    const board = parseBoardText('components:\n  - { ref: C1, kind: C, nodes: [a, gnd], value: 10n, esr: 0 }', 'x.yaml');
    expect(board.parts[0].esr).toBe(0);
  });

  it('reads JSON by extension, and by its first character when the name says nothing', () => {
    const json = JSON.stringify({ name: 'j', components: [{ ref: 'R1', kind: 'R', nodes: ['a', 'gnd'], value: '1k' }] });
    expect(parseBoardText(json, 'j.json').parts[0].value).toBe(1000);
    expect(parseBoardText(json).parts[0].value).toBe(1000);
    expect(parseBoardText(json).file).toBe('<inline>');
  });

  it('names the board after its file when name is left out', () => {
    expect(parseBoardText('components:\n  - { ref: R1, kind: R, nodes: [a, gnd], value: 1k }', 'boards/my-board.yaml').name).toBe('my-board');
  });

  it('lists unknown fields with a suggestion, and keeps checking the rest of the part', () => {
    try {
      parseBoardText('components:\n  - { ref: C1, kind: C, nodes: [a, gnd], value: 10uH, tolernce: 5%, colour: red }', 'x.yaml');
      throw new Error('expected a BoardError');
    } catch (error) {
      expect(error).toBeInstanceOf(BoardError);
      expect((error as BoardError).problems.map(formatProblem)).toEqual([
        'x.yaml: components[0].tolernce: unknown field (did you mean "tolerance"?)',
        'x.yaml: components[0].colour: unknown field (fields here: ref, kind, nodes, value, tolerance, esr, q, q_at)',
        'x.yaml: components[0].value: "10uH" is in henries, expected farads',
      ]);
    }
  });

  it('formats a problem about the whole file without a path', () => {
    expect(formatProblem({ file: 'a.yaml', path: '', message: 'the file is empty' })).toBe('a.yaml: the file is empty');
    expect(formatProblem({ file: 'a.yaml', path: 'components[0]', message: 'two\nlines' })).toBe('a.yaml: components[0]: two lines');
  });

  it('reports an empty file', () => {
    expect(() => parseBoardText('  \n', 'e.yaml')).toThrow('e.yaml: the file is empty');
  });
});
