// Writing a board file and reading it back with the board loader gives the same parts, to the last bit
// of every value; values are written in SI text with the SI prefixes (BIPM SI Brochure, 9th ed., Table 7,
// from memory; "u" for micro as the usual ASCII stand-in, common practice).
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadBoard, parseBoardText } from '../../../src/board/index.js';
import type { Board } from '../../../src/board/types.js';
import { BoardWriteError, boardToYaml, siText, writeBoard } from '../../../src/board/write-board.js';
import { seededRandom } from '../../support/make-board.js';

const folder = mkdtempSync(join(tmpdir(), 'topoprobe-write-board-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

function electrical(board: Board) {
  return board.parts.map(({ ref, kind, nodes, value, tolerance, esr }) => ({ ref, kind, nodes, value, tolerance, esr }));
}

describe('board round trip', () => {
  for (const file of ['chain-24.yaml', 'corner-8x8.yaml', 'tank-3.json']) {
    it(`${file} reads back to the same parts`, () => {
      const board = loadBoard(`shared/boards/${file}`);
      const back = parseBoardText(boardToYaml(board), 'written.yaml');
      expect(back.name).toBe(board.name);
      expect(electrical(back)).toEqual(electrical(board));
      expect(back.nodes.map((n) => n.name).sort()).toEqual(board.nodes.map((n) => n.name).sort());
    });
  }

  it('keeps the node order of a board whose parts meet the nodes in order', () => {
    for (const file of ['chain-24.yaml', 'tank-3.json']) {
      const board = loadBoard(`shared/boards/${file}`);
      expect(parseBoardText(boardToYaml(board)).nodes.map((n) => n.name)).toEqual(board.nodes.map((n) => n.name));
    }
  });

  it('keeps fitted values exactly, whatever their digits', () => {
    const random = seededRandom(3);
    const board = loadBoard('shared/boards/corner-8x8.yaml');
    const fitted: Board = {
      ...board,
      name: 'corner-8x8 (fitted)',
      parts: board.parts.map((p) => ({ ...p, value: p.value * (0.9 + 0.2 * random()), esr: p.kind === 'R' ? undefined : 0.1 + random() })),
    };
    const back = parseBoardText(boardToYaml(fitted));
    expect(electrical(back)).toEqual(electrical(fitted));
    expect(back.name).toBe('corner-8x8 (fitted)');
  });

  it('writes a lattice as explicit components, one line each, with a comment and description', () => {
    const board = loadBoard('shared/boards/chain-24.yaml');
    const text = boardToYaml(board, { comment: 'fitted on our bench\nsecond line', description: 'chain-24 as measured' });
    expect(text.startsWith('# fitted on our bench\n# second line\n')).toBe(true);
    expect(text).toMatch(/^description: chain-24 as measured$/m);
    expect(text).not.toMatch(/lattice/);
    expect(text).toMatch(/^ {2}- \{ ref: C_intra_0, kind: C, nodes: \[ n1, n2 \], value: 10nF, tolerance: 5%, esr: 20mΩ \}$/m);
    expect(text.match(/^ {2}- \{/gm)!.length).toBe(board.parts.length);
  });
});

describe('SI text of values', () => {
  // Engineering notation: a prefix for each power of 1000, the fewest digits that keep the value.
  const cases: [number, 'C' | 'L' | 'R', string][] = [
    [10.2e-9, 'C', '10.2nF'],
    [4.7e-9, 'C', '4.7nF'],
    [330e-12, 'C', '330pF'],
    [22e-6, 'L', '22uH'],
    [1.5e-3, 'L', '1.5mH'],
    [0.4, 'R', '400mΩ'],
    [100e3, 'R', '100kΩ'],
    [2.2e6, 'R', '2.2MΩ'],
    [47, 'R', '47Ω'],
  ];
  for (const [value, kind, text] of cases) {
    it(`writes ${value} as ${text}`, () => expect(siText(value, kind)).toBe(text));
  }
  it('writes 1/3 µF with as many digits as it takes to keep it, no more', () => {
    // ECMA-262 Number::toString gives the shortest decimal that reads back to the same double (from
    // memory): 3.333333333333333e-7, 16 digits.
    expect(String(1e-6 / 3)).toBe('3.333333333333333e-7');
    const text = siText(1e-6 / 3, 'C');
    expect(text).toBe('333.3333333333333nF');
    expect(parseBoardText(`components:\n  - { ref: C1, kind: C, nodes: [a, gnd], value: ${text} }\n`).parts[0].value).toBe(1e-6 / 3);
  });
});

describe('writing the file', () => {
  const board = loadBoard('shared/boards/tank-3.json');

  it('writes a file the loader reads', () => {
    const path = join(folder, 'tank-written.yaml');
    writeBoard(board, path);
    expect(electrical(loadBoard(path))).toEqual(electrical(board));
  });

  it('keeps an existing file unless asked to replace it', () => {
    const path = join(folder, 'existing.yaml');
    writeFileSync(path, 'our own notes\n');
    let caught: unknown;
    try {
      writeBoard(board, path);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(BoardWriteError);
    expect((caught as BoardWriteError).exitCode).toBe(2);
    expect((caught as Error).message).toBe(`${path}: cannot write the board: the file exists already (choose another name or allow overwriting)`);
    expect(readFileSync(path, 'utf8')).toBe('our own notes\n');
    writeBoard(board, path, { overwrite: true });
    expect(electrical(loadBoard(path))).toEqual(electrical(board));
  });

  it('names the file when the folder does not exist', () => {
    const path = join(folder, 'no-such-folder', 'board.yaml');
    expect(() => writeBoard(board, path)).toThrow(`${path}: cannot write the board: no such folder`);
  });

  it('refuses a name that is not YAML', () => {
    expect(() => writeBoard(board, join(folder, 'board.json'))).toThrow(/give the file a \.yaml or \.yml name/);
  });

  it('refuses a board with a node that no part touches', () => {
    const lonely: Board = { ...board, nodes: [...board.nodes, { name: 'spare', position: [0, 0, 0] }] };
    expect(() => boardToYaml(lonely)).toThrow(/node spare has no parts/);
  });
});
