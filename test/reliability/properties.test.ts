// Property-based tests (fast-check) of the parsers that read what people and instruments write: the value
// parser, the board parser, the simulators' SCPI parser and the client's parser of instrument answers. For
// any input each one gives a value or its own one-line error, never another exception, and never hangs (a
// hang is caught by the test timeout; the time budget below only bounds how many cases a property runs).
import fc from 'fast-check';
import { unit as mathUnit, complex as mathComplex } from 'mathjs';
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { queuedErrors, testAnalyzer } from '../support/scpi-devices.js';
import { BoardError, parseBoardText, type Board } from '../../src/board/index.js';
import { GROUND } from '../../src/board/types.js';
import { AnswerError } from '../../src/instruments/instrument-errors.js';
import { INVALID, readComplex, readFlags, readInteger, readNumber, readNumbers, readValue } from '../../src/instruments/answers.js';
import { formatQuantity, parsePercent, parseQuantity, QuantityError, type UnitName } from '../../src/units/quantity.js';
import { UNITS, UNIT_NAMES } from '../../src/units/unit-names.js';
import { SimulatedSwitchMatrix } from '../../simulators/switch-matrix.js';
import { lexMessage } from '../../simulators/scpi/lexer.js';
import { nr3 } from '../../simulators/scpi/response-format.js';
import { tally } from '../support/reliability-tally.js';

/** How long one property may keep generating cases; not an assertion (a property that runs out stops early). */
const BUDGET_MS = 6_000;
/** The test timeout, the hang detector: far above what any property needs. */
const HANG_MS = 40_000;

let tried = 0;
/** Wraps a predicate so the cases actually run are counted (the budget may stop a property early). */
const counted = <A extends unknown[], R>(predicate: (...args: A) => R) => (...args: A): R => {
  tried++;
  return predicate(...args);
};

async function holds<T>(name: string, numRuns: number, property: fc.IProperty<T> | fc.IAsyncProperty<T>): Promise<void> {
  tried = 0;
  let failure: unknown;
  try {
    await fc.assert(property as fc.IAsyncProperty<T>, { numRuns, interruptAfterTimeLimit: BUDGET_MS });
  } catch (error) {
    failure = error;
  }
  tally({ area: 'property', name, ok: failure === undefined && tried > 0, cases: tried });
  if (failure !== undefined) throw failure;
  expect(tried).toBeGreaterThan(0);
}

/** What a thrown error is: ours (of `kind`, one line) or anything else. */
function ownError(error: unknown, kind: new (...args: any[]) => Error): boolean {
  return error instanceof kind && error.message !== '' && !/[\r\n]/.test(error.message);
}

// ---------------------------------------------------------------------------------------------------------
describe('the value parser (src/units)', () => {
  const pieces = ['1', '0', '47', '.', 'e', 'E', '-', '+', ' ', 'k', 'M', 'm', 'u', 'µ', 'μ', 'n', 'p', 'f', 'R', 'K', 'F', 'H', 'Hz', 'ohm', 'Ω', 'V', 'A', 's', '%', ',', 'kg', '^2', '/', '(', ')', '*', 'inch', 'deg', 'e400', 'e-400', '\t', '\n', 'Infinity', 'NaN', '0x1F', '1_000'];
  const valueText = fc.oneof(
    fc.string({ unit: 'binary', maxLength: 40 }),
    fc.array(fc.constantFrom(...pieces), { maxLength: 10 }).map((p) => p.join('')),
    fc.stringMatching(/^[+-]?\d{0,4}(\.\d{0,3})?([eE][+-]?\d{1,3})? ?[yzafpnumkMGTPEZY]?(F|H|ohm|Hz|V|A|s)?$/),
  );
  const unitName = fc.constantFrom<UnitName>(...UNIT_NAMES);

  it('for any text: a finite value in range, or a one-line QuantityError', { timeout: HANG_MS }, async () => {
    await holds('units: parseQuantity on arbitrary text', 2000, fc.property(valueText, unitName, fc.boolean(), counted((text, unit, allowZero) => {
      try {
        const v = parseQuantity(text, unit, { allowZero });
        return Number.isFinite(v) && (allowZero ? v >= 0 : v > 0);
      } catch (error) {
        return ownError(error, QuantityError);
      }
    })));
  });

  it('for any value of any type (what a YAML or JSON file can hold), the same', { timeout: HANG_MS }, async () => {
    await holds('units: parseQuantity and parsePercent on arbitrary values', 1000, fc.property(fc.anything(), unitName, counted((value, unit) => {
      for (const read of [() => parseQuantity(value, unit), () => parsePercent(value)]) {
        try {
          const v = read();
          if (!Number.isFinite(v) || v < 0) return false;
        } catch (error) {
          if (!ownError(error, QuantityError)) return false;
        }
      }
      return true;
    })));
  });

  it('tolerances: a fraction from 0 to below 1, or a one-line QuantityError', { timeout: HANG_MS }, async () => {
    const percentText = fc.oneof(valueText, fc.stringMatching(/^(±|\+-|\+\/-)? ?\d{0,3}(\.\d{0,3})? ?%$/));
    await holds('units: parsePercent on arbitrary text', 2000, fc.property(percentText, counted((text) => {
      try {
        const v = parsePercent(text);
        return v >= 0 && v < 1;
      } catch (error) {
        return ownError(error, QuantityError);
      }
    })));
  });

  it('long runs of digits are refused, not backtracked over (a quadratic pattern would hang here)', { timeout: HANG_MS }, async () => {
    const longText = fc.tuple(fc.integer({ min: 50_000, max: 200_000 }), fc.constantFrom('x', 'e', '.5q', 'E9z', ' k ', '%x')).map(([n, tail]) => `${'1'.repeat(n)}${tail}`);
    await holds('units: very long malformed values', 20, fc.property(longText, counted((text) => {
      for (const read of [() => parseQuantity(text, 'F'), () => parsePercent(text)]) {
        try {
          read();
        } catch (error) {
          if (!ownError(error, QuantityError)) return false;
        }
      }
      return true;
    })));
  });

  it('formatting a value and reading it back gives it within the printed precision', { timeout: HANG_MS }, async () => {
    // Engineering notation with the SI prefixes of the BIPM SI Brochure (9th ed., 2019, Table 7); beyond
    // them formatQuantity falls back to exponent notation, which must read back as well.
    const value = fc.tuple(fc.double({ min: 1, max: 10, maxExcluded: true, noNaN: true }), fc.integer({ min: -30, max: 30 })).map(([m, e]) => m * 10 ** e);
    await holds('units: formatQuantity then parseQuantity round trip', 1500, fc.property(value, unitName, fc.integer({ min: 1, max: 12 }), counted((v, unit, digits) => {
      const text = formatQuantity(v, unit, digits);
      const back = parseQuantity(text, unit);
      // toPrecision(d) moves a value by at most half a unit in its d-th digit: 0.5 * 10^(1-d) relative.
      return Math.abs(back - v) <= v * (0.5 * 10 ** (1 - digits) + 1e-15);
    })));
  });

  it('a number, an SI prefix and the unit read as mathjs reads them (reference: mathjs unit())', { timeout: HANG_MS }, async () => {
    const prefixes = ['', 'y', 'z', 'a', 'f', 'p', 'n', 'u', 'm', 'k', 'M', 'G', 'T', 'P', 'E', 'Z', 'Y'];
    const mantissa = fc.oneof(fc.integer({ min: 1, max: 999 }).map(String), fc.double({ min: 0.001, max: 999, noNaN: true }).map((x) => x.toPrecision(6)), fc.double({ min: 1, max: 9.99, noNaN: true }).map((x) => `${x.toFixed(2)}e${Math.floor(x)}`));
    await holds('units: parseQuantity against mathjs', 600, fc.property(mantissa, fc.constantFrom(...prefixes), fc.constantFrom('', ' '), unitName, counted((m, prefix, space, unit) => {
      const text = `${m}${space}${prefix}${UNITS[unit].mathjs}`;
      const ours = parseQuantity(text, unit);
      const reference = mathUnit(text).toNumber(UNITS[unit].mathjs);
      return Math.abs(ours - reference) <= 1e-12 * Math.abs(reference);
    })));
  });
});

// ---------------------------------------------------------------------------------------------------------
describe('the board parser (src/board, from text: YAML and JSON)', () => {
  /** A board, or a BoardError whose every problem names the file, a path (text, "" for the whole file) and one line. */
  function boardOrProblems(text: string, file: string): boolean {
    let board: Board;
    try {
      board = parseBoardText(text, file);
    } catch (error) {
      if (!(error instanceof BoardError) || error.problems.length === 0) return false;
      return error.problems.every((p) => p.file === file && typeof p.path === 'string' && !/[\r\n]/.test(p.path) && p.message !== '' && !/[\r\n]/.test(p.message));
    }
    // A board that loads is whole: unique nodes and references, every part between known nodes, a finite value.
    const nodes = new Set(board.nodes.map((n) => n.name));
    const refs = new Set(board.parts.map((part) => part.ref));
    return (
      nodes.size === board.nodes.length &&
      !nodes.has(GROUND) &&
      refs.size === board.parts.length &&
      board.parts.length > 0 &&
      board.parts.every((part) => part.nodes[0] !== part.nodes[1] && part.nodes.every((n) => n === GROUND || nodes.has(n)) && Number.isFinite(part.value) && part.value > 0)
    );
  }

  const nodeName = fc.constantFrom<unknown>('n1', 'n2', 'n3', 'gnd', 'GND', 'ground', '', ' n1', 'n 2', '__proto__', 'constructor', 'toString', 7, 1.5, null, ['n1']);
  const valueish = fc.oneof(
    fc.constantFrom<unknown>('10n', '22uH', '4R7', '2k2', '0', '-1n', '1e400', '10 parsecs', 'ten', '', '33nF', '1e-8', '100kHz', '50V', null, true, [], {}),
    fc.double(),
    fc.integer(),
    fc.string({ maxLength: 8 }),
  );
  const percentish = fc.constantFrom<unknown>('5%', '5', 5, '100%', '-1%', '±2%', null, '0.5 %', 'lots');
  const part = fc.record(
    { ref: fc.constantFrom<unknown>('C1', 'L1', 'R1', 'C2', '', 3), kind: fc.constantFrom<unknown>('C', 'L', 'R', 'X', 'c', null), nodes: fc.array(nodeName, { maxLength: 3 }), value: valueish, tolerance: percentish, esr: valueish, q: fc.oneof(fc.double(), fc.constantFrom<unknown>('50', -1, 0)), q_at: valueish, rating: valueish, colour: fc.constant('red') },
    { requiredKeys: ['ref', 'kind', 'nodes', 'value'] },
  );
  const siteName = fc.constantFrom<unknown>('a', 'b', 'c', 'gnd', '__proto__', 'toString', '1a', '');
  const latticeish = fc.record(
    {
      repeats: fc.oneof(fc.integer({ min: -1, max: 6 }), fc.array(fc.integer({ min: -1, max: 5 }), { maxLength: 4 }), fc.constantFrom<unknown>(1e9, [1e5, 1e5], 2.5, '3', null)),
      boundary: fc.constantFrom<unknown>('open', 'periodic', 'closed', ['open', 'periodic'], []),
      vectors: fc.oneof(fc.constant(undefined), fc.array(fc.array(fc.integer({ min: -2, max: 2 }), { maxLength: 3 }), { maxLength: 3 })),
      sites: fc.oneof(fc.array(siteName, { maxLength: 3 }), fc.dictionary(fc.constantFrom('a', 'b', 'gnd', '__proto__', 'toString'), fc.oneof(fc.constant(null), fc.array(fc.double(), { maxLength: 4 })), { maxKeys: 3 })),
      names: fc.constantFrom<unknown>('{site}{i}', 'n{index}', '{x}', '__proto__', 'n', '{site} {i}', '{k}'),
      terminate: fc.constantFrom<unknown>(true, false, 'yes'),
      bonds: fc.array(fc.record({ id: fc.constantFrom<unknown>('x', 'y', 'x', '1', undefined), from: siteName, to: siteName, kind: fc.constantFrom<unknown>('C', 'L', 'R', 'Q'), value: valueish, offset: fc.array(fc.integer({ min: -2, max: 2 }), { maxLength: 3 }) }, { requiredKeys: [] }), { maxLength: 3 }),
      grounds: fc.array(fc.record({ id: fc.constantFrom<unknown>('g', 'h', 'g'), site: siteName, kind: fc.constantFrom<unknown>('C', 'L', 'R'), value: valueish, q: fc.constantFrom<unknown>(50, -1), q_at: valueish }, { requiredKeys: [] }), { maxLength: 3 }),
      changes: fc.array(fc.record({ ref: fc.constantFrom<unknown>('C_x_0', 'L_g_1', 'nope'), cell: fc.array(fc.integer({ min: -1, max: 9 }), { maxLength: 3 }), value: valueish, remove: fc.boolean() }, { requiredKeys: [] }), { maxLength: 2 }),
    },
    { requiredKeys: [] },
  );
  const boardish = fc.record({ name: fc.constantFrom<unknown>('b', '', 3), description: fc.string({ maxLength: 5 }), components: fc.array(part, { maxLength: 5 }), lattice: latticeish }, { requiredKeys: [] });

  it('board-like JSON data (as .json and as .yaml): a board, or problems that each carry a path', { timeout: HANG_MS }, async () => {
    await holds('board: parseBoardText on board-like JSON', 800, fc.property(boardish, fc.constantFrom('b.json', 'b.yaml'), counted((doc, file) => boardOrProblems(JSON.stringify(doc), file))));
  });

  it('any JSON value: the same', { timeout: HANG_MS }, async () => {
    const weirdKeys = fc.constantFrom('__proto__', 'constructor', 'components', 'lattice', 'name', 'toString', '', '0');
    const json = fc.jsonValue({ maxDepth: 4 });
    const withKeys = fc.dictionary(weirdKeys, json, { maxKeys: 4 });
    await holds('board: parseBoardText on arbitrary JSON', 800, fc.property(fc.oneof(json, withKeys), fc.constantFrom('j.json', 'j.yaml', 'j'), counted((doc, file) => boardOrProblems(JSON.stringify(doc) ?? 'null', file))));
  });

  it('YAML-ish text (anchors, aliases, tags, flow and block forms, several documents): the same', { timeout: HANG_MS }, async () => {
    const tokens = ['components:', 'lattice:', 'name: x', '\n', '\n  ', '  ', '- ', '{ ', ' }', '[', ']', ', ', ': ', 'ref: C1', 'kind: C', 'kind: L', 'nodes: [n1, gnd]', 'nodes: [n2, n1]', 'value: 10n', 'value: 22uH', 'repeats: [2]', 'sites: [a, b]', 'bonds: [{ from: a, to: b, kind: C, value: 1n }]', 'grounds: [{ site: a, kind: L, value: 1u }]', '&x ', '*x', '!!binary ', '!!set ', '!!omap ', '!!timestamp ', '!!str ', '? ', '---', '...', '# c', '"', "'", '|', '>', '%YAML 1.2', '\t', '<<: *x', '.inf', '.nan', '~', 'null', 'yes'];
    const text = fc.array(fc.constantFrom(...tokens), { maxLength: 24 }).map((t) => t.join(''));
    await holds('board: parseBoardText on YAML-ish text', 1000, fc.property(fc.oneof(text, fc.string({ unit: 'binary', maxLength: 60 })), counted((t) => boardOrProblems(t, 'y.yaml'))));
  });

  it('demo boards with one random edit (a cut, a pasted token, another number): the same', { timeout: HANG_MS }, async () => {
    const demos = ['shared/boards/chain-24.yaml', 'shared/boards/tank-3.json', 'shared/boards/corner-8x8.yaml', 'test/fixtures/plans/pair-board.yaml'].map((file) => ({ file, text: readFileSync(file, 'utf8') }));
    const token = fc.constantFrom(':', '-', '[', ']', '{', '}', ',', '"', '\n', '  ', '%', 'k', 'gnd', 'a', 'n1', '0', '-1', '1e9', '2.5', '1e400', '&a', '*a', '!!set', '__proto__', 'ref: C1', 'x: 1');
    const edit = fc.oneof(
      fc.record({ kind: fc.constant('cut' as const), at: fc.double({ min: 0, max: 1, noNaN: true }), length: fc.integer({ min: 1, max: 40 }) }),
      fc.record({ kind: fc.constant('paste' as const), at: fc.double({ min: 0, max: 1, noNaN: true }), token }),
      fc.record({ kind: fc.constant('number' as const), which: fc.nat(), to: fc.constantFrom('0', '-3', '2.5', '99999999', '1e9', 'NaN', '1e-400', '', '"x"', '[]') }),
    );
    await holds('board: parseBoardText on edited demo boards', 400, fc.property(fc.constantFrom(...demos), edit, counted((demo, e) => {
      let text = demo.text;
      if (e.kind === 'cut') {
        const at = Math.floor(e.at * text.length);
        text = text.slice(0, at) + text.slice(at + e.length);
      } else if (e.kind === 'paste') {
        const at = Math.floor(e.at * text.length);
        text = text.slice(0, at) + e.token + text.slice(at);
      } else {
        const numbers = [...text.matchAll(/\d+(\.\d+)?/g)];
        const m = numbers[e.which % numbers.length];
        text = text.slice(0, m.index) + e.to + text.slice(m.index! + m[0].length);
      }
      return boardOrProblems(text, demo.file);
    })));
  });
});

// ---------------------------------------------------------------------------------------------------------
describe("the simulators' SCPI parser (simulators/scpi)", () => {
  const analyzer = () => testAnalyzer();
  const matrix = () => new SimulatedSwitchMatrix({ routes: (c) => ({ bus: c < 2000 ? 'hi' : 'lo', node: `n${c % 10}` }) });
  const pieces = ['FREQ', 'freq', 'SOUR', 'SOURce1', 'SOUR9', 'VOLT', ':LEV', 'AVER', 'FUNC', 'IMP', 'TRAN', 'FORM', 'POL', 'READ?', 'FETC?', 'INIT', 'ROUT', ':CLOS', ':OPEN', ':ALL', 'ROUT:CLOS?', 'DIAG:REL:CYCL?', 'SYST:ERR?', '*IDN?', '*RST', '*CLS', '*OPC?', '*WAI', '*ESE', '*STB?', '*SRE 64', '*TST?', ':', ';', '?', ' ', ',', '(@', ')', '1001', '2000:1995', '1:9999', '0', '10000', '1k', '1e9', '-5', 'HZ', 'MHZ', 'KHZ', 'MV', 'MAX', 'MIN', 'DEF', 'INF', 'NAN', '#H1F', '#B102', '#Q7', '#3', '"', "'", '""', '(1+2)', 'E9', 'E99999', '\u00e9', '\t', 'ABCDEFGHIJKLMNOP'];
  const soup = fc.array(fc.constantFrom(...pieces), { maxLength: 14 }).map((p) => p.join(''));
  const bytes = fc.uint8Array({ maxLength: 60 }).map((b) => Buffer.from(b).toString('latin1'));
  const message = fc.oneof(soup, bytes, fc.string({ unit: 'grapheme', maxLength: 40 }));

  it('the lexer is total: units it could read and, if it stopped, a command error (-1xx)', { timeout: HANG_MS }, async () => {
    await holds('scpi: lexMessage on arbitrary text', 3000, fc.property(message, counted((m) => {
      const lexed = lexMessage(m);
      const unitsOk = lexed.units.every((u) => u.header.text !== '' && (u.header.common || u.header.keywords.length > 0));
      const failureOk = lexed.failure === undefined || (lexed.failure.code <= -100 && lexed.failure.code > -200 && lexed.failure.detail !== '');
      return unitsOk && failureOk;
    })));
  });

  const drain = queuedErrors;

  it('random message lines: each is answered or queues standard errors, never an internal one, and *IDN? still answers', { timeout: HANG_MS }, async () => {
    await holds('scpi: simulated instruments driven with random lines', 300, fc.asyncProperty(fc.array(message, { minLength: 1, maxLength: 6 }), fc.boolean(), counted(async (lines, useMatrix) => {
      const device = useMatrix ? matrix() : analyzer();
      for (const line of lines) {
        const answer = await device.receive(line);
        if (answer !== undefined && !/^[\x20-\x7e]*$/.test(answer)) return false;
      }
      const errors = await drain(device);
      // -300 "internal" is what the device queues when a handler threw something other than a ScpiError.
      if (!errors.every((e) => /^-\d{3},"[\x20-\x7e]*"$/.test(e) && !/internal/.test(e))) return false;
      return (await device.receive('*IDN?')) === device.identity && (await drain(device)).length === 0;
    })));
  });

  it('well-formed messages in any letter case and either keyword form run without an error, and settings read back exactly', { timeout: HANG_MS }, async () => {
    // SCPI-99 vol. 1, 6.2.1 (from memory): a keyword is its short or its long form, in any case; optional
    // nodes may be left out; ":" after ";" starts again from the root. Suffixes: MHZ is mega (7.7.3).
    const form = (long: string) => fc.constantFrom(long, long.replace(/[a-z]+$/, '')).chain((k) => fc.mixedCase(fc.constant(k)));
    const hz = fc.integer({ min: 10, max: 10_000_000 });
    const written = fc.tuple(hz, fc.constantFrom('', 'HZ', ' Hz', 'KHZ', 'MHZ')).map(([f, s]) => {
      const scaled = s === 'KHZ' ? f / 1e3 : s === 'MHZ' ? f / 1e6 : f;
      return { hz: Number(`${scaled}e${s === 'KHZ' ? 3 : s === 'MHZ' ? 6 : 0}`), text: `${scaled}${s}` };
    });
    const frequencySetting = fc.tuple(fc.constantFrom('', 'SOURce:', 'SOURce1:'), form('FREQuency'), fc.constantFrom('', ':CW'), written).chain(([src, freq, cw, w]) =>
      (src ? form(src.replace(/1?:$/, '')).map((s) => `${s}${src.endsWith('1:') ? '1' : ''}:`) : fc.constant('')).map((s) => ({ text: `${s}${freq}${cw.toLowerCase()} ${w.text}`, hz: w.hz })),
    );
    const others = fc.constantFrom('VOLT 0.2', 'volt:lev 50MV', 'SENS:AVER 8', 'aver:coun 2', 'FUNC IMP', 'func tran', 'FORM POL', 'form:zdat rect', 'INIT', '*CLS', '*OPC?', 'READ?', 'freq? max', '*IDN?');
    await holds('scpi: well-formed analyzer messages', 400, fc.asyncProperty(frequencySetting, fc.array(others, { maxLength: 4 }), counted(async (setting, rest) => {
      const a = analyzer();
      const units = [setting.text, ...rest];
      // Common commands (*CLS) keep the path and take no ":" before them.
      await a.receive(units.map((u, i) => (i === 0 || u.startsWith('*') ? u : `:${u}`)).join(';'));
      if ((await drain(a)).length !== 0) return false;
      // Read back with the client's own answer parser: the value set, bit for bit.
      return readValue((await a.receive('SOUR:FREQ:CW?'))!, 'SOUR:FREQ:CW?') === setting.hz;
    })));
  });
});

// ---------------------------------------------------------------------------------------------------------
describe('the parser of instrument answers (src/instruments/answers.ts)', () => {
  const answerPieces = ['1', '0', '-', '+', '.', 'E', 'e', '5', '37', '9.9E37', '-9.9E37', '9.91E37', '1E999', ',', ';', ' ', 'NAN', 'INF', '#H1F', '"', '\r', '\n', 'OVLD', '+1', '+0'];
  const answer = fc.oneof(
    fc.string({ unit: 'binary', maxLength: 40 }),
    fc.array(fc.constantFrom(...answerPieces), { maxLength: 10 }).map((p) => p.join('')),
    fc.uint8Array({ maxLength: 40 }).map((b) => Buffer.from(b).toString('latin1')),
  );

  it('any answer: numbers (or the overload marker) as promised, or a one-line AnswerError', { timeout: HANG_MS }, async () => {
    const readers: ((a: string) => unknown)[] = [
      (a) => readNumbers(a, 'FETC?'),
      (a) => readNumbers(a, 'FETC?', 2),
      (a) => readNumber(a, 'FREQ?'),
      (a) => readValue(a, 'FREQ?'),
      (a) => readInteger(a, '*ESR?'),
      (a) => readComplex(a, 'READ?', 'rect'),
      (a) => readComplex(a, 'READ?', 'polar-deg'),
      (a) => readComplex(a, 'READ?', 'polar-rad'),
      (a) => readFlags(a, 'ROUT:CLOS? (@1,2,3)', 3),
    ];
    const finite = (v: unknown) => v === INVALID || (typeof v === 'number' && Number.isFinite(v));
    await holds('answers: every reader on arbitrary answers', 2000, fc.property(answer, fc.nat({ max: readers.length - 1 }), counted((a, which) => {
      try {
        const v = readers[which](a);
        if (Array.isArray(v)) return v.every((x) => finite(x) || typeof x === 'boolean');
        if (typeof v === 'object' && v !== null) return Number.isFinite((v as { re: number }).re) && Number.isFinite((v as { im: number }).im);
        return finite(v);
      } catch (error) {
        return ownError(error, AnswerError) && (error as AnswerError).exitCode === 3;
      }
    })));
  });

  it('a very long garbage answer is refused, not backtracked over (a quadratic pattern would hang here)', { timeout: HANG_MS }, async () => {
    const longAnswer = fc.tuple(fc.integer({ min: 50_000, max: 200_000 }), fc.constantFrom('x', 'E', '.5E', ',1', 'E5Q')).map(([n, tail]) => `${'7'.repeat(n)}${tail}`);
    await holds('answers: very long malformed answers', 20, fc.property(longAnswer, counted((a) => {
      try {
        readComplex(a, 'READ?', 'rect');
        return false;
      } catch (error) {
        return ownError(error, AnswerError);
      }
    })));
  });

  it("the simulators' NR3 answers read back bit for bit (IEEE 488.2 NR3 form)", { timeout: HANG_MS }, async () => {
    const value = fc.double({ noNaN: true, noDefaultInfinity: true }).filter((x) => Math.abs(x) < 9e37);
    await holds('answers: nr3 then readNumber round trip', 2000, fc.property(value, counted((x) => readNumber(nr3(x), 'FREQ?') === x)));
  });

  it('polar answers become the complex number mathjs makes of them (reference: mathjs complex({r, phi}))', { timeout: HANG_MS }, async () => {
    const magnitude = fc.double({ min: 0, max: 1e9, noNaN: true });
    const degrees = fc.double({ min: -360, max: 360, noNaN: true });
    await holds('answers: polar-deg against mathjs', 1000, fc.property(magnitude, degrees, counted((m, d) => {
      const z = readComplex(`${nr3(m)},${nr3(d)}`, 'READ?', 'polar-deg');
      if (z === INVALID) return false;
      const reference = mathComplex({ r: m, phi: (d * Math.PI) / 180 });
      return Math.abs(z.re - reference.re) <= 1e-9 * (m + 1) && Math.abs(z.im - reference.im) <= 1e-9 * (m + 1);
    })));
  });
});
