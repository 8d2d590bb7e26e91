// The bad-input corpus: malformed boards, plans, profiles, fixture maps and logs, and wrong flags for every
// verb, each through the whole command line. Every one must be refused the way the README promises: exit
// code 2, one line on stderr per problem ("topoprobe: " + the file and the field, or the flag), no stack
// trace, nothing on stdout and no partial output file. Most bad files are made here from a good demo file by
// one small edit, so each case reads as one line of the table; syntax errors live on disk under
// test/fixtures/*/bad and test/fixtures/reliability.
import { existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCliInProcess } from '../support/run-cli-in-process.js';
import { hasStackTrace, runCli, type CliResult } from '../support/run-cli.js';
import { tally } from '../support/reliability-tally.js';

const DIR = mkdtempSync(path.join(tmpdir(), 'topoprobe-bad-inputs-'));
const OUT = path.join(DIR, 'out');
mkdirSync(OUT);

const CHAIN = 'shared/boards/chain-24.yaml';
const TANK = 'shared/boards/tank-3.json';
const CORNER = 'shared/boards/corner-8x8.yaml';
const PAIR_BOARD = 'test/fixtures/plans/pair-board.yaml';
const PAIR_PLAN = 'test/fixtures/plans/pair.plan.json';
const PLAN = 'sequences/chain-24.plan.json';
const ANALYZER = 'shared/profiles/generic-analyzer.yaml';
const SWITCH = 'shared/profiles/generic-switch.yaml';
const FIXTURE = 'shared/fixtures/chain-24.yaml';

interface BadCase {
  /** What is tried, for the tally and the test name. */
  name: string;
  /** The command line (made when the case runs: log cases need the good log made first). */
  args: () => string[];
  /** A file every line must name (its base name at least); none for a flag. */
  file?: string;
  /** The field, line/column or flag that the message must name. */
  field: RegExp;
  /** Files with several problems print one line per problem. */
  lines?: number;
  /** Outputs that must not exist afterwards (a refused command writes nothing). */
  leaves?: string[];
  /** A file that existed before and must be left exactly as it was. */
  keeps?: string;
  /** `sim` only starts serving when a case is wrongly accepted; it is stopped then instead of hanging. */
  serves?: boolean;
}

const cases: BadCase[] = [];
const add = (c: BadCase) => void cases.push(c);
let serial = 0;
const out = (suffix: string) => path.join(OUT, `case-${++serial}${suffix}`);

// ---------------------------------------------------------------------------------------------------------
// Making bad files: one small edit of a good file each.

/** `from` replaced by `to` (the first occurrence, which must exist) in a copy of `source`, saved as `name`. */
function edited(source: string, name: string, from: string | RegExp, to: string): string {
  const text = readFileSync(source, 'utf8');
  const changed = text.replace(from, to);
  if (changed === text) throw new Error(`${source}: ${String(from)} is not in the file; the case ${name} needs updating`);
  return written(name, changed);
}

/** A JSON file changed by `change` (which edits the parsed document in place). */
function jsonEdited(source: string, name: string, change: (doc: any) => void): string {
  const doc = JSON.parse(readFileSync(source, 'utf8'));
  change(doc);
  return written(name, JSON.stringify(doc, null, 1));
}

function written(name: string, text: string | Buffer): string {
  const file = path.join(DIR, name);
  writeFileSync(file, text);
  return file;
}

// ---------------------------------------------------------------------------------------------------------
// Board files: every existing bad fixture through predict and plan, then new ones.

const BAD_BOARDS = 'test/fixtures/boards/bad';
const boardField: Record<string, RegExp | [RegExp, number]> = {
  'bad-boundary.yaml': /: lattice\.boundary\[0\]: /,
  'bad-syntax.json': /: line 5, column 73: JSON syntax error/,
  'bad-syntax.yaml': /: line 4, column 53: YAML syntax error/,
  'change-cell-outside.yaml': /: lattice\.changes\[0\]\.cell\[0\]: /,
  'change-unknown-ref.yaml': /: lattice\.changes\[0\]\.ref: /,
  'duplicate-ref.yaml': /: components\[2\]\.ref: duplicate/,
  'duplicate-yaml-key.yaml': /: line 5, column 5: YAML syntax error/,
  'empty-board.yaml': /: components: the board has no parts/,
  'esr-and-q.yaml': /: components\[0\]\.q: /,
  'esr-on-resistor.yaml': /: components\[1\]\.esr: /,
  'floating-island.yaml': /: components\[3\]\.nodes: .*no path to gnd/,
  'ground-both-ends.yaml': /: components\[1\]\.nodes: /,
  'ground-unknown-site.yaml': /: lattice\.grounds\[1\]\.site: /,
  'lattice-floating.yaml': /: lattice\.grounds: .*no path to gnd/,
  'malformed-value.yaml': /: components\[1\]\.value: /,
  'missing-value.yaml': /: components\[1\]\.value: missing/,
  'name-clash.yaml': /: lattice\.names: /,
  'negative-value.yaml': /: components\[1\]\.value: .*negative/,
  'node-with-space.yaml': /: components\[0\]\.nodes\[0\]: /,
  'not-a-mapping.yaml': /\.yaml: must hold a mapping/,
  'offset-length.yaml': /: lattice\.bonds\[1\]\.offset: /,
  'periodic-self-wrap.yaml': /: lattice\.bonds\[0\]\.offset: /,
  'q-frequency-unit.yaml': /: components\[0\]\.q_at: .*henries/,
  'q-without-frequency.yaml': /: components\[0\]\.q: /,
  'repeats-zero.yaml': /: lattice\.repeats\[0\]: /,
  'rkm-r-on-capacitor.yaml': /: components\[1\]\.value: .*RKM/,
  'self-loop.yaml': /: components\[1\]\.nodes: /,
  'several-problems.yaml': [/: components\[0\]\.value: .*farads, expected henries/, 8],
  'tolerance-without-percent.yaml': /: components\[1\]\.tolerance: /,
  'unknown-field.yaml': /: components\[1\]\.tolernce: unknown field/,
  'unknown-kind.yaml': /: components\[1\]\.kind: /,
  'unknown-site.yaml': /: lattice\.bonds\[0\]\.to: /,
  'wrong-unit.yaml': /: components\[1\]\.value: .*henries, expected farads/,
  'zero-value.yaml': /: components\[1\]\.value: .*zero/,
};
const RELIABILITY_BOARDS = 'test/fixtures/reliability/boards';
const reliabilityBoardField: Record<string, RegExp> = {
  'alias-cycle.yaml': /: components\[0\]: YAML alias to the list or mapping it sits in/,
  'binary-tag.yaml': /: name: YAML tag gives a Buffer/,
  'tab-indent.yaml': /: line 5, column 1: YAML syntax error: Tabs/,
  'trailing-comma.json': /: line 6, column 3: JSON syntax error/,
  'two-documents.yaml': /: line 5, column 1: YAML syntax error: .*one document/,
  'unclosed-flow.yaml': /: line 6, column 1: YAML syntax error/,
  'unknown-anchor.yaml': /\.yaml: YAML error: Unresolved alias/,
};

function boardCase(name: string, file: string, field: RegExp | [RegExp, number], verbs: ('predict' | 'plan')[] = ['predict', 'plan']): void {
  const [pattern, lines] = Array.isArray(field) ? field : [field, 1];
  for (const verb of verbs) {
    const plan = out('.plan.json');
    add({ name: `${verb}: board ${name}`, args: () => (verb === 'predict' ? ['predict', file] : ['plan', file, '-o', plan]), file, field: pattern, lines, leaves: [plan] });
  }
}

for (const f of readdirSync(BAD_BOARDS).sort()) boardCase(f, path.join(BAD_BOARDS, f), fieldOf(boardField, f, BAD_BOARDS));
for (const f of readdirSync(RELIABILITY_BOARDS).sort()) boardCase(f, path.join(RELIABILITY_BOARDS, f), fieldOf(reliabilityBoardField, f, RELIABILITY_BOARDS));

function fieldOf<T>(table: Record<string, T>, file: string, folder: string): T {
  if (!(file in table)) throw new Error(`${folder}/${file} has no entry in the bad-input table`);
  return table[file];
}

// New board mistakes, one edit of a demo board each.
const b = (name: string, source: string, from: string | RegExp, to: string, field: RegExp, verbs?: ('predict' | 'plan')[]) =>
  boardCase(name, edited(source, `board-${name}${path.extname(source)}`, from, to), field, verbs);
b('value in parsecs', CHAIN, 'value: 10nF', 'value: 10 parsecs', /: lattice\.bonds\[0\]\.value: .*not known/);
b('tolerance without %', CHAIN, 'tolerance: 5%', 'tolerance: 5', /: lattice\.bonds\[0\]\.tolerance: .*percent/, ['predict']);
b('repeats far too many', CHAIN, 'repeats: [12]', 'repeats: [100000000]', /: lattice\.repeats: .*more than the 1000000/);
b('repeats of a float', CHAIN, 'repeats: [12]', 'repeats: [2.5]', /: lattice\.repeats\[0\]: /, ['predict']);
b('boundary twisted', CHAIN, 'boundary: open', 'boundary: twisted', /: lattice\.boundary: /, ['plan']);
b('ground on unknown site', CHAIN, 'site: b,', 'site: c,', /: lattice\.grounds\[1\]\.site: unknown site "c"/);
b('bond kind Q', CHAIN, 'kind: C, value: 10nF', 'kind: Q, value: 10nF', /: lattice\.bonds\[0\]\.kind: /, ['predict']);
b('esr in farads', CHAIN, 'esr: 0.02 }', 'esr: 0.02 F }', /: lattice\.bonds\[0\]\.esr: .*farads, expected ohms/, ['plan']);
b('q_at in henries', CHAIN, 'q_at: 100kHz', 'q_at: 100uH', /: lattice\.grounds\[0\]\.q_at: .*henries, expected hertz/);
b('q negative', CHAIN, 'q: 50', 'q: -50', /: lattice\.grounds\[0\]\.q: /, ['predict']);
b('names with unknown placeholder', CHAIN, 'names: "n{index}"', 'names: "n{row}"', /: lattice\.names: unknown placeholder \{row\}/, ['plan']);
b('zero lattice vector', CHAIN, 'vectors: [[2, 0, 0]]', 'vectors: [[0, 0, 0]]', /: lattice\.vectors\[0\]: .*zero vector/);
b('offset for two axes', CHAIN, 'offset: [1]', 'offset: [1, 0]', /: lattice\.bonds\[1\]\.offset: /, ['predict']);
b('misspelt description', CHAIN, 'description:', 'descripton:', /: descripton: unknown field \(did you mean "description"\?\)/, ['plan']);
b('set where true belongs', CHAIN, 'terminate: true', 'terminate: !!set { a }', /: lattice\.terminate: YAML tag gives a Set/);
b('a list as a key', CHAIN, 'name: chain-24', '? [a, b]\n: 1\nname: chain-24', /: \["\[ a, b \]"\]: unknown field/, ['predict']);
b('decimal comma', TANK, '"value": "33nF"', '"value": "33,5nF"', /: components\[3\]\.value: .*decimal point/);
b('duplicate reference', TANK, '"ref": "C3"', '"ref": "C2"', /: components\[5\]\.ref: duplicate reference designator "C2"/, ['plan']);
b('three nodes', TANK, '["t1", "gnd"]', '["t1", "gnd", "t2"]', /: components\[0\]\.nodes: needs exactly two node names/);
b('esr on a resistor', TANK, '"value": "100k", "tolerance": "1%"', '"value": "100k", "tolerance": "1%", "esr": 1', /: components\[8\]\.esr: /, ['predict']);
b('node called __proto__', TANK, '["t3", "gnd"]', '["__proto__", "gnd"]', /: components\[2\]\.nodes\[0\]: node name "__proto__" is reserved/);
b('kind in lower case', TANK, '"kind": "C", "nodes": ["t1", "gnd"]', '"kind": "c", "nodes": ["t1", "gnd"]', /: components\[3\]\.kind: unknown kind "c"/, ['plan']);
b('unknown change', CORNER, 'grounds:', 'changes: [{ ref: C_nope_0, value: 1n }]\n  grounds:', /: lattice\.changes\[0\]\.ref: no lattice part is called "C_nope_0"/);
boardCase('one repeat for two axes', edited(CORNER, 'board-one-repeat.yaml', 'repeats: [4, 4]', 'repeats: [4]'), [/: lattice\.boundary: has 2 entries, the lattice has 1 axis/, 7], ['predict']);
boardCase('empty file', written('board-empty.yaml', ''), /\.yaml: the file is empty/);
boardCase('only a comment', written('board-comment.yaml', '# nothing here yet\n'), /\.yaml: must hold a mapping .*got nothing/, ['predict']);
boardCase('a JSON number', written('board-number.json', '42\n'), /\.json: must hold a mapping .*got 42/, ['plan']);
boardCase('binary bytes', written('board-bytes.yaml', Buffer.from([0x7f, 0x45, 0x4c, 0x46, 0x02, 0x01, 0x01, 0x00, 0x3a, 0x00, 0xff, 0xfe, 0x5b, 0x0a])), /\.yaml: must hold a mapping .*got ".?ELF/);
boardCase('nested ten thousand deep', written('board-deep.yaml', `${'['.repeat(10_000)}${']'.repeat(10_000)}\n`), /\.yaml: line 1, column \d+: YAML syntax error/, ['predict']);
boardCase('no such file', path.join(DIR, 'no-such-board.yaml'), /no-such-board\.yaml: cannot read the file: no such file/);
boardCase('a folder', 'shared/boards', /shared\/boards: is a directory, not a board file/, ['predict']);
// The board given with run --board and sim --board goes through the same reader.
const boardRunLog = out('.csv');
add({ name: 'run: --board with a bad board', args: () => ['run', PLAN, '--sim', '--board', `${BAD_BOARDS}/zero-value.yaml`, '--log', boardRunLog], file: 'zero-value.yaml', field: /: components\[1\]\.value: /, leaves: [boardRunLog] });
add({ name: 'sim: --board with a bad board', args: () => ['sim', '--tcp', '0', '--board', `${BAD_BOARDS}/unknown-kind.yaml`], file: 'unknown-kind.yaml', field: /: components\[1\]\.kind: /, serves: true });

// ---------------------------------------------------------------------------------------------------------
// Plan files: every existing bad fixture through plan --check and run --sim, then new ones.

const BAD_PLANS = 'test/fixtures/plans/bad';
const planField: Record<string, RegExp | [RegExp, number]> = {
  'a-list.json': /\.json: must hold one JSON object/,
  'board-edited.json': /: board\.hash: does not match/,
  'channel-not-in-fixture.json': /: steps\[0\]\.channels\[0\]: /,
  'channels-without-switch.json': [/: steps\[0\]\.channels: .*no switch matrix/, 7],
  'channels-wrong-terminals.json': /: steps\[0\]\.channels: /,
  'empty.json': /\.json: the file is empty/,
  'fixture-channel-twice.json': [/: fixture\.nodes\.p2\.lo: channel 2001 is already used/, 2],
  'format-version.json': /: format: must be "topoprobe-plan\/1"/,
  'level-as-text.json': /: steps\[3\]\.level_v: must be a number/,
  'magnitude-band-reversed.json': /: steps\[0\]\.points\[2\]\.band: /,
  'negative-frequency.json': /: steps\[0\]\.points\[0\]\.frequency_hz: /,
  'no-steps.json': /: steps: missing/,
  'phase-out-of-range.json': /: steps\[0\]\.points\[1\]\.band\.phase_lo_deg: /,
  'step-numbering.json': /: steps\[1\]\.step: /,
  'to-ground-lo-node.json': /: steps\[1\]\.lo: /,
  'transfer-without-sense.json': /: steps\[4\]\.sense: missing/,
  'truncated.json': /: line 43, column 14: JSON syntax error/,
  'unknown-node.json': /: steps\[2\]\.hi: no node "p9"/,
  'unknown-step-field.json': /: steps\[0\]\.colour: unknown field/,
  'zero-averages.json': /: steps\[0\]\.averages: /,
};
const RELIABILITY_PLANS = 'test/fixtures/reliability/plans';
const reliabilityPlanField: Record<string, RegExp> = {
  'not-a-number.json': /: line 1, column 42: JSON syntax error: unexpected "N"/,
  'single-quotes.json': /: line 1, column 3: JSON syntax error/,
  'written-as-yaml.json': /: line 1, column 2: JSON syntax error: .*a plan file is JSON/,
};

function planCase(name: string, file: string, field: RegExp | [RegExp, number], verbs: ('check' | 'run')[] = ['check', 'run']): void {
  const [pattern, lines] = Array.isArray(field) ? field : [field, 1];
  for (const verb of verbs) {
    const log = out('.csv');
    const args = verb === 'check' ? ['plan', '--check', file] : ['run', file, '--sim', '--timing', 'instant', '--log', log];
    add({ name: `${verb === 'check' ? 'plan --check' : 'run --sim'}: plan ${name}`, args: () => args, file, field: pattern, lines, leaves: [log, `${log}.meta.json`] });
  }
}

for (const f of readdirSync(BAD_PLANS).sort()) planCase(f, path.join(BAD_PLANS, f), fieldOf(planField, f, BAD_PLANS));
for (const f of readdirSync(RELIABILITY_PLANS).sort()) planCase(f, path.join(RELIABILITY_PLANS, f), fieldOf(reliabilityPlanField, f, RELIABILITY_PLANS));

const p = (name: string, change: (plan: any) => void, field: RegExp, verbs?: ('check' | 'run')[]) =>
  planCase(name, jsonEdited(PLAN, `plan-${name.replace(/\W+/g, '-')}.json`, change), field, verbs);
p('frequency as text', (d) => (d.steps[0].points[0].frequency_hz = '163k'), /: steps\[0\]\.points\[0\]\.frequency_hz: must be a number/);
p('negative level', (d) => (d.steps[0].level_v = -0.1), /: steps\[0\]\.level_v: must be greater than zero/, ['run']);
p('unknown node', (d) => (d.steps[0].hi = 'n99'), /: steps\[0\]\.hi: no node "n99"/, ['check']);
p('four-point step', (d) => (d.steps[0].kind = 'four-point'), /: steps\[0\]\.kind: /);
p('coverage of 2', (d) => (d.bands.coverage = 2), /: bands\.coverage: must be from 0 to 1/, ['run']);
p('negative current limit', (d) => (d.limits.current_a = -1), /: limits\.current_a: /, ['check']);
p('no timing', (d) => delete d.timing, /: timing: missing/);
p('fixture channel 0', (d) => (d.fixture.nodes.n1.hi = 0), /: fixture\.nodes\.n1\.hi: must be a channel from 1 to 9999/, ['run']);
p('channels as a word', (d) => (d.steps[0].channels = 'all'), /: steps\[0\]\.channels: must be a list/, ['check']);
p('a step without points', (d) => (d.steps[0].points = []), /: steps\[0\]\.points: needs at least one point/);
p('part value edited', (d) => (d.board.snapshot.parts[0].value *= 2), /: board\.hash: does not match the board snapshot/, ['run']);
p('format 2', (d) => (d.format = 'topoprobe-plan/2'), /: format: must be "topoprobe-plan\/1"/, ['check']);
p('band bound as text', (d) => (d.steps[1].points[0].band.mag_lo_ohm = 'low'), /: steps\[1\]\.points\[0\]\.band\.mag_lo_ohm: /, ['run']);
p('unknown top-level field', (d) => (d.comment = 'hello'), /: comment: unknown field/);
p('negative settle time', (d) => (d.steps[0].settle_s = -1), /: steps\[0\]\.settle_s: must be zero or more/, ['check']);
p('a null instrument name', (d) => (d.instruments.analyzer = null), /: instruments\.analyzer: /, ['run']);
planCase('cut in half', written('plan-half.json', readFileSync(PLAN, 'utf8').slice(0, 100_000)), /: line \d+, column \d+: JSON syntax error: the text ends too early/);
planCase('null', written('plan-null.json', 'null\n'), /\.json: must hold one JSON object .*got nothing/, ['run']);
planCase('no such file', path.join(DIR, 'no-such.plan.json'), /no-such\.plan\.json: cannot read the plan: no such file/);
planCase('a folder', 'sequences', /sequences: is a directory, not a plan file/, ['check']);
planCase('a board file', CHAIN, /chain-24\.yaml: line 1, column 1: JSON syntax error/, ['check']);
// What only a run can find: the profiles the plan names, and its levels against them.
const planRun = (name: string, change: (plan: any) => void, field: RegExp) => {
  const file = jsonEdited(PLAN, `plan-run-${name.replace(/\W+/g, '-')}.json`, change);
  const log = out('.csv');
  add({ name: `run --sim: plan ${name}`, args: () => ['run', file, '--sim', '--timing', 'instant', '--log', log], file, field, leaves: [log, `${log}.meta.json`] });
};
planRun('names an unknown analyzer profile', (d) => (d.instruments.analyzer = 'generic-analyser'), /: instruments\.analyzer: .*no built-in profile of that name \(did you mean "generic-analyzer"\?\)/);
planRun('names a missing profile file', (d) => (d.instruments.analyzer = 'profiles/missing.yaml'), /: instruments\.analyzer: .*missing\.yaml: cannot read the profile: no such file/);
planRun('names an analyzer as its switch', (d) => (d.instruments.switch = 'generic-analyzer'), /: instruments\.switch: generic-analyzer is an analyzer profile/);
planRun('level above the analyzer', (d) => (d.steps[0].level_v = 5), /steps\[0\]\.level_v|level/);
planRun('frequency above the analyzer', (d) => (d.steps[0].points[0].frequency_hz = 5e7), /steps\[0\]\.points\[0\]\.frequency_hz|frequency/);
planRun('more averages than the analyzer', (d) => (d.steps[0].averages = 1000), /steps\[0\]\.averages|averag/);

// ---------------------------------------------------------------------------------------------------------
// Instrument profiles: plan --analyzer/--switch FILE and run --analyzer-profile/--switch-profile FILE.

const BAD_PROFILES = 'test/fixtures/profiles/bad';
const profileField: Record<string, RegExp | [RegExp, number]> = {
  'bad-identity-regex.yaml': /: identity: is not a valid regular expression/,
  'bad-response-format.yaml': /: commands\.measure\.response: /,
  'bad-syntax.json': /: line 4, column 54: JSON syntax error/,
  'bad-syntax.yaml': /: line 4, column 43: YAML syntax error/,
  'bad-terminator.yaml': /: terminators\.read: /,
  'current-without-source.yaml': /: limits\.current: needs limits\.source_resistance/,
  'limits-reversed.yaml': /: limits\.frequency: min .* is above max/,
  'measure-not-query.yaml': /: commands\.measure\.query: must be a query/,
  'missing-placeholder.yaml': /: commands\.set_frequency: needs the placeholder \{hz\}/,
  'newline-in-command.yaml': /: setup\[0\]: holds a character that cannot be sent/,
  'not-a-mapping.yaml': /\.yaml: must hold a mapping of fields/,
  'setting-that-asks.yaml': /: commands\.open_all: must not be a query/,
  'several-problems.yaml': [/: terminators\.read: /, 7],
  'slot-without-size.yaml': /: channel_list\.channel: .*slot_size/,
  'switch-without-channels.yaml': /: commands\.close: needs the placeholder \{channels\}/,
  'unknown-field.yaml': /: timouts: unknown field/,
  'unknown-kind.yaml': /: kind: unknown kind "analyser"/,
  'unknown-placeholder.yaml': /: commands\.set_level: unknown placeholder \{voltage\}/,
  'wrong-unit.yaml': /: limits\.level\.max: .*amperes, expected volts/,
};

function profileCase(name: string, file: string, field: RegExp | [RegExp, number], verbs: ('plan' | 'run')[] = ['plan', 'run']): void {
  const [pattern, lines] = Array.isArray(field) ? field : [field, 1];
  const role = /^kind:\s*switch/m.test(existsSync(file) ? readFileSync(file, 'utf8') : '') ? 'switch' : 'analyzer';
  for (const verb of verbs) {
    const output = out(verb === 'plan' ? '.plan.json' : '.csv');
    const args = verb === 'plan' ? ['plan', PAIR_BOARD, '-o', output, '--bands', 'first-order', `--${role}`, file] : ['run', PAIR_PLAN, '--sim', '--timing', 'instant', '--log', output, `--${role}-profile`, file];
    add({ name: `${verb}: ${role} profile ${name}`, args: () => args, file, field: pattern, lines, leaves: [output, `${output}.meta.json`] });
  }
}

for (const f of readdirSync(BAD_PROFILES).sort()) profileCase(f, path.join(BAD_PROFILES, f), fieldOf(profileField, f, BAD_PROFILES));
const f = (name: string, source: string, from: string | RegExp, to: string, field: RegExp, verbs?: ('plan' | 'run')[]) =>
  profileCase(name, edited(source, `profile-${name.replace(/\W+/g, '-')}.yaml`, from, to), field, verbs);
f('current in parsecs', ANALYZER, 'current: 20 mA', 'current: 20 parsecs', /: limits\.current: .*not known/);
f('negative baud rate', ANALYZER, 'baud_rate: 115200', 'baud_rate: -9600', /: serial\.baud_rate: /, ['plan']);
f('parity sometimes', ANALYZER, 'parity: none', 'parity: sometimes', /: serial\.parity: /, ['run']);
f('timeout in kilograms', ANALYZER, 'command: 2 s', 'command: 2 kg', /: timeouts\.command: /);
f('no identity', ANALYZER, /^identity: .*\n/m, '', /: identity: missing/, ['plan']);
f('no kind', ANALYZER, /^kind: analyzer\n/m, '', /: kind: missing; expected analyzer or switch/, ['run']);
f('level sent as hertz', ANALYZER, "'SOURce:VOLTage:LEVel {volts}'", "'SOURce:VOLTage:LEVel {hz}'", /: commands\.set_level: /);
f('drain limit as a word', ANALYZER, 'drain_limit: 64', 'drain_limit: lots', /: errors\.drain_limit: /, ['plan']);
f('error check sometimes', ANALYZER, 'check: every-command', 'check: sometimes', /: errors\.check: /, ['run']);
f('frequency limit in volts', ANALYZER, 'max: 10 MHz', 'max: 10 MV', /: limits\.frequency\.max: .*volts, expected hertz/);
f('channels from 0', SWITCH, 'min: 1, max: 9999', 'min: 0, max: 9999', /: limits\.channels/, ['plan']);
f('unknown channel placeholder', SWITCH, "channel: '{n}'", "channel: '{x}'", /: channel_list\.channel: /);
f('settle time in volts', SWITCH, 'settle_after_relay: 5 ms', 'settle_after_relay: 5 mV', /: timing\.settle_after_relay: .*volts, expected seconds/, ['run']);
f('close without channels', SWITCH, "close: 'ROUTe:CLOSe {channels}'", "close: 'ROUTe:CLOSe'", /: commands\.close: needs the placeholder \{channels\}/, ['plan']);
profileCase('no such file', path.join(DIR, 'no-such-profile.yaml'), /no-such-profile\.yaml: cannot read the profile: no such file/);

// ---------------------------------------------------------------------------------------------------------
// Fixture maps: plan --fixture FILE (chain-24) and sim --fixture FILE.

function fixtureCase(name: string, file: string, field: RegExp, verbs: ('plan' | 'sim')[] = ['plan'], lines = 1): void {
  for (const verb of verbs) {
    const plan = out('.plan.json');
    const args = verb === 'plan' ? ['plan', CHAIN, '-o', plan, '--bands', 'first-order', '--fixture', file] : ['sim', '--tcp', '0', '--fixture', file];
    add({ name: `${verb}: fixture map ${name}`, args: () => args, file, field, lines, leaves: [plan], serves: verb === 'sim' });
  }
}
const x = (name: string, from: string | RegExp, to: string, field: RegExp, verbs?: ('plan' | 'sim')[]) =>
  fixtureCase(name, edited(FIXTURE, `fixture-${name.replace(/\W+/g, '-')}.yaml`, from, to), field, verbs);
x('channel 0', 'n1: { hi: 101', 'n1: { hi: 0', /: nodes\.n1\.hi: must be a whole number from 1 to 9999/, ['plan', 'sim']);
x('channel 10000', 'n1: { hi: 101', 'n1: { hi: 10000', /: nodes\.n1\.hi: /);
x('a channel twice', 'n2: { hi: 102', 'n2: { hi: 101', /: nodes\.n2\.hi: channel 101 is already used by nodes\.n1\.hi/, ['plan', 'sim']);
x('unknown node', 'n24:', 'n99:', /: nodes\.n99: no node "n99" on board chain-24/, ['plan', 'sim']);
x('ground under nodes', 'n1: {', 'GND: {', /: nodes\.GND: ground goes under gnd at the top level/);
x('channel as text', 'n1: { hi: 101', 'n1: { hi: "101a"', /: nodes\.n1\.hi: /, ['sim']);
x('misspelt bus', 'n1: { hi: 101', 'n1: { high: 101', /: nodes\.n1\.high: unknown field/);
x('no ground LO channel', /^gnd: .*$/m, 'gnd: { hi: 125, sense: 325 }', /: gnd\.lo: missing; the plan reads n1 to ground/);
x('binary where a channel goes', 'n1: { hi: 101', 'n1: { hi: !!binary AAAA', /: nodes\.n1\.hi: YAML tag gives a Buffer/);
fixtureCase('with no node', written('fixture-empty-nodes.yaml', 'nodes: {}\ngnd: { lo: 200 }\n'), /: nodes: lists no node/);
fixtureCase('a list', written('fixture-list.yaml', '- n1\n- n2\n'), /\.yaml: must hold a mapping with nodes and gnd/, ['sim']);
fixtureCase('a board file', PAIR_BOARD, /pair-board\.yaml: (nodes: missing|name: unknown field|components: unknown field)/, ['plan'], 3);
fixtureCase('YAML syntax error', written('fixture-syntax.yaml', 'nodes:\n  n1: { hi: 101, lo: 201\n'), /: line \d+, column \d+: YAML syntax error/, ['plan', 'sim']);
fixtureCase('no such file', path.join(DIR, 'no-such-fixture.yaml'), /no-such-fixture\.yaml: cannot read the file: no such file/, ['plan', 'sim']);

// ---------------------------------------------------------------------------------------------------------
// Logs for check, diagnose, fit and report: one good log from a simulated run, then damaged copies.

const LOGS = path.join(DIR, 'logs');
const GOOD_LOG = path.join(LOGS, 'good.csv');
type LogDamage = (csv: string, meta: any) => { csv?: string | null; meta?: string | null };
const logDamages: [name: string, damage: LogDamage, field: RegExp, metaNamed?: boolean][] = [];
const l = (name: string, damage: LogDamage, field: RegExp, metaNamed = false) => void logDamages.push([name, damage, field, metaNamed]);
const firstRow = (csv: string) => csv.split('\r\n')[1];
const withFirstRow = (csv: string, change: (cells: string[]) => void) => {
  const rows = csv.split('\r\n');
  const cells = rows[1].split(',');
  change(cells);
  rows[1] = cells.join(',');
  return rows.join('\r\n');
};
const COL = (name: string) => ['step', 'point', 'kind', 'hi', 'lo', 'sense', 'frequency_hz', 're', 'im', 'pred_re', 'pred_im', 'flag', 'note', 'time'].indexOf(name);
l('no meta file', () => ({ meta: null }), /: has no metadata beside it/);
l('meta not JSON', () => ({ meta: '{ "format": ' }), /\.meta\.json: is not JSON/, true);
l('meta null', () => ({ meta: 'null' }), /\.meta\.json: the top level: /, true);
l('meta of another format', (_, m) => ({ meta: JSON.stringify({ ...m, format: 'topoprobe-log-meta/7' }) }), /\.meta\.json: format: /, true);
l('meta status exploded', (_, m) => ({ meta: JSON.stringify({ ...m, status: 'exploded' }) }), /\.meta\.json: status: /, true);
l('meta plan sha256 short', (_, m) => ({ meta: JSON.stringify({ ...m, plan: { ...m.plan, sha256: 'abc' } }) }), /\.meta\.json: plan\.sha256: /, true);
l('meta seed too big', (_, m) => ({ meta: JSON.stringify({ ...m, simulated: { ...m.simulated, seed: 1e23 } }) }), /\.meta\.json: simulated\.seed: /, true);
l('snapshot a word', (_, m) => ({ meta: JSON.stringify({ ...m, board: { ...m.board, snapshot: 'nothing' } }) }), /\.meta\.json: board\.snapshot: /, true);
l('snapshot without parts', (_, m) => ({ meta: JSON.stringify({ ...m, board: { ...m.board, snapshot: { name: 'pair', nodes: m.board.snapshot.nodes } } }) }), /\.meta\.json: board\.snapshot\.parts: /, true);
l('snapshot part on unknown node', (_, m) => {
  m.board.snapshot.parts[0].nodes[0] = 'p9';
  return { meta: JSON.stringify(m) };
}, /\.meta\.json: board\.snapshot\.parts\.0\.nodes\.0: no node "p9"/, true);
l('snapshot value as text', (_, m) => {
  m.board.snapshot.parts[1].value = '22uH';
  return { meta: JSON.stringify(m) };
}, /\.meta\.json: board\.snapshot\.parts\.1\.value: /, true);
l('wrong header', (csv) => ({ csv: csv.replace(/^step,point/, 'stop,point') }), /: has the columns stop,point/);
l('LF line ends', (csv) => ({ csv: csv.replace(/\r\n/g, '\n') }), /: does not end in CR LF records/);
l('a short row', (csv) => ({ csv: csv.replace(firstRow(csv), '1,1,to-ground') }), /: is not valid CSV: .*line 2/);
l('an unclosed quote', (csv) => ({ csv: csv.replace(firstRow(csv), firstRow(csv).replace(',p1,', ',"p1,')) }), /: is not valid CSV: Quote Not Closed/);
l('step zero', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('step')] = 'zero')) }), /: line 2, column step: /);
l('re not a number', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('re')] = 'abc')) }), /: line 2, column re: "abc" is not a number/);
l('kind sideways', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('kind')] = 'sideways')) }), /: line 2, column kind: /);
l('flag maybe', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('flag')] = 'maybe')) }), /: line 2, column flag: /);
l('negative frequency', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('frequency_hz')] = '-5')) }), /: line 2, column frequency_hz: -5 is not a frequency above zero/);
l('two-point on one node', (csv) => ({ csv: withFirstRow(csv, (c) => ((c[COL('kind')] = 'two-point'), (c[COL('lo')] = c[COL('hi')]))) }), /: line 2, column lo: /);
l('transfer without sense', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('kind')] = 'transfer')) }), /: line 2, column sense: /);
l('to-ground with sense', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('sense')] = 'p2')) }), /: line 2, column sense: only transfer readings/);
l('to-ground to a node', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('lo')] = 'p2')) }), /: line 2, column lo: /);
l('hi not on the board', (csv) => ({ csv: withFirstRow(csv, (c) => (c[COL('hi')] = 'p9')) }), /: line 2, column hi: "p9" is not a node of board pair/);
l('no readings at all', (csv) => ({ csv: csv.split('\r\n')[0] + '\r\n' }), /: holds no readings yet; nothing to analyse/);

const LOG_VERBS = ['check', 'diagnose', 'fit', 'report'] as const;
for (const [name, , field, metaNamed] of logDamages) {
  const log = path.join(LOGS, `${name.replace(/\W+/g, '-')}.csv`);
  for (const verb of LOG_VERBS) {
    const html = out('.html');
    add({ name: `${verb}: log ${name}`, args: () => (verb === 'report' ? ['report', log, '-o', html] : [verb, log]), file: metaNamed ? `${path.basename(log)}.meta.json` : path.basename(log), field, leaves: [html] });
  }
}
const missingLog = path.join(LOGS, 'no-such.csv');
for (const verb of LOG_VERBS) add({ name: `${verb}: no such log`, args: () => (verb === 'report' ? ['report', missingLog, '-o', out('.html')] : [verb, missingLog]), file: missingLog, field: /no-such\.csv: no such log/ });
add({ name: 'check: log is a folder', args: () => ['check', path.join(LOGS, 'folder.csv')], file: 'folder.csv', field: /folder\.csv: cannot read it/ });

// ---------------------------------------------------------------------------------------------------------
// Flags, verb by verb: one line naming the flag.

const flag = (name: string, args: string[] | (() => string[]), field: RegExp, extra: Partial<BadCase> = {}) =>
  add({ name, args: typeof args === 'function' ? args : () => args, field, ...extra });

// predict
flag('predict: no board', ['predict'], /missing required argument 'board'.*topoprobe predict --help/);
flag('predict: two boards', ['predict', CHAIN, TANK], /too many arguments for 'predict'/);
flag('predict: unknown option', ['predict', CHAIN, '--frequency', '1k'], /unknown option '--frequency'.*topoprobe predict --help/);
flag('predict: --freq 12 parsecs', ['predict', CHAIN, '--freq', '12 parsecs'], /^topoprobe: --freq 12 parsecs: .*not known: expected hertz/);
flag('predict: --freq in farads', ['predict', CHAIN, '--freq', '10nF'], /^topoprobe: --freq 10nF: .*farads, expected hertz/);
flag('predict: --freq only a comma', ['predict', CHAIN, '--freq', ','], /^topoprobe: --freq ",": expected one or more frequencies/);
flag('predict: --freq 0', ['predict', CHAIN, '--freq', '0'], /^topoprobe: --freq 0: .*zero/);
flag('predict: --freq negative', ['predict', CHAIN, '--freq', '-5k'], /^topoprobe: --freq -5k: .*negative/);
flag('predict: --freq beyond a double', ['predict', CHAIN, '--freq', '1e400'], /^topoprobe: --freq 1e400: .*not finite/);
flag('predict: --sweep downwards', ['predict', CHAIN, '--sweep', '200k:100k:5'], /^topoprobe: --sweep 200k:100k:5: STOP is below START/);
flag('predict: --sweep of 0 points', ['predict', CHAIN, '--sweep', '1k:2k:0'], /^topoprobe: --sweep 1k:2k:0: POINTS must be a whole number/);
flag('predict: --sweep cubic', ['predict', CHAIN, '--sweep', '1k:2k:5:cubic'], /^topoprobe: --sweep 1k:2k:5:cubic: the fourth field/);
flag('predict: --sweep without points', ['predict', CHAIN, '--sweep', '1k:2k'], /^topoprobe: --sweep 1k:2k: expected START:STOP:POINTS/);
flag('predict: --node not on the board', ['predict', CHAIN, '--node', 'n99'], /^topoprobe: --node n99: no node "n99" on board chain-24/);
flag('predict: --node gnd', ['predict', CHAIN, '--node', 'gnd'], /^topoprobe: --node gnd: ground is the reference/);
flag('predict: --pair of one node', ['predict', CHAIN, '--pair', 'n1'], /^topoprobe: --pair n1: expected HI:LO/);
flag('predict: --pair n1:n1', ['predict', CHAIN, '--pair', 'n1:n1'], /^topoprobe: --pair n1:n1: both ends are the same node/);
flag('predict: --pair to an unknown node', ['predict', CHAIN, '--pair', 'n1:n99'], /^topoprobe: --pair n99: no node "n99"/);
flag('predict: --modes 0', ['predict', CHAIN, '--modes', '0'], /^topoprobe: --modes 0: expected a whole number from 1 to 24/);
flag('predict: --modes -3', ['predict', CHAIN, '--modes', '-3'], /^topoprobe: --modes -3: expected a whole number/);
flag('predict: --modes abc', ['predict', CHAIN, '--modes', 'abc'], /^topoprobe: --modes abc: expected a whole number/);
flag('predict: --modes more than nodes', ['predict', CHAIN, '--modes', '1000000000'], /^topoprobe: --modes 1000000000: expected a whole number from 1 to 24/);
flag('predict: --near without --modes', ['predict', CHAIN, '--near', '160k'], /^topoprobe: --near goes with --modes K/);
flag('predict: --near 16x', ['predict', CHAIN, '--modes', '2', '--near', '16x'], /^topoprobe: --near 16x: /);
flag('predict: --bands 0', ['predict', CHAIN, '--bands', '0'], /^topoprobe: --bands 0: expected a whole number/);
flag('predict: --bands abc', ['predict', CHAIN, '--bands', 'abc'], /^topoprobe: --bands abc: expected a whole number/);
flag('predict: --bands without a lattice', ['predict', TANK, '--bands'], /^topoprobe: --bands: board tank-3 has no lattice section/);

// plan
const planOut = () => out('.plan.json');
const refusedPlan = (name: string, more: string[], field: RegExp) => {
  const o = planOut();
  flag(`plan: ${name}`, ['plan', PAIR_BOARD, '-o', o, ...more], field, { leaves: [o] });
};
flag('plan: no board', ['plan'], /^topoprobe: give a board file/);
flag('plan: no -o', ['plan', PAIR_BOARD], /^topoprobe: -o FILE: say where to write the plan/);
flag('plan: -o empty', ['plan', PAIR_BOARD, '-o', ''], /^topoprobe: -o FILE: /);
flag('plan: --check with a board', ['plan', PAIR_BOARD, '--check', PAIR_PLAN], /^topoprobe: --check: give only the plan file/);
flag('plan: --check without a file', ['plan', '--check'], /argument missing|option '--check <plan>' argument missing/);
flag('plan: unknown option', ['plan', PAIR_BOARD, '-o', planOut(), '--sampels', '10'], /unknown option '--sampels'.*did you mean --samples\?/i);
refusedPlan('--bands fast', ['--bands', 'fast'], /^topoprobe: --bands fast: expected monte-carlo or first-order$/);
refusedPlan('--samples 0', ['--samples', '0'], /^topoprobe: --samples 0: expected a whole number from 1 to 100000$/);
refusedPlan('--samples -5', ['--samples', '-5'], /^topoprobe: --samples -5: expected a whole number/);
refusedPlan('--seed abc', ['--seed', 'abc'], /^topoprobe: --seed abc: expected a whole number/);
refusedPlan('--seed 1.5', ['--seed', '1.5'], /^topoprobe: --seed 1\.5: expected a whole number/);
refusedPlan('--combine with Monte Carlo', ['--combine', 'worst-case'], /^topoprobe: --combine: goes with --bands first-order/);
refusedPlan('--combine sum', ['--bands', 'first-order', '--combine', 'sum'], /^topoprobe: --combine sum: expected quadrature or worst-case$/);
refusedPlan('--samples with first order', ['--bands', 'first-order', '--samples', '10'], /^topoprobe: --samples: goes with --bands monte-carlo/);
refusedPlan('--seed with first order', ['--bands', 'first-order', '--seed', '3'], /^topoprobe: --seed: goes with --bands monte-carlo/);
refusedPlan('--level in farads', ['--level', '10nF'], /^topoprobe: --level 10nF: "10nF" is in farads, expected volts$/);
refusedPlan('--level 0', ['--level', '0'], /^topoprobe: --level 0: .*zero/);
refusedPlan('--level above the analyzer', ['--bands', 'first-order', '--level', '5 V'], /^topoprobe: --level 5 V: above the analyzer's limits\.level\.max/);
refusedPlan('--analyzer a switch profile', ['--analyzer', 'generic-switch'], /^topoprobe: --analyzer generic-switch: is a switch profile/);
refusedPlan('--switch an analyzer profile', ['--switch', 'generic-analyzer'], /^topoprobe: --switch generic-analyzer: is an analyzer profile/);
refusedPlan('--switch misspelt', ['--switch', 'generic-swich'], /^topoprobe: generic-swich: no built-in profile of that name \(did you mean "generic-switch"\?\)/);
refusedPlan('--near 16x', ['--near', '16x'], /^topoprobe: --near 16x: /);
refusedPlan('--modes 0', ['--modes', '0'], /^topoprobe: --modes 0: expected a whole number from 1 to 2$/);
refusedPlan('--points 3', ['--points', '3'], /^topoprobe: --points 3: expected a whole number from 8 to 10000$/);
refusedPlan('--points abc', ['--points', 'abc'], /^topoprobe: --points abc: /);
refusedPlan('--floor-phase 200', ['--floor-phase', '200'], /^topoprobe: --floor-phase 200: expected degrees from 0 to below 180/);
refusedPlan('--floor-relative without %', ['--floor-relative', '2'], /^topoprobe: --floor-relative 2: "2" is not a percentage/);
refusedPlan('--floor-absolute in volts', ['--floor-absolute', '5mV'], /^topoprobe: --floor-absolute 5mV: "5mV" is in volts, expected ohms$/);
refusedPlan('--fixture with --switch none', ['--switch', 'none', '--fixture', FIXTURE], /^topoprobe: --fixture: an operator-probed plan/);
refusedPlan('--probe-time with a switch', ['--probe-time', '5s'], /^topoprobe: --probe-time: goes with operator-probed plans/);
refusedPlan('--probe-time negative', ['--switch', 'none', '--probe-time', '-5s'], /^topoprobe: --probe-time -5s: "-5s" is negative; it must be greater than zero$/);
refusedPlan('--probe-time in kilograms', ['--switch', 'none', '--probe-time', '5 kg'], /^topoprobe: --probe-time 5 kg: /);
refusedPlan('--averages 0', ['--averages', '0'], /^topoprobe: --averages 0: expected a whole number/);
refusedPlan('--averages -1', ['--averages', '-1'], /^topoprobe: --averages -1: expected a whole number/);
flag('plan: -o into a missing folder', ['plan', PAIR_BOARD, '--bands', 'first-order', '-o', path.join(DIR, 'no-such-folder', 'x.plan.json')], /x\.plan\.json: cannot write the plan: no such folder/, { file: 'x.plan.json' });

// run
const runLog = () => out('.csv');
const refusedRun = (name: string, more: string[], field: RegExp, plan = PAIR_PLAN) => {
  const log = runLog();
  flag(`run: ${name}`, ['run', plan, '--log', log, ...more], field, { leaves: [log, `${log}.meta.json`] });
};
flag('run: no plan', ['run', '--sim'], /missing required argument 'plan'/);
flag('run: unknown option', ['run', PAIR_PLAN, '--sim', '--fast'], /unknown option '--fast'.*topoprobe run --help/);
flag('run: two plans', ['run', PAIR_PLAN, PLAN, '--sim'], /too many arguments for 'run'/);
refusedRun('neither --sim nor --analyzer', [], /^topoprobe: give --sim, or --analyzer ADDRESS/);
refusedRun('--sim with --analyzer', ['--sim', '--analyzer', '/dev/ttyUSB0'], /^topoprobe: --sim measures the simulated bench: leave out --analyzer/);
refusedRun('--fault without --sim', ['--analyzer', '127.0.0.1:5025', '--switch', '127.0.0.1:5026', '--fault', 'C1=open'], /^topoprobe: --fault goes with --sim/);
refusedRun('--timing without --sim', ['--analyzer', '127.0.0.1:5025', '--switch', '127.0.0.1:5026', '--timing', 'instant'], /^topoprobe: --timing goes with --sim/);
refusedRun('--timing sometimes', ['--sim', '--timing', 'sometimes'], /^topoprobe: --timing sometimes: expected realistic or instant$/);
refusedRun('--seed abc', ['--sim', '--seed', 'abc'], /^topoprobe: --seed abc: expected a whole number/);
refusedRun('--seed 1.5', ['--sim', '--seed', '1.5'], /^topoprobe: --seed 1\.5: expected a whole number/);
refusedRun('--seed beyond a safe integer', ['--sim', '--seed', '99999999999999999999999'], /^topoprobe: --seed 99999999999999999999999: expected a whole number from/);
flag('run: --resume without --log', ['run', PAIR_PLAN, '--sim', '--resume'], /^topoprobe: --resume needs --log FILE/);
refusedRun('--fault on an unknown part', ['--sim', '--fault', 'C_nothing_9=open'], /^topoprobe: fault "C_nothing_9=open": no part "C_nothing_9"/);
refusedRun('--fault purple', ['--sim', '--fault', 'C1=purple'], /^topoprobe: fault "C1=purple": "purple" is not a value/);
refusedRun('--fault in henries on a capacitor', ['--sim', '--fault', 'C1=10uH'], /^topoprobe: fault "C1=10uH": "10uH" is in henries, expected farads/);
refusedRun('--fault without =', ['--sim', '--fault', 'C1'], /^topoprobe: fault "C1": has no "="/);
refusedRun('--fault without a part', ['--sim', '--fault', '=open'], /^topoprobe: fault "=open": names no part/);
refusedRun('two faults on one part', ['--sim', '--fault', 'C1=open', '--fault', 'C1=short'], /^topoprobe: fault "C1=short": C1 already has a fault/);
refusedRun('--analyzer :::', ['--analyzer', ':::', '--switch', '127.0.0.1:5026'], /^topoprobe: --analyzer: ":::" is neither a serial port nor HOST:PORT/);
refusedRun('--analyzer port 99999', ['--analyzer', '127.0.0.1:99999', '--switch', '127.0.0.1:5026'], /^topoprobe: --analyzer: "127\.0\.0\.1:99999" has port 99999, outside 1\.\.65535/);
refusedRun('--analyzer with a word for a baud rate', ['--analyzer', '/dev/ttyUSB0@fast', '--switch', '127.0.0.1:5026'], /^topoprobe: --analyzer: "\/dev\/ttyUSB0@fast" has a baud rate "fast"/);
refusedRun('--switch :::', ['--analyzer', '127.0.0.1:5025', '--switch', ':::'], /^topoprobe: --switch: ":::" is neither a serial port nor HOST:PORT/);
refusedRun('no --switch for a switched plan', ['--analyzer', '127.0.0.1:5025'], /^topoprobe: --switch ADDRESS is needed/);
refusedRun('--operator with --switch', ['--analyzer', '127.0.0.1:5025', '--switch', '127.0.0.1:5026', '--operator'], /^topoprobe: --switch: not used in operator-probed mode/);
refusedRun('--operator with --switch-profile', ['--sim', '--operator', '--switch-profile', 'generic-switch'], /^topoprobe: --switch-profile: not used in operator-probed mode/);
refusedRun('--analyzer-profile a switch', ['--sim', '--analyzer-profile', 'generic-switch'], /^topoprobe: --analyzer-profile: generic-switch is a switch matrix profile/);
refusedRun('--switch-profile an analyzer', ['--sim', '--switch-profile', 'sim-polar-analyzer'], /^topoprobe: --switch-profile: sim-polar-analyzer is an analyzer profile/);
refusedRun('--analyzer-profile misspelt', ['--sim', '--analyzer-profile', 'generic-analyser'], /^topoprobe: generic-analyser: no built-in profile of that name \(did you mean "generic-analyzer"\?\)/);
refusedRun('--board of another board', ['--sim', '--board', CHAIN], /^topoprobe: --board shared\/boards\/chain-24\.yaml: board chain-24 .* is not the board pair/);
refusedRun('--board missing', ['--sim', '--board', path.join(DIR, 'no-board.yaml')], /no-board\.yaml: cannot read the file: no such file/);
flag('run: --log into a missing folder', ['run', PAIR_PLAN, '--sim', '--timing', 'instant', '--log', path.join(DIR, 'no-such-folder', 'x.csv')], /x\.csv: its folder does not exist/, { file: 'x.csv' });
flag('run: --trace into a missing folder', () => ['run', PAIR_PLAN, '--sim', '--timing', 'instant', '--log', runLog(), '--trace', path.join(DIR, 'no-such-folder', 't.txt')], /^topoprobe: trace file .*t\.txt: cannot open it/);
flag('run: --resume a log that is not there', ['run', PAIR_PLAN, '--sim', '--log', path.join(DIR, 'absent.csv'), '--resume'], /absent\.csv\.meta\.json: no meta file beside the log/);
flag('run: --resume a complete log', () => ['run', PAIR_PLAN, '--sim', '--log', GOOD_LOG, '--resume'], /good\.csv: is complete already; nothing to resume/);
flag('run: --resume with another plan', () => ['run', PLAN, '--sim', '--log', GOOD_LOG, '--resume'], /good\.csv: was made with another plan/);
const precious = written('precious.csv', 'precious\r\n');
flag('run: a log that exists, without --resume', ['run', PAIR_PLAN, '--sim', '--log', precious], /^topoprobe: --log .*precious\.csv: exists already; give --resume/, { keeps: precious });

// sim (each of these must be refused before anything is served)
const simFlag = (name: string, more: string[], field: RegExp) => flag(`sim: ${name}`, ['sim', ...more], field, { serves: true });
simFlag('neither --tcp nor --pty', [], /^topoprobe: give exactly one of --tcp PORT or --pty$/);
simFlag('both --tcp and --pty', ['--tcp', '0', '--pty'], /^topoprobe: give exactly one of --tcp PORT or --pty$/);
simFlag('--tcp 70000', ['--tcp', '70000'], /^topoprobe: --tcp 70000: /);
simFlag('--tcp abc', ['--tcp', 'abc'], /^topoprobe: --tcp abc: /);
simFlag('--tcp on another address', ['--tcp', '0.0.0.0:5025'], /^topoprobe: --tcp 0\.0\.0\.0:5025: /);
simFlag('--seed abc', ['--tcp', '0', '--seed', 'abc'], /^topoprobe: --seed abc: expected a whole number \(at most 2\^53 - 1 in size\)$/);
simFlag('--seed beyond a safe integer', ['--tcp', '0', '--seed', '1e23'], /^topoprobe: --seed 1e23: expected a whole number/);
simFlag('--timing sometimes', ['--tcp', '0', '--timing', 'sometimes'], /^topoprobe: --timing sometimes: expected realistic or instant$/);
simFlag('--noise 2', ['--tcp', '0', '--noise', '2'], /^topoprobe: --noise 2: expected a relative level from 0 to 1/);
simFlag('--noise abc', ['--tcp', '0', '--noise', 'abc'], /^topoprobe: --noise abc: /);
simFlag('--stuck channel 0', ['--tcp', '0', '--stuck', '0=open'], /^topoprobe: --stuck 0=open: channels run from 1 to 9999$/);
simFlag('--stuck ajar', ['--tcp', '0', '--stuck', '105=ajar'], /^topoprobe: --stuck 105=ajar: expected CHANNEL=open or CHANNEL=closed/);
simFlag('--terminator nul', ['--tcp', '0', '--terminator', 'nul'], /^topoprobe: --terminator nul: expected lf, crlf or cr$/);
simFlag('--pace-baud with --tcp', ['--tcp', '0', '--pace-baud', '9600'], /^topoprobe: --pace-baud goes with --pty$/);
simFlag('--fault on an unknown part', ['--tcp', '0', '--fault', 'X=open'], /^topoprobe: fault "X=open": no part "X" on board chain-24/);
simFlag('--fault purple', ['--tcp', '0', '--fault', 'C_intra_0=purple'], /^topoprobe: fault "C_intra_0=purple": "purple" is not a value/);
simFlag('--board missing', ['--tcp', '0', '--board', path.join(DIR, 'no-board.yaml')], /no-board\.yaml: cannot read the file: no such file/);
simFlag('--misbehave nonsense', ['--tcp', '0', '--misbehave', 'nonsense'], /^topoprobe: --misbehave nonsense: expected TARGET:KIND\[=ARGS\]/);
simFlag('--misbehave on a printer', ['--tcp', '0', '--misbehave', 'printer:drop=0.1'], /^topoprobe: --misbehave printer:drop=0\.1: expected TARGET:KIND/);
simFlag('--misbehave rate 2', ['--tcp', '0', '--misbehave', 'analyzer:late=2:5'], /^topoprobe: --misbehave analyzer:late=2:5: RATE is a fraction/);
simFlag('--misbehave without a rate', ['--tcp', '0', '--misbehave', 'analyzer:late'], /^topoprobe: --misbehave analyzer:late: RATE must be a number$/);
simFlag('--misbehave errors every x', ['--tcp', '0', '--misbehave', 'both:errors=x'], /^topoprobe: --misbehave both:errors=x: EVERY must be a whole number$/);
simFlag('--misbehave garbage sideways', ['--tcp', '0', '--misbehave', 'analyzer:garbage=0.1:sideways'], /^topoprobe: --misbehave analyzer:garbage=0\.1:sideways: the garbage mode is replace or prefix$/);
simFlag('--misbehave teleport', ['--tcp', '0', '--misbehave', 'switch:teleport=1'], /^topoprobe: --misbehave switch:teleport=1: unknown kind "teleport"/);
simFlag('unknown option', ['--tcp', '0', '--bord', CHAIN], /unknown option '--bord'.*topoprobe sim --help/);

// check, diagnose, fit, report on a good log
flag('check: no log', ['check'], /missing required argument 'log'/);
flag('check: --floor of two numbers', () => ['check', GOOD_LOG, '--floor', '1,2'], /^topoprobe: --floor 1,2: expected three non-negative numbers/);
flag('check: --floor of words', () => ['check', GOOD_LOG, '--floor', 'a,b,c'], /^topoprobe: --floor a,b,c: /);
flag('check: --floor negative', () => ['check', GOOD_LOG, '--floor', '-1,0,0'], /^topoprobe: --floor -1,0,0: /);
flag('diagnose: --limit 0', () => ['diagnose', GOOD_LOG, '--limit', '0'], /^topoprobe: --limit 0: expected a whole number from 1 to 1000$/);
flag('diagnose: --limit abc', () => ['diagnose', GOOD_LOG, '--limit', 'abc'], /^topoprobe: --limit abc: /);
flag('diagnose: --noise 5', () => ['diagnose', GOOD_LOG, '--noise', '5'], /^topoprobe: --noise 5: expected a relative scatter between 0 and 1/);
flag('diagnose: --noise 0', () => ['diagnose', GOOD_LOG, '--noise', '0'], /^topoprobe: --noise 0: /);
flag('diagnose: --floor -1', () => ['diagnose', GOOD_LOG, '--floor', '-1'], /^topoprobe: --floor -1: expected a resistance in ohms/);
flag('diagnose: --parts unknown', () => ['diagnose', GOOD_LOG, '--parts', 'NOPE'], /parts: no part "NOPE" on board pair/);
flag('fit: --scale X', () => ['fit', GOOD_LOG, '--scale', 'X'], /^topoprobe: --scale X: expected C, L or C,L$/);
flag('fit: --coil-resistance and --coil-q', () => ['fit', GOOD_LOG, '--coil-resistance', '--coil-q', '100k'], /^topoprobe: give --coil-resistance or --coil-q, not both$/);
flag('fit: --coil-q 12 parsecs', () => ['fit', GOOD_LOG, '--coil-q', '12 parsecs'], /^topoprobe: --coil-q 12 parsecs: /);
flag('fit: --parts unknown', () => ['fit', GOOD_LOG, '--parts', 'NOPE'], /^topoprobe: --parts NOPE: no part "NOPE" on board pair/);
flag('fit: --parts twice', () => ['fit', GOOD_LOG, '--parts', 'C1,C1'], /^topoprobe: --parts C1,C1: C1 is named twice$/);
const fittedExisting = written('fitted.yaml', 'name: earlier fit\n');
flag('fit: -o over an existing file', () => ['fit', GOOD_LOG, '-o', fittedExisting], /fitted\.yaml: cannot write the board: the file exists already/, { file: 'fitted.yaml', keeps: fittedExisting });
flag('report: no -o', () => ['report', GOOD_LOG], /required option '-o, --output <file\.html>' not specified/);
flag('report: -o not HTML', () => ['report', GOOD_LOG, '-o', path.join(OUT, 'report.txt')], /^topoprobe: -o .*report\.txt: give an output file ending in \.html$/, { leaves: [path.join(OUT, 'report.txt')] });
flag('report: -o into a missing folder', () => ['report', GOOD_LOG, '-o', path.join(DIR, 'no-such-folder', 'r.html')], /r\.html: cannot write the report/, { file: 'r.html' });
flag('report: --plan of another scan', () => ['report', GOOD_LOG, '-o', out('.html'), '--plan', PLAN], /^topoprobe: --plan sequences\/chain-24\.plan\.json: not the plan this scan ran/);
flag('report: --plan that is not there', () => ['report', GOOD_LOG, '-o', out('.html'), '--plan', path.join(DIR, 'gone.plan.json')], /^topoprobe: --plan .*gone\.plan\.json: no such file$/);

// ports and the program itself
flag('ports: unknown option', ['ports', '--bogus'], /unknown option '--bogus'.*topoprobe ports --help/);
flag('ports: an argument', ['ports', '/dev/ttyUSB0'], /too many arguments for 'ports'/);
flag('unknown verb', ['frobnicate'], /unknown command 'frobnicate'.*topoprobe --help/);
flag('misspelt verb', ['predcit', CHAIN], /unknown command 'predcit'/);
flag('unknown global option', ['--bogus'], /unknown option '--bogus'/);

// ---------------------------------------------------------------------------------------------------------

beforeAll(async () => {
  // The good log every log case is damaged from: the small pair plan on the simulated bench, instantly.
  mkdirSync(LOGS);
  const made = await runCliInProcess(['run', PAIR_PLAN, '--sim', '--timing', 'instant', '--log', GOOD_LOG]);
  expect(made.status, made.stderr).toBe(0);
  const csv = readFileSync(GOOD_LOG, 'utf8');
  const meta = readFileSync(`${GOOD_LOG}.meta.json`, 'utf8');
  for (const [name, damage] of logDamages) {
    const file = path.join(LOGS, `${name.replace(/\W+/g, '-')}.csv`);
    const { csv: c = csv, meta: m = meta } = damage(csv, JSON.parse(meta));
    if (c !== null) writeFileSync(file, c);
    if (m !== null) writeFileSync(`${file}.meta.json`, m);
  }
  mkdirSync(path.join(LOGS, 'folder.csv'));
  writeFileSync(path.join(LOGS, 'folder.csv.meta.json'), meta);
});

afterAll(() => rmSync(DIR, { recursive: true, force: true }));

/** Runs a case in process; a `sim` that starts serving (which it must not) is stopped as soon as it waits for Ctrl-C. */
async function runCase(c: BadCase): Promise<CliResult> {
  if (!c.serves) return runCliInProcess(c.args());
  // Only the listener sim has just added is called: nothing else in this process hears a Ctrl-C.
  const stopServing = (event: string | symbol, listener: (...args: unknown[]) => void) => {
    if (event === 'SIGINT') setImmediate(() => listener('SIGINT'));
  };
  process.on('newListener', stopServing);
  try {
    return await runCliInProcess(c.args());
  } finally {
    process.off('newListener', stopServing);
  }
}

function judge(c: BadCase, r: CliResult): { ok: boolean; lines: string[] } {
  const lines = r.stderr.split('\n').filter((line) => line !== '');
  const name = c.file ? path.basename(c.file) : undefined;
  const ok =
    r.status === 2 &&
    r.stdout === '' &&
    r.stderr.endsWith('\n') &&
    !hasStackTrace(r.stderr) &&
    lines.length === (c.lines ?? 1) &&
    lines.every((line) => line.startsWith('topoprobe: ') && (name === undefined || line.includes(name))) &&
    lines.some((line) => c.field.test(line)) &&
    (c.leaves ?? []).every((file) => !existsSync(file));
  return { ok, lines };
}

describe('bad input through the whole command line: one line naming the file and field (or flag), exit 2', () => {
  it('the table is large enough and every name is different', () => {
    expect(cases.length).toBeGreaterThanOrEqual(130);
    expect(new Set(cases.map((c) => c.name)).size).toBe(cases.length);
  });

  it.each(cases.map((c) => [c.name, c] as const))('%s', async (_, c) => {
    const before = c.keeps ? readFileSync(c.keeps) : undefined;
    const r = await runCase(c);
    const { ok, lines } = judge(c, r);
    const kept = before === undefined || readFileSync(c.keeps!).equals(before);
    tally({ area: 'bad-input', name: c.name, ok: ok && kept });
    expect(hasStackTrace(r.stderr), r.stderr).toBe(false);
    expect(r.status, r.stderr).toBe(2);
    expect(r.stdout).toBe('');
    expect(lines, r.stderr).toHaveLength(c.lines ?? 1);
    for (const line of lines) {
      expect(line.startsWith('topoprobe: '), line).toBe(true);
      if (c.file) expect(line).toContain(path.basename(c.file));
    }
    expect(lines.some((line) => c.field.test(line)), `${c.field} in\n${r.stderr}`).toBe(true);
    for (const file of c.leaves ?? []) expect(existsSync(file), `${file} was written`).toBe(false);
    expect(kept, `${c.keeps} was changed`).toBe(true);
    expect(ok).toBe(true);
  });
});

describe('the spawned launcher agrees (a user sees the same)', () => {
  const picked = [
    'predict: board zero-value.yaml',
    'run --sim: plan truncated.json',
    'run: --seed abc',
    'unknown verb',
  ];
  it.each(picked)('%s', (name) => {
    const c = cases.find((x) => x.name === name)!;
    const r = runCli(c.args());
    const { ok, lines } = judge(c, r);
    tally({ area: 'bad-input', name: `launcher: ${name}`, ok });
    expect(r.status, r.stderr).toBe(2);
    expect(lines, r.stderr).toHaveLength(1);
    expect(hasStackTrace(r.stderr)).toBe(false);
    expect(ok, r.stderr).toBe(true);
  });
});
