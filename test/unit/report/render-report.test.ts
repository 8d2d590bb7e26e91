// The page as text: every section present or saying it has no data, every string from a file escaped,
// nothing that could fetch or run (the page must stand alone; OWASP's output-encoding rule, from memory:
// encode all untrusted data for the context it lands in).
import { describe, expect, it } from 'vitest';
import { GROUND, type Board } from '../../../src/board/types.js';
import type { Reading } from '../../../src/analysis/readings.js';
import type { Diagnosis } from '../../../src/analysis/diagnose-types.js';
import { renderReport } from '../../../src/report/render-report.js';
import { ReportError } from '../../../src/report/report-error.js';
import type { ReportInput } from '../../../src/report/report-input.js';
import { nearestPreferred } from '../../../src/analysis/e-series.js';

const EVIL = '<script>alert(1)</script>';
const EVIL_ESCAPED = '&lt;script&gt;alert(1)&lt;/script&gt;';

function board(names: string[], name = 'bench-3'): Board {
  return {
    name,
    file: 'boards/bench-3.yaml',
    nodes: names.map((n, i) => ({ name: n, position: [i, 0, 0] })),
    parts: [
      { ref: 'C_a', kind: 'C', nodes: [names[0], names[1]], value: 10e-9, origin: 't' },
      { ref: 'C_b', kind: 'C', nodes: [names[1], names[2]], value: 33e-9, origin: 't' },
      ...names.map((n, i) => ({ ref: `L_${i}`, kind: 'L' as const, nodes: [n, GROUND] as [string, string], value: 22e-6, origin: 't' })),
    ],
  };
}

function read(step: number, hi: string, f: number, mag: number, flag: Reading['flag'] = 'ok', extra: Partial<Reading> = {}): Reading {
  return { step, point: 1, kind: 'to-ground', hi, lo: GROUND, frequency_hz: f, re: mag, im: 0, pred_re: mag * 1.01, pred_im: 0, flag, ...extra };
}

function input(names = ['a1', 'a2', 'a3']): ReportInput {
  const readings = [read(1, names[0], 1.6e5, 900), read(2, names[1], 1.6e5, 4, 'deviation'), read(3, names[2], 1.6e5, 120)];
  // A sweep of one node at five frequencies.
  [1.4e5, 1.5e5, 1.6e5, 1.7e5, 1.8e5].forEach((f, i) => readings.push(read(4, names[0], f, 100 + 200 * i, 'ok', { point: i + 1, im: 30 })));
  readings.push(read(5, names[0], 1.6e5, 1, 'ok', { kind: 'transfer', sense: names[0], re: 900 }), read(5, names[0], 1.6e5, 1, 'ok', { kind: 'transfer', sense: names[2], re: -270, point: 2 }));
  return {
    board: board(names),
    readings,
    bands: [{ step: 1, point: 1, mag_lo_ohm: 700, mag_hi_ohm: 1100, phase_lo_deg: -10, phase_hi_deg: 10 }],
    modes: [{ frequency_hz: 1.6e5, localization: 0.4, profile: Object.fromEntries(names.map((n, i) => [n, [0.95, 0, -0.3][i]])) }],
    meta: { status: 'complete', started: '2025-03-14T09:00:00Z', ended: '2025-03-14T09:02:00Z' },
  };
}

const count = (text: string, pattern: RegExp) => (text.match(pattern) ?? []).length;

describe('renderReport', () => {
  const page = renderReport(input());

  it('is one HTML document with every section in order', () => {
    expect(page.startsWith('<!DOCTYPE html>')).toBe(true);
    const order = ['report-header', 'modes', 'board-maps', 'profile', 'sweeps', 'transfer', 'deviations', 'diagnosis', 'fit'].map((c) => page.indexOf(`class="${c}"`));
    for (const i of order) expect(i).toBeGreaterThan(0);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
  });

  it('counts readings by flag in the header', () => {
    expect(page).toMatch(/<strong>10<\/strong> readings/);
    expect(page).toMatch(/<strong>9<\/strong> ok/);
    expect(page).toMatch(/<strong>1<\/strong> deviation/);
  });

  it('draws two board maps with a circle per node, a profile with a point per node, a sweep pair and a transfer plot', () => {
    expect(count(page, /<svg class="board-map map-measured/g)).toBe(1);
    expect(count(page, /<svg class="board-map map-predicted/g)).toBe(1);
    expect(count(page, /<circle class="node/g)).toBe(6);
    const profile = page.slice(page.indexOf('profile-plot'), page.indexOf('</svg>', page.indexOf('profile-plot')));
    expect(count(profile, /data-node=/g)).toBe(3);
    expect(count(page, /<svg class="plot sweep-magnitude/g)).toBe(1);
    expect(count(page, /<svg class="plot sweep-phase/g)).toBe(1);
    expect(count(page, /<svg class="plot transfer-plot/g)).toBe(1);
  });

  it('says what is missing rather than leaving it out silently', () => {
    expect(page).toContain('No diagnosis given.');
    expect(page).toContain('No fit given.');
    const bare = renderReport({ board: board(['a1', 'a2', 'a3']), readings: [], meta: {} });
    expect(count(bare, /Not measured/g)).toBeGreaterThanOrEqual(4);
    expect(count(bare, /<circle class="node no-value"/g)).toBe(3);
  });

  it('needs nothing from outside: no script, no links, no fetches, and a policy forbidding them', () => {
    expect(page).not.toMatch(/<script|\bsrc=|\bhref=|url\(|@import|https?:/i);
    expect(page).toContain(`http-equiv="Content-Security-Policy" content="default-src 'none';`);
  });
});

describe('escaping of every string that comes from a file', () => {
  it('renders hostile board, node, part, meta, diagnosis and fit strings as text', () => {
    const names = [`${EVIL}1`, 'a2', `"'><img src=x>`];
    const base = input(names);
    base.board = { ...base.board, name: EVIL, file: `${EVIL}.yaml`, parts: base.board.parts.map((p) => (p.ref === 'C_a' ? { ...p, ref: EVIL } : p)) };
    const diagnosis: Diagnosis = {
      board: EVIL,
      verdict: 'single-part',
      message: `blame ${EVIL}`,
      readings: { used: 10, skipped: 0 },
      noise: 1e-3,
      nominalMisfit: 40,
      candidates: [
        { subject: 'part', ref: EVIL, kind: 'C', nodes: [names[0], 'a2'], nominal: 10e-9, change: { kind: 'value', value: 33e-9, scale: 3.3, nearest: nearestPreferred(33e-9), decades: 0 }, misfit: 2, share: 0.97, summary: EVIL },
        { subject: 'fixture', ref: `fixture ${EVIL}`, kind: 'fixture', node: names[0], path: 'hi', change: { kind: 'series-resistance', ohms: 2 }, readings: 3, misfit: 30, share: 0.2, summary: EVIL },
      ],
      notes: [`note ${EVIL}`],
    };
    const page = renderReport({
      ...base,
      diagnosis,
      fit: { message: EVIL, parameters: [{ label: EVIL, ref: EVIL, nominal: 1, value: 1.1, sigma: 0.01 }] },
      meta: {
        board: EVIL,
        status: EVIL,
        started: EVIL,
        ended: EVIL,
        instruments: [{ role: EVIL, identity: EVIL, profile: EVIL, address: EVIL }],
        software: { name: EVIL, version: EVIL },
        plan: { file: EVIL, sha256: EVIL },
        log: EVIL,
        simulated: { faults: [EVIL] },
      },
    });
    expect(page).not.toMatch(/<script|<img/i);
    expect(page).toContain(`<title>Scan report: ${EVIL_ESCAPED}</title>`);
    expect(count(page, /&lt;script&gt;alert\(1\)&lt;\/script&gt;/g)).toBeGreaterThan(20);
    expect(page).toContain('&quot;&#39;&gt;&lt;img src=x&gt;');
  });
});

describe('input that does not fit together', () => {
  it('names the reading and the node the board lacks, as one line with exit code 2', () => {
    const bad = input();
    bad.readings = [...bad.readings, read(9, 'n99', 1e5, 1, 'ok', { point: 4 })];
    let caught: unknown;
    try {
      renderReport(bad);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(ReportError);
    const e = caught as ReportError;
    expect(e.exitCode).toBe(2);
    expect(e.message).toBe('reading step 9 point 4: hi names node "n99", which board bench-3 does not have');
    expect(e.message).not.toContain('\n');
  });

  it('refuses a frequency that is not a positive number', () => {
    const bad = input();
    bad.readings = [read(1, 'a1', 0, 1)];
    expect(() => renderReport(bad)).toThrow(/reading step 1 point 1: frequency_hz 0 is not a positive number/);
  });

  it('refuses a band whose upper end is below its lower end', () => {
    const bad = input();
    bad.bands = [{ step: 1, point: 1, mag_lo_ohm: 5, mag_hi_ohm: 4, phase_lo_deg: 0, phase_hi_deg: 1 }];
    expect(() => renderReport(bad)).toThrow(/bands\[0\] \(step 1 point 1\): mag_hi_ohm 4 is below mag_lo_ohm 5/);
  });
});
