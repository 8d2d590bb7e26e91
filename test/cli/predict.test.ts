// `topoprobe predict` through the real launcher: the JSON contract outside scripts rely on, the tables a
// person reads, and one-line errors with exit code 2 for bad input.
import { describe, expect, it } from 'vitest';
import { hasStackTrace, runCli } from '../support/run-cli.js';

const CHAIN = 'shared/boards/chain-24.yaml';
const CORNER = 'shared/boards/corner-8x8.yaml';

describe('predict --json contract', () => {
  const r = runCli(['predict', CHAIN, '--freq', '150k,163.6kHz', '--node', 'n1', '--node', 'n12', '--pair', 'n1:n24', '--modes', '2', '--near', '0.16MHz', '--json']);
  const doc = JSON.parse(r.stdout);

  it('exits 0 and prints JSON only on stdout', () => {
    expect(r.status).toBe(0);
    expect(doc.board).toBe('chain-24');
  });

  it('lists every frequency and terminal pair with re and im in ohms', () => {
    expect(doc.impedances).toHaveLength(6);
    for (const z of doc.impedances) {
      expect(Object.keys(z)).toEqual(expect.arrayContaining(['frequency_hz', 'hi', 'lo', 're', 'im']));
      expect(Number.isFinite(z.re) && Number.isFinite(z.im)).toBe(true);
    }
    expect(doc.impedances.map((z: { frequency_hz: number }) => z.frequency_hz)).toEqual([150e3, 150e3, 150e3, 163.6e3, 163.6e3, 163.6e3]);
    expect(doc.impedances[0]).toMatchObject({ hi: 'n1', lo: 'gnd' });
    expect(doc.impedances[2]).toMatchObject({ hi: 'n1', lo: 'n24' });
  });

  it('puts the edge modes at 1/(2 pi sqrt(L (Cv + Cw))) with their weight on the end nodes', () => {
    // Common practice: the ground-cancelling frequency of a node carrying 43 nF against 22 uH.
    const f0 = 1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9));
    expect(doc.modes).toHaveLength(2);
    for (const m of doc.modes) {
      expect(Math.abs(m.frequency_hz / f0 - 1)).toBeLessThan(1e-4);
      expect(m.localization).toBeGreaterThan(0.3);
      expect(Math.abs(m.profile.n1)).toBeCloseTo(Math.abs(m.profile.n24), 6);
      expect(Math.abs(m.profile.n1)).toBeGreaterThan(0.6);
    }
  });

  it('the edge node reads far more than a bulk node near f0', () => {
    const at = (f: number, hi: string) => doc.impedances.find((z: { frequency_hz: number; hi: string; lo: string }) => z.frequency_hz === f && z.hi === hi && z.lo === 'gnd');
    const mag = (z: { re: number; im: number }) => Math.hypot(z.re, z.im);
    expect(mag(at(163.6e3, 'n1'))).toBeGreaterThan(100 * mag(at(163.6e3, 'n12')));
  });

  it('reports the solve quality per frequency', () => {
    expect(doc.quality).toHaveLength(2);
    for (const q of doc.quality) {
      expect(q.rcond).toBeGreaterThan(0);
      expect(q.residual).toBeLessThan(1e-10);
    }
  });
});

describe('predict tables', () => {
  it('the corner board prints four corner modes and marks a corner as the largest reading', () => {
    const r = runCli(['predict', CORNER, '--modes', '4', '--near', '117k']);
    expect(r.status).toBe(0);
    const corners = ['a0_0', 'b3_0', 'c0_3', 'd3_3'];
    const modeRows = r.stdout.split('\n').filter((l) => /^\d\s/.test(l));
    expect(modeRows).toHaveLength(4);
    for (const row of modeRows) for (const c of corners) expect(row).toContain(c);
    const largest = r.stdout.split('\n').filter((l) => l.includes('<- largest'));
    expect(largest.length).toBeGreaterThan(0);
    expect(corners.some((c) => largest[0].includes(` ${c} `))).toBe(true);
    expect(r.stderr).toContain('reading at the first listed mode');
  });

  it('a sweep lists each point in order', () => {
    const r = runCli(['predict', CHAIN, '--node', 'n1', '--sweep', '150k:170k:5']);
    expect(r.status).toBe(0);
    const rows = r.stdout.split('\n').filter((l) => / n1 +gnd /.test(l));
    expect(rows.map((l) => l.trim().split(/\s+/).slice(0, 2).join(' '))).toEqual(['150 kHz', '155 kHz', '160 kHz', '165 kHz', '170 kHz']);
  });
});

describe('predict bad input: one line, exit 2, no stack trace', () => {
  it.each([
    [['predict', 'no-such-board.yaml'], /no-such-board\.yaml/],
    [['predict', CHAIN, '--node', 'n99'], /--node n99: no node "n99"/],
    [['predict', CHAIN, '--pair', 'n1'], /--pair n1: expected HI:LO/],
    [['predict', CHAIN, '--pair', 'n1:n1'], /same node/],
    [['predict', CHAIN, '--freq', '10uF'], /--freq 10uF/],
    [['predict', CHAIN, '--freq', '-5k'], /--freq -5k/],
    [['predict', CHAIN, '--sweep', '1k:2k'], /--sweep 1k:2k: expected START:STOP:POINTS/],
    [['predict', CHAIN, '--sweep', '2k:1k:5'], /STOP is below START/],
    [['predict', CHAIN, '--sweep', '1k:2k:0'], /POINTS must be a whole number/],
    [['predict', CHAIN, '--sweep', '1k:2k:5:cubic'], /fourth field/],
    [['predict', CHAIN, '--modes', 'many'], /--modes many/],
    [['predict', CHAIN, '--near', '160k'], /--near goes with --modes/],
    [['predict', CHAIN, '--no-such-flag'], /unknown option/],
    [['predict'], /missing required argument/],
    [['no-such-verb'], /unknown command/],
  ])('%j', (args, message) => {
    const r = runCli(args as string[]);
    expect(r.status).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(message as RegExp);
    expect(hasStackTrace(r.stderr)).toBe(false);
  });

  it('a board with several problems lists each on its own line', () => {
    const r = runCli(['predict', 'test/fixtures/boards/bad/several-problems.yaml']);
    expect(r.status).toBe(2);
    const lines = r.stderr.trim().split('\n');
    expect(lines.length).toBeGreaterThan(3);
    for (const l of lines) expect(l).toMatch(/^topoprobe: test\/fixtures\/boards\/bad\/several-problems\.yaml: /);
  });
});

describe('predict --bands', () => {
  it('the chain board: one gap, edges from the dimerized-chain dispersion, holding the edge mode', () => {
    // Source: W. P. Su, J. R. Schrieffer, A. J. Heeger, PRL 42, 1698 (1979) (from memory): the hopping bands are
    // +-|v + w e^{i theta}|, extremes |w - v| and v + w. With C_node = v + w and 22 uH (common practice for the
    // circuit form): f = 1 / (2 pi sqrt(L (v + w -+ t))).
    const r = runCli(['predict', CHAIN, '--bands', '32', '--modes', '1', '--near', '160k', '--json']);
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    const L = 22e-6;
    const v = 10e-9;
    const w = 33e-9;
    const f = (c: number) => 1 / (2 * Math.PI * Math.sqrt(L * c));
    expect(doc.bands.gaps).toHaveLength(1);
    expect(doc.bands.gaps[0].below_hz / f(v + w + (w - v))).toBeCloseTo(1, 9);
    expect(doc.bands.gaps[0].above_hz / f(v + w - (w - v))).toBeCloseTo(1, 9);
    const edge = doc.modes[0].frequency_hz;
    expect(edge).toBeGreaterThan(doc.bands.gaps[0].below_hz);
    expect(edge).toBeLessThan(doc.bands.gaps[0].above_hz);
    expect(doc.bands.samples[0].label).toBe('Γ');
  });

  it('the corner board has its corner modes inside a gap', () => {
    const r = runCli(['predict', CORNER, '--bands', '--modes', '4', '--near', '117k', '--json']);
    expect(r.status).toBe(0);
    const doc = JSON.parse(r.stdout);
    for (const m of doc.modes) {
      expect(doc.bands.gaps.some((g: { below_hz: number; above_hz: number }) => g.below_hz < m.frequency_hz && m.frequency_hz < g.above_hz)).toBe(true);
    }
  });

  it('a board without a lattice is refused with exit 2', () => {
    const r = runCli(['predict', 'shared/boards/tank-3.json', '--bands']);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/--bands: board tank-3 has no lattice section/);
  });
});
