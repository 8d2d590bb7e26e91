// Instrument profiles: the built-ins load and hold what the shared SCPI command set says; each bad file
// under test/fixtures/profiles/bad/ gives one line naming the file, the field and what is wrong.
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatProblem, type Problem } from '../../../src/board/errors.js';
import {
  builtinProfile,
  builtinProfileNames,
  loadProfile,
  matchesIdentity,
  parseProfileText,
  profileFrom,
  ProfileError,
} from '../../../src/instruments/profile.js';
import type { AnalyzerProfile, SwitchProfile } from '../../../src/instruments/profile-types.js';

const BAD = 'test/fixtures/profiles/bad';

function problemsOf(file: string): Problem[] {
  try {
    loadProfile(file);
  } catch (error) {
    expect(error).toBeInstanceOf(ProfileError);
    expect((error as ProfileError).exitCode).toBe(2);
    return (error as ProfileError).problems;
  }
  throw new Error(`${file} loaded without a problem`);
}

describe('built-in profiles', () => {
  it('are the two pairs', () => {
    expect(builtinProfileNames()).toEqual(['generic-analyzer', 'generic-switch', 'sim-polar-analyzer', 'sim-slot-switch']);
  });

  it('generic-analyzer follows the shared command set: 10 Hz..10 MHz, 5 mV..1 V, averaging 1..256', () => {
    const p = builtinProfile('generic-analyzer') as AnalyzerProfile;
    expect(p.kind).toBe('analyzer');
    expect(p.limits.frequencyHz).toEqual({ min: 10, max: 10e6 });
    expect(p.limits.levelV).toEqual({ min: 0.005, max: 1 });
    expect(p.limits.averaging).toEqual({ min: 1, max: 256 });
    expect(p.terminators).toEqual({ write: 'LF', read: 'LF' });
    expect(p.commands.measure).toEqual({ send: [], query: 'READ?', response: 'rect' });
    expect(p.setup).toEqual(['*CLS', 'FORMat:ZDATa RECTangular']);
    expect(p.timeouts).toEqual({ commandMs: 2000, connectMs: 3000 });
  });

  it('sim-polar-analyzer: CR LF, FORM POL in the setup, polar answers in degrees', () => {
    const p = builtinProfile('sim-polar-analyzer') as AnalyzerProfile;
    expect(p.terminators).toEqual({ write: 'CRLF', read: 'CRLF' });
    expect(p.setup).toContain('FORM POL');
    expect(p.commands.measure.response).toBe('polar-deg');
    expect(p.errors.query).toBe('SYST:ERR?');
  });

  it('the switches: channels 1..9999 plain with ranges, or slotted without', () => {
    const g = builtinProfile('generic-switch') as SwitchProfile;
    const s = builtinProfile('sim-slot-switch') as SwitchProfile;
    expect(g.limits.channels).toEqual({ min: 1, max: 9999 });
    expect(g.channelList.range).toBe(':');
    expect(s.channelList.range).toBeUndefined();
    expect(s.channelList.slotSize).toBe(100);
    expect(s.timing.settleAfterRelayMs).toBe(5);
  });

  it('match the identities of our simulated instruments and no other', () => {
    const analyzer = builtinProfile('generic-analyzer');
    const matrix = builtinProfile('sim-slot-switch');
    expect(matchesIdentity(analyzer, 'Topoprobe Lab,SIM-ZA100,ZA-0042,1.3.0')).toBe(true);
    expect(matchesIdentity(analyzer, 'Topoprobe Lab,SIM-SW256,SW-0007,2.0.1')).toBe(false);
    expect(matchesIdentity(matrix, { maker: 'Topoprobe Lab', model: 'SIM-SW256', serial: 'SW-0007', firmware: '2.0.1', raw: 'Topoprobe Lab,SIM-SW256,SW-0007,2.0.1' })).toBe(true);
  });

  it('profileFrom takes a built-in name or a path; an unknown name lists the built-ins', () => {
    expect(profileFrom('generic-switch').name).toBe('generic-switch');
    expect(profileFrom('shared/profiles/sim-polar-analyzer.yaml').name).toBe('sim-polar-analyzer');
    expect(() => builtinProfile('generic-analyser')).toThrow(
      'generic-analyser: no built-in profile of that name (did you mean "generic-analyzer"?); built in: generic-analyzer, generic-switch, sim-polar-analyzer, sim-slot-switch',
    );
  });

  it('a profile may be JSON with quantities as plain SI numbers', () => {
    const p = parseProfileText(
      JSON.stringify({
        kind: 'switch',
        identity: '^Topoprobe Lab,',
        commands: { close: 'CLOS {channels}', open: 'OPEN {channels}', open_all: 'OPEN:ALL', query_closed: { query: 'CLOS? {channels}', response: 'flags' } },
        limits: { channels: { min: 1, max: 64 } },
        timing: { settle_after_relay: 0.004 },
      }),
      'lab-matrix.json',
    ) as SwitchProfile;
    expect(p.name).toBe('lab-matrix');
    expect(p.timing.settleAfterRelayMs).toBe(4);
    expect(p.serial).toEqual({ baudRate: 9600, dataBits: 8, parity: 'none', stopBits: 1, flowControl: 'none' });
  });
});

describe('bad profile files: one problem each', () => {
  // file -> [path, message]
  const SINGLE: Record<string, [string, string | RegExp]> = {
    'unknown-kind.yaml': ['kind', 'unknown kind "analyser"; expected analyzer or switch (did you mean "analyzer"?)'],
    'bad-identity-regex.yaml': ['identity', /^is not a valid regular expression: .*Unterminated group$/],
    'missing-placeholder.yaml': ['commands.set_frequency', 'needs the placeholder {hz}'],
    'unknown-placeholder.yaml': ['commands.set_level', 'unknown placeholder {voltage}; allowed here: {volts}'],
    'bad-terminator.yaml': ['terminators.read', 'must be "LF", "CRLF" or "CR"; got "NL"'],
    'limits-reversed.yaml': ['limits.frequency', 'min (10 MHz) is above max (10 Hz)'],
    'wrong-unit.yaml': ['limits.level.max', '"1 A" is in amperes, expected volts'],
    'measure-not-query.yaml': ['commands.measure.query', 'must be a query (with "?"); "INITiate" would never be answered'],
    'unknown-field.yaml': ['timouts', 'unknown field (did you mean "timeouts"?)'],
    'switch-without-channels.yaml': ['commands.close', 'needs the placeholder {channels}'],
    'current-without-source.yaml': ['limits.current', /^needs limits\.source_resistance/],
    'bad-response-format.yaml': ['commands.measure.response', 'must be "rect", "polar-deg" or "polar-rad"; got "polar"'],
    'slot-without-size.yaml': ['channel_list.channel', '{slot} and {ch} need channel_list.slot_size (channel = slot * slot_size + ch)'],
    'newline-in-command.yaml': ['setup[0]', 'holds a character that cannot be sent ("\\n"); a command is one line of ASCII text'],
    'setting-that-asks.yaml': ['commands.open_all', 'must not be a query ("ROUTe:OPEN:ALL;*OPC?" asks for an answer nobody would read)'],
    'bad-syntax.yaml': ['line 4, column 43', /^YAML syntax error: /],
    'bad-syntax.json': ['line 4, column 54', 'JSON syntax error: unexpected "}"'],
    'not-a-mapping.yaml': ['', 'must hold a mapping of fields (kind, identity, commands, ...), got a list'],
  };

  it('every file in the folder is listed here', () => {
    const files = readdirSync(BAD).filter((f) => f !== 'several-problems.yaml');
    expect(files.sort()).toEqual(Object.keys(SINGLE).sort());
  });

  for (const [name, [path, message]] of Object.entries(SINGLE)) {
    it(name, () => {
      const file = join(BAD, name);
      const problems = problemsOf(file);
      expect(problems).toHaveLength(1);
      expect(problems[0].path).toBe(path);
      if (typeof message === 'string') expect(problems[0].message).toBe(message);
      else expect(problems[0].message).toMatch(message);
      // One line, "file: path: message".
      const line = formatProblem(problems[0]);
      expect(line).not.toContain('\n');
      expect(line.startsWith(path ? `${file}: ${path}: ` : `${file}: `)).toBe(true);
    });
  }

  it('several-problems.yaml: all of them in one round, not just the first', () => {
    const problems = problemsOf(join(BAD, 'several-problems.yaml'));
    expect(problems.map((p) => p.path)).toEqual([
      'terminators.read',
      'timeouts.command',
      'commands.set_frequency',
      'commands.set_function',
      'commands.measure.query',
      'limits.level.max',
      'limits.averaging',
    ]);
  });

  it('a missing file is one line too', () => {
    const problems = problemsOf('test/fixtures/profiles/no-such-profile.yaml');
    expect(formatProblem(problems[0])).toBe('test/fixtures/profiles/no-such-profile.yaml: cannot read the profile: no such file');
  });
});
