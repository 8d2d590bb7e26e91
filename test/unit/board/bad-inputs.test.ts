// Each file under test/fixtures/boards/bad/ holds one mistake (several-problems.yaml holds many); the
// board loader must report it as one line naming the file, the path to the field and what is wrong.

import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { BoardError, formatProblem, loadBoard, type Problem } from '../../../src/board/index.js';

const DIR = 'test/fixtures/boards/bad';

function problemsOf(file: string): { error: BoardError; problems: Problem[] } {
  try {
    loadBoard(file);
  } catch (error) {
    expect(error).toBeInstanceOf(BoardError);
    return { error: error as BoardError, problems: (error as BoardError).problems };
  }
  throw new Error(`${file} loaded without a problem`);
}

/** file -> [path, message pattern] for files with exactly one problem. */
const SINGLE: Record<string, [string, RegExp]> = {
  'unknown-kind.yaml': ['components[1].kind', /^unknown kind "X"; expected C, L or R$/],
  'missing-value.yaml': ['components[1].value', /^missing$/],
  'malformed-value.yaml': ['components[1].value', /^"ten nano" is not a value/],
  'wrong-unit.yaml': ['components[1].value', /^"10uH" is in henries, expected farads$/],
  'zero-value.yaml': ['components[1].value', /zero; it must be greater than zero$/],
  'negative-value.yaml': ['components[1].value', /^"-10n" is negative/],
  'duplicate-ref.yaml': ['components[2].ref', /^duplicate reference designator "C1" \(also at components\[0\]\.ref\)$/],
  'self-loop.yaml': ['components[1].nodes', /^both ends are on node "n1"/],
  'ground-both-ends.yaml': ['components[1].nodes', /^both ends are on node "gnd"/],
  'empty-board.yaml': ['components', /no parts/],
  'unknown-site.yaml': ['lattice.bonds[0].to', /^unknown site "c"; sites are a, b$/],
  'offset-length.yaml': ['lattice.bonds[1].offset', /^has 2 numbers, the lattice has 1 axis$/],
  'repeats-zero.yaml': ['lattice.repeats[0]', /^must be a whole number of at least 1, got 0$/],
  'floating-island.yaml': ['components[3].nodes', /^2 nodes \(n3, n4\) have no path to gnd/],
  'lattice-floating.yaml': ['lattice.grounds', /^24 nodes \(a0, b0, a1, b1, a2, b2, a3, b3 and 16 more\) have no path to gnd/],
  'bad-syntax.yaml': ['line 4, column 53', /^YAML syntax error: /],
  'bad-syntax.json': ['line 5, column 73', /^JSON syntax error: unexpected "}"$/],
  'duplicate-yaml-key.yaml': ['line 5, column 5', /^YAML syntax error: Map keys must be unique/],
  'unknown-field.yaml': ['components[1].tolernce', /^unknown field \(did you mean "tolerance"\?\)$/],
  'tolerance-without-percent.yaml': ['components[1].tolerance', /no percent sign/],
  'q-without-frequency.yaml': ['components[0].q', /^q needs q_at/],
  'q-frequency-unit.yaml': ['components[0].q_at', /^"100kH" is in henries, expected hertz$/],
  'esr-and-q.yaml': ['components[0].q', /^give either esr or q/],
  'esr-on-resistor.yaml': ['components[1].esr', /not to a resistor$/],
  'rkm-r-on-capacitor.yaml': ['components[1].value', /RKM letter R/],
  'bad-boundary.yaml': ['lattice.boundary[0]', /^unknown boundary "closed"; expected open or periodic$/],
  'name-clash.yaml': ['lattice.names', /^gives the name "n0" to both site a of cell \(0,0\) and site a of cell \(0,1\)/],
  'change-unknown-ref.yaml': ['lattice.changes[0].ref', /^no lattice part is called "C_t_9"/],
  'change-cell-outside.yaml': ['lattice.changes[0].cell[0]', /^cell 4 is outside 0\.\.3$/],
  'periodic-self-wrap.yaml': ['lattice.bonds[0].offset', /wraps round a periodic axis/],
  'node-with-space.yaml': ['components[0].nodes[0]', /^node name "n 1" contains white space$/],
  'not-a-mapping.yaml': ['', /^must hold a mapping/],
  'ground-unknown-site.yaml': ['lattice.grounds[1].site', /^unknown site "bb" \(did you mean "b"\?\)/],
};

describe('bad board files: one problem each', () => {
  for (const [name, [path, message]] of Object.entries(SINGLE)) {
    it(name, () => {
      const file = join(DIR, name);
      const { error, problems } = problemsOf(file);
      expect(problems.map((p) => `${p.path} | ${p.message}`)).toHaveLength(1);
      expect(problems[0].file).toBe(file);
      expect(problems[0].path).toBe(path);
      expect(problems[0].message).toMatch(message);
      // The error message is the first problem as one line "file: path: message", with no stack trace.
      expect(error.message).toBe(path ? `${file}: ${path}: ${problems[0].message}` : `${file}: ${problems[0].message}`);
      expect(error.message).toBe(formatProblem(problems[0]));
      expect(error.message).not.toMatch(/[\r\n]/);
    });
  }

  it('covers every fixture file (a new fixture needs an entry here)', () => {
    const files = readdirSync(DIR).sort();
    expect(files.length).toBeGreaterThanOrEqual(21);
    expect(files.filter((f) => f !== 'several-problems.yaml')).toEqual(Object.keys(SINGLE).sort());
  });

  it('reports a missing file by name', () => {
    const file = join(DIR, 'no-such-board.yaml');
    const { error, problems } = problemsOf(file);
    expect(problems).toEqual([{ file, path: '', message: 'cannot read the file: no such file' }]);
    expect(error.message).toBe(`${file}: cannot read the file: no such file`);
  });

  it('reports a directory given as a board file', () => {
    expect(problemsOf(DIR).problems[0].message).toMatch(/is a directory/);
  });
});

describe('a file with several problems', () => {
  it('reports all of them in one run, each with its own path', () => {
    const file = join(DIR, 'several-problems.yaml');
    const { problems } = problemsOf(file);
    const found = problems.map((p) => [p.path, p.message] as const);
    const expected: [string, RegExp][] = [
      ['desciption', /^unknown field \(did you mean "description"\?\)$/],
      ['components[0].value', /^"22uF" is in farads, expected henries$/],
      ['components[1].kind', /^unknown kind "Q"/],
      ['components[2].nodes', /^both ends are on node "n2"/],
      ['components[3].value', /zero/],
      ['components[4].tolerance', /no percent sign/],
      ['components[5].nodes', /^needs exactly two node names$/],
      ['components[4].ref', /^duplicate reference designator "L1" \(also at components\[0\]\.ref\)$/],
    ];
    expect(found.map(([path]) => path)).toEqual(expected.map(([path]) => path));
    expected.forEach(([, pattern], k) => expect(found[k][1]).toMatch(pattern));
    for (const problem of problems) {
      expect(problem.file).toBe(file);
      expect(formatProblem(problem)).not.toMatch(/[\r\n]/);
    }
  });
});
