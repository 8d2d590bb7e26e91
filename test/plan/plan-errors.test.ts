// Bad input to `topoprobe plan`: every bad flag, board, limit and plan file is refused with one line
// naming the flag or the file and field, exit code 2, never a stack trace, and no plan file written.
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatProblem } from '../../src/board/errors.js';
import { loadPlan, PlanError } from '../../src/plan/read-plan.js';
import { hasStackTrace, ROOT, runCli } from '../support/run-cli.js';

const BOARD = 'shared/boards/chain-24.yaml';
const PAIR = 'test/fixtures/plans/pair-board.yaml';
const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-plan-errors-'));

/** Runs `plan` expecting a refusal: exit 2, one line on stderr, nothing on stdout, no file. */
function refused(args: string[]): string {
  const out = path.join(dir, `refused-${Math.random().toString(36).slice(2)}.json`);
  const withOutput = args.includes('-o') || args.includes('--check') ? args : [...args, '-o', out];
  const r = runCli(['plan', ...withOutput]);
  expect(hasStackTrace(r.stderr)).toBe(false);
  expect(r.status).toBe(2);
  expect(existsSync(out)).toBe(false);
  const lines = r.stderr.trimEnd().split('\n');
  expect(lines.filter((l) => !l.startsWith('(run ')), r.stderr).toHaveLength(1);
  return lines[0];
}

describe('bad flags', () => {
  const cases: [string, string[], RegExp][] = [
    ['no board', [], /^topoprobe: give a board file/],
    ['unknown option', [PAIR, '--bands', 'first-order', '--check-nothing'], /unknown option '--check-nothing'/],
    ['unknown band method', [PAIR, '--bands', 'fast'], /^topoprobe: --bands fast: expected monte-carlo or first-order$/],
    ['zero samples', [PAIR, '--samples', '0'], /^topoprobe: --samples 0: expected a whole number from 1 to 100000$/],
    ['seed not a number', [PAIR, '--seed', 'x1'], /^topoprobe: --seed x1: expected a whole number$/],
    ['combine with Monte Carlo', [PAIR, '--combine', 'worst-case'], /^topoprobe: --combine: goes with --bands first-order/],
    ['unknown combination', [PAIR, '--bands', 'first-order', '--combine', 'sum'], /^topoprobe: --combine sum: expected quadrature or worst-case$/],
    ['samples with first order', [PAIR, '--bands', 'first-order', '--samples', '10'], /^topoprobe: --samples: goes with --bands monte-carlo/],
    ['level in farads', [PAIR, '--level', '10nF'], /^topoprobe: --level 10nF: "10nF" is in farads, expected volts$/],
    ['analyzer profile that is a switch', [PAIR, '--analyzer', 'generic-switch'], /^topoprobe: --analyzer generic-switch: is a switch profile; give an analyzer profile$/],
    ['unknown switch profile', [PAIR, '--switch', 'generic-swich'], /^topoprobe: generic-swich: no built-in profile of that name \(did you mean "generic-switch"\?\)/],
    ['bad frequency', [PAIR, '--near', '16x'], /^topoprobe: --near 16x: /],
    ['zero modes', [PAIR, '--modes', '0'], /^topoprobe: --modes 0: expected a whole number from 1 to 2$/],
    ['too few sweep points', [PAIR, '--points', '3'], /^topoprobe: --points 3: expected a whole number from 8 to 10000$/],
    ['phase floor out of range', [PAIR, '--floor-phase', '200'], /^topoprobe: --floor-phase 200: expected degrees from 0 to below 180/],
    ['relative floor without a percent sign', [PAIR, '--floor-relative', '2'], /^topoprobe: --floor-relative 2: "2" is not a percentage like "5%"/],
    ['absolute floor in volts', [PAIR, '--floor-absolute', '5mV'], /^topoprobe: --floor-absolute 5mV: "5mV" is in volts, expected ohms$/],
    ['fixture without a switch', [PAIR, '--switch', 'none', '--fixture', 'shared/fixtures/chain-24.yaml'], /^topoprobe: --fixture: an operator-probed plan \(--switch none\) uses no fixture map/],
    ['check with a board', [PAIR, '--check', 'test/fixtures/plans/pair.plan.json'], /^topoprobe: --check: give only the plan file to check/],
  ];
  it.each(cases)('%s', (_, args, message) => {
    expect(refused(args)).toMatch(message);
  });

  it('a missing -o is named', () => {
    const r = runCli(['plan', PAIR]);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('topoprobe: -o FILE: say where to write the plan (- for stdout)\n');
  });

  it('a folder that does not exist is named with the plan file', () => {
    const target = path.join(dir, 'no-such-folder', 'x.plan.json');
    expect(refused([PAIR, '--bands', 'first-order', '-o', target])).toBe(`topoprobe: ${target}: cannot write the plan: no such folder`);
  });
});

describe('bad boards and fixture maps', () => {
  it('a board file with a problem is named with its field', () => {
    expect(refused(['test/fixtures/boards/bad/zero-value.yaml'])).toMatch(/^topoprobe: test\/fixtures\/boards\/bad\/zero-value\.yaml: components\[\d+\]\.value: .*zero/);
  });

  it('a fixture map without the channels the plan needs is named with the missing field', () => {
    const map = path.join(dir, 'partial-map.yaml');
    writeFileSync(map, 'nodes:\n  p1: { hi: 11, lo: 21 }\n  p2: { hi: 12 }\ngnd: { lo: 20 }\n');
    expect(refused([PAIR, '--bands', 'first-order', '--neighbours', '--fixture', map])).toBe(
      `topoprobe: ${map}: nodes.p2.lo: missing; the plan reads p1 against p2 and needs the channel joining node p2 to the LO bus`,
    );
  });
});

describe('limits', () => {
  const profile = 'shared/profiles/generic-analyzer.yaml';
  it('a level above the analyzer\'s largest', () => {
    expect(refused([BOARD, '--bands', 'first-order', '--level', '2V'])).toBe(`topoprobe: --level 2 V: above the analyzer's limits.level.max = 1 V of ${path.join(ROOT, profile)}`);
  });

  it('a level below the analyzer\'s smallest', () => {
    expect(refused([BOARD, '--bands', 'first-order', '--level', '1mV'])).toMatch(/^topoprobe: --level 1 mV: below the analyzer's limits\.level\.min = 5 mV of /);
  });

  it('a level that drives more than the current limit into the lowest predicted impedance (I = V/|Z|)', () => {
    // n2 reads 0.491 Ω at the edge mode: 1 V drives 2.04 A, 100 times the 20 mA limit.
    expect(refused([BOARD, '--bands', 'first-order', '--level', '1V'])).toMatch(
      /^topoprobe: --level 1 V: drives 2\.036 A into n2 to ground at 163\.6 kHz \(predicted \|Z\| 491 mΩ\), above the analyzer's limits\.current = 20 mA of .*; lower --level to 9\.821 mV or less/,
    );
  });

  it('a level that puts more than its rating across a part', () => {
    // Driving n2 near the edge mode excites the a sites: C_intra_1 sees about 54 times the level.
    expect(refused(['test/fixtures/plans/chain-rated.yaml', '--bands', 'first-order', '--level', '9.5mV'])).toMatch(
      /^topoprobe: --level 9\.5 mV: puts 517\.\d mV across C_intra_1 \(rating 500 mV\) when reading n2 to ground at 163\.6 kHz/,
    );
  });

  it('a board whose ratings no level of the analyzer can keep', () => {
    const board = path.join(dir, 'chain-tight.yaml');
    writeFileSync(board, readFileSyncText('test/fixtures/plans/chain-rated.yaml').replace('rating: 0.5V', 'rating: 50mV'));
    expect(refused([board, '--bands', 'first-order'])).toMatch(/^topoprobe: no level the analyzer can set \(limits\.level\.min = 5 mV of .*\) keeps n2 to ground within the rating of C_intra_1 at 163\.6 kHz$/);
  });

  it('frequencies the analyzer cannot reach', () => {
    expect(refused([BOARD, '--bands', 'first-order', '--analyzer', 'test/fixtures/plans/analyzer-150k.yaml'])).toMatch(
      /^topoprobe: the plan needs 146\.6 kHz \.\. 183\.7 kHz to cover the modes and their tolerance windows, outside the analyzer's limits\.frequency = 10 Hz \.\. 150 kHz of test\/fixtures\/plans\/analyzer-150k\.yaml$/,
    );
  });

  it('averaging beyond the analyzer\'s', () => {
    expect(refused([PAIR, '--bands', 'first-order', '--averages', '1000'])).toMatch(/^topoprobe: --averages 1000: outside the analyzer's limits\.averaging = 1 \.\. 256 of /);
  });
});

describe('bad plan files (topoprobe plan --check)', () => {
  // Each file is pair.plan.json with one thing broken; the first line names the file and the field.
  const expected: Record<string, string> = {
    'a-list.json': 'must hold one JSON object (a topoprobe scan plan), got a list',
    'board-edited.json': 'board.hash: does not match the board snapshot in the plan',
    'channel-not-in-fixture.json': "steps[0].channels[0]: channel 4242 is not in the plan's fixture map",
    'channels-without-switch.json': 'steps[0].channels: lists channels, but the plan has no switch matrix (instruments.switch is null)',
    'channels-wrong-terminals.json': "steps[0].channels: [1002, 2000] does not join HI p1 and LO gnd; the plan's fixture map gives [1001, 2000]",
    'empty.json': 'the file is empty',
    'fixture-channel-twice.json': 'fixture.nodes.p2.lo: channel 2001 is already used by fixture.nodes.p1.lo',
    'format-version.json': 'format: must be "topoprobe-plan/1", the plan format this topoprobe reads, got "topoprobe-plan/9"',
    'level-as-text.json': 'steps[3].level_v: must be a number, got "100mV"',
    'magnitude-band-reversed.json': 'steps[0].points[2].band: mag_hi_ohm 28.682065827798333 is below mag_lo_ohm 274.45062578851673',
    'negative-frequency.json': 'steps[0].points[0].frequency_hz: must be greater than zero',
    'no-steps.json': 'steps: missing',
    'phase-out-of-range.json': 'steps[0].points[1].band.phase_lo_deg: must be from -180 to 180 degrees',
    'step-numbering.json': 'steps[1].step: is 5, expected 2: steps are numbered 1, 2, 3, ... in the order they run',
    'to-ground-lo-node.json': 'steps[1].lo: must be "gnd" for a to-ground step, got "p2"',
    'transfer-without-sense.json': 'steps[4].sense: missing; a transfer step names the node it senses',
    'truncated.json': 'line 43, column 14: JSON syntax error: the text ends too early (a plan file is JSON)',
    'unknown-node.json': 'steps[2].hi: no node "p9" on the plan\'s board',
    'unknown-step-field.json': 'steps[0].colour: unknown field (fields here: step, kind, purpose, hi, lo, sense, channels, level_v, rated, averages, settle_s, points)',
    'zero-averages.json': 'steps[0].averages: must be at least 1',
  };

  it('has a fixture for every case and a case for every fixture', () => {
    expect(readdirSync(path.join(ROOT, 'test/fixtures/plans/bad')).sort()).toEqual(Object.keys(expected).sort());
  });

  it.each(Object.entries(expected))('%s', (name, message) => {
    const file = `test/fixtures/plans/bad/${name}`;
    let problems: string[] = [];
    try {
      loadPlan(path.join(ROOT, file));
    } catch (err) {
      expect(err).toBeInstanceOf(PlanError);
      problems = (err as PlanError).problems.map(formatProblem);
    }
    expect(problems[0]?.startsWith(`${path.join(ROOT, file)}: ${message}`), problems[0]).toBe(true);
    for (const line of problems) expect(line).not.toMatch(/\n/);
  });

  it.each(['board-edited.json', 'truncated.json', 'unknown-step-field.json'])('%s through the command line: the same line, exit 2', (name) => {
    const file = `test/fixtures/plans/bad/${name}`;
    const r = runCli(['plan', '--check', file]);
    expect(r.status).toBe(2);
    expect(hasStackTrace(r.stderr)).toBe(false);
    expect(r.stdout).toBe('');
    const first = r.stderr.split('\n')[0];
    expect(first.startsWith(`topoprobe: ${file}: ${expected[name]}`), first).toBe(true);
  });

  it('the plan they were made from is sound', () => {
    const r = runCli(['plan', '--check', 'test/fixtures/plans/pair.plan.json']);
    expect(r.status).toBe(0);
    expect(r.stdout).toMatch(/a sound topoprobe-plan\/1 plan for board pair/);
  });

  it('a plan file that does not exist', () => {
    const r = runCli(['plan', '--check', 'test/fixtures/plans/no-such.plan.json']);
    expect(r.status).toBe(2);
    expect(r.stderr).toBe('topoprobe: test/fixtures/plans/no-such.plan.json: cannot read the plan: no such file\n');
  });
});

function readFileSyncText(file: string): string {
  return readFileSync(path.join(ROOT, file), 'utf8');
}
