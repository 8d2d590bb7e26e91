// The fixture map: reading and checking map files (every problem one line "file: path: message"), the
// default map for any board (design contract: hi 1000 + k, lo 2000 + k, sense 3000 + k; ground 1000,
// 2000, 3000), writing the map in use, and lookups both ways.
import { mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatProblem, loadBoard, type Problem } from '../../../src/board/index.js';
import { GROUND, type Board } from '../../../src/board/types.js';
import {
  checkMeasurable,
  defaultFixtureMap,
  FixtureMap,
  FixtureMapError,
  loadFixtureMap,
  parseFixtureMapText,
  writeFixtureMap,
} from '../../../src/instruments/fixture-map.js';

const chain = loadBoard('shared/boards/chain-24.yaml');

function problemsOf(text: string, file: string, measured?: string[]): Problem[] {
  try {
    parseFixtureMapText(text, file, chain, { measured });
  } catch (error) {
    expect(error).toBeInstanceOf(FixtureMapError);
    return (error as FixtureMapError).problems;
  }
  throw new Error(`${file} was accepted`);
}

function lines(text: string, file: string, measured?: string[]): string[] {
  const found = problemsOf(text, file, measured).map(formatProblem);
  for (const line of found) expect(line).not.toContain('\n');
  return found;
}

/** One bad map per entry, with the one line it must give (file: path: message). */
const BAD: [file: string, text: string, line: string | RegExp][] = [
  ['channel-zero.yaml', 'nodes:\n  n1: { hi: 0 }\n', 'channel-zero.yaml: nodes.n1.hi: must be a whole number from 1 to 9999, got 0'],
  ['channel-high.yaml', 'nodes:\n  n1: { hi: 10000 }\n', 'channel-high.yaml: nodes.n1.hi: must be a whole number from 1 to 9999, got 10000'],
  ['channel-fraction.json', '{ "nodes": { "n2": { "lo": 201.5 } } }', 'channel-fraction.json: nodes.n2.lo: must be a whole number from 1 to 9999, got 201.5'],
  ['channel-text.yaml', 'nodes:\n  n2: { sense: "301" }\n', 'channel-text.yaml: nodes.n2.sense: must be a whole number from 1 to 9999, got "301"'],
  ['twice.yaml', 'nodes:\n  n1: { hi: 101 }\n  n2: { hi: 101 }\n', 'twice.yaml: nodes.n2.hi: channel 101 is already used by nodes.n1.hi'],
  ['twice-gnd.yaml', 'nodes:\n  n1: { lo: 201 }\ngnd: { lo: 201 }\n', 'twice-gnd.yaml: gnd.lo: channel 201 is already used by nodes.n1.lo'],
  ['unknown-node.yaml', 'nodes:\n  n99: { hi: 199 }\n', 'unknown-node.yaml: nodes.n99: no node "n99" on board chain-24 (did you mean "n9"?)'],
  ['ground-in-nodes.yaml', 'nodes:\n  GND: { lo: 200 }\n', 'ground-in-nodes.yaml: nodes.GND: ground goes under gnd at the top level, not under nodes'],
  ['misspelt-bus.yaml', 'nodes:\n  n1: { hi: 101, sence: 301 }\n', 'misspelt-bus.yaml: nodes.n1.sence: unknown field (did you mean "sense"?)'],
  ['empty-entry.yaml', 'nodes:\n  n1: {}\n', 'empty-entry.yaml: nodes.n1: lists no channel; give hi, lo and/or sense'],
  ['entry-not-mapping.yaml', 'nodes:\n  n1: 101\n', 'entry-not-mapping.yaml: nodes.n1: must be a mapping of hi, lo and sense channels, got 101'],
  ['no-nodes.yaml', 'gnd: { lo: 200 }\n', 'no-nodes.yaml: nodes: missing'],
  ['nodes-list.yaml', 'nodes: [101, 102]\n', 'nodes-list.yaml: nodes: must be a mapping from node names to channels, got a list'],
  ['top-list.json', '[1, 2]', 'top-list.json: must hold a mapping with nodes and gnd, got a list'],
  ['extra-field.yaml', 'nodes:\n  n1: { hi: 1 }\nrelays: 3\n', 'extra-field.yaml: relays: unknown field (fields here: description, nodes, gnd)'],
  ['empty.yaml', '   \n', 'empty.yaml: the file is empty'],
  ['bad-syntax.json', '{ "nodes": { "n1": { "hi": 101, } } }', 'bad-syntax.json: line 1, column 33: JSON syntax error: unexpected "}"'],
  ['bad-syntax.yaml', 'nodes:\n  n1: { hi: 101\n', /^bad-syntax\.yaml: line \d+, column \d+: YAML syntax error: /],
  ['two-documents.yaml', 'nodes: { n1: { hi: 1 } }\n---\nnodes: {}\n', /^two-documents\.yaml: line \d+, column \d+: YAML syntax error: .*a fixture map file holds one document/],
];

describe('bad fixture map files: one line each naming the file and the field', () => {
  for (const [file, text, line] of BAD) {
    it(file, () => {
      const found = lines(text, file);
      // Hand-written expectations from the design contract (channels 1..9999, one relay per channel).
      expect(found).toHaveLength(1);
      if (typeof line === 'string') expect(found[0]).toBe(line);
      else expect(found[0]).toMatch(line);
    });
  }

  it('collects every problem of a file in one round', () => {
    const text = 'nodes:\n  n1: { hi: 0 }\n  n2: { hi: 102, lo: 102 }\n  n77: { hi: 5 }\ngnd: { lo: -1 }\n';
    expect(lines(text, 'several.yaml')).toEqual([
      'several.yaml: nodes.n1.hi: must be a whole number from 1 to 9999, got 0',
      'several.yaml: nodes.n77: no node "n77" on board chain-24 (did you mean "n7"?)',
      'several.yaml: gnd.lo: must be a whole number from 1 to 9999, got -1',
      'several.yaml: nodes.n2.lo: channel 102 is already used by nodes.n2.hi',
    ]);
  });

  it('asks for hi on every node to be measured, and for gnd.lo', () => {
    const text = 'nodes:\n  n1: { hi: 101 }\n  n2: { lo: 202 }\n';
    expect(lines(text, 'measure.yaml', ['n1', 'n2', 'n3'])).toEqual([
      'measure.yaml: nodes.n2.hi: missing; node n2 is to be measured and needs a channel to the HI bus',
      'measure.yaml: nodes.n3: node n3 is to be measured but the map does not list it; give it a hi channel',
      'measure.yaml: gnd.lo: missing; measuring to ground needs a channel joining gnd to the LO bus',
    ]);
    // Without a list of nodes to measure the same map is fine (every field is optional).
    expect(parseFixtureMapText(text, 'measure.yaml', chain).channel('n2', 'lo')).toBe(202);
  });

  it('names a missing file or a directory', () => {
    const dir = mkdtempSync(join(tmpdir(), 'topoprobe-map-'));
    expect(() => loadFixtureMap(join(dir, 'none.yaml'), chain)).toThrow(`${join(dir, 'none.yaml')}: cannot read the file: no such file`);
    expect(() => loadFixtureMap(dir, chain)).toThrow(`${dir}: is a directory, not a fixture map file`);
  });
});

describe('the example map and lookups', () => {
  const map = loadFixtureMap('shared/fixtures/chain-24.yaml', chain, { measured: chain.nodes.map((n) => n.name) });

  it('loads for chain-24 with every node measurable', () => {
    expect(map.nodeNames).toEqual(chain.nodes.map((n) => n.name));
    expect(map.channels).toHaveLength(24 * 3 + 3);
  });

  it('looks up node + bus -> channel and channel -> node + bus', () => {
    expect(map.channel('n7', 'hi')).toBe(107);
    expect(map.channel('n7', 'lo')).toBe(207);
    expect(map.channel('n24', 'sense')).toBe(324);
    expect(map.channel(GROUND, 'lo')).toBe(225);
    expect(map.channel('n99', 'hi')).toBeUndefined();
    expect(map.terminal(213)).toEqual({ node: 'n13', bus: 'lo' });
    expect(map.terminal(325)).toEqual({ node: GROUND, bus: 'sense' });
    expect(map.terminal(999)).toBeUndefined();
    for (const channel of map.channels) {
      const t = map.terminal(channel)!;
      expect(map.channel(t.node, t.bus)).toBe(channel);
    }
  });

  it('checks an existing map against the nodes to be measured', () => {
    const partial = new FixtureMap({ nodes: { n1: { hi: 5 } }, gnd: {} }, 'partial map');
    expect(() => checkMeasurable(partial, ['n1'])).toThrow('partial map: gnd.lo: missing; measuring to ground needs a channel joining gnd to the LO bus');
    expect(() => checkMeasurable(map, ['n1', 'n24'])).not.toThrow();
  });
});

describe('the default map', () => {
  it('gives node k of the board hi 1000 + k, lo 2000 + k, sense 3000 + k, and ground 1000, 2000, 3000 (design contract)', () => {
    const map = defaultFixtureMap(chain);
    chain.nodes.forEach((node, i) => {
      expect(map.channel(node.name, 'hi')).toBe(1001 + i);
      expect(map.channel(node.name, 'lo')).toBe(2001 + i);
      expect(map.channel(node.name, 'sense')).toBe(3001 + i);
    });
    expect([map.channel(GROUND, 'hi'), map.channel(GROUND, 'lo'), map.channel(GROUND, 'sense')]).toEqual([1000, 2000, 3000]);
    expect(map.terminal(1024)).toEqual({ node: 'n24', bus: 'hi' });
    expect(map.channels).toHaveLength(75);
  });

  it('covers 999 nodes and refuses 1000 with one line asking for a map file', () => {
    const big = (count: number): Board => ({
      name: `grid-${count}`,
      file: `grid-${count}.yaml`,
      nodes: Array.from({ length: count }, (_, i) => ({ name: `v${i}`, position: [i, 0, 0] })),
      parts: [],
    });
    const fits = defaultFixtureMap(big(999));
    expect(fits.channel('v998', 'sense')).toBe(3999);
    expect(fits.channel('v998', 'hi')).toBe(1999);
    expect(() => defaultFixtureMap(big(1000))).toThrow(
      'grid-1000.yaml: board grid-1000 has 1000 nodes, more than the 999 the default fixture map covers; give a fixture map file',
    );
  });
});

describe('writing the map in use', () => {
  const dir = mkdtempSync(join(tmpdir(), 'topoprobe-map-'));

  for (const name of ['in-use.yaml', 'in-use.json']) {
    it(`writes ${name} that reads back to the same map and returns its absolute path`, () => {
      const map = defaultFixtureMap(chain);
      const written = writeFixtureMap(map, join(dir, name));
      expect(written).toBe(join(dir, name));
      const back = loadFixtureMap(written, chain, { measured: ['n1'] });
      expect(back.toData()).toEqual(map.toData());
      if (name.endsWith('.json')) expect(() => JSON.parse(readFileSync(written, 'utf8'))).not.toThrow();
      else expect(readFileSync(written, 'utf8')).toContain('  n3: { hi: 1003, lo: 2003, sense: 3003 }');
    });
  }

  it('names the file when it cannot be written', () => {
    const blocked = join(dir, 'blocked');
    mkdirSync(blocked);
    writeFileSync(join(blocked, 'x'), '');
    expect(() => writeFixtureMap(defaultFixtureMap(chain), join(blocked, 'x', 'map.yaml'))).toThrow(/blocked\/x\/map\.yaml: cannot write the fixture map: /);
    expect(() => writeFixtureMap(defaultFixtureMap(chain), join(dir, 'no-dir', 'map.yaml'))).toThrow(/no-dir\/map\.yaml: cannot write the fixture map: no such folder$/);
  });
});
