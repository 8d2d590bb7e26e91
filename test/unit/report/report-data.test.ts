// What the report picks out of the readings. The transfer check uses the form of the impedance matrix
// near an isolated lossy resonance: Z ≈ g · φ φᵀ, so Z(s, d) / Z(d, d) = φ_s / φ_d with its sign
// (common practice, modal expansion). The mode amplitudes are the chain's edge mode, ratio −10/33 from
// cell to cell (shared/boards/chain-24.yaml comment, the dimerized chain's textbook edge state).
import { describe, expect, it } from 'vitest';
import type { Reading } from '../../../src/analysis/readings.js';
import { flagCounts, nearestFrequency, phaseIntervals, sweeps, toGroundNear, transferProfiles, usable } from '../../../src/report/report-data.js';

function reading(fields: Partial<Reading>): Reading {
  return { step: 1, point: 1, kind: 'to-ground', hi: 'n1', lo: 'gnd', frequency_hz: 1e5, re: 1, im: 0, pred_re: 1, pred_im: 0, flag: 'ok', ...fields };
}

describe('counts and usable readings', () => {
  it('counts each flag', () => {
    const rs = [reading({ flag: 'ok' }), reading({ flag: 'deviation' }), reading({ flag: 'deviation' }), reading({ flag: 'invalid', re: Number.NaN })];
    expect(flagCounts(rs)).toEqual({ ok: 1, deviation: 2, invalid: 1 });
    expect(rs.map(usable)).toEqual([true, true, true, false]);
  });
});

describe('readings at a mode frequency', () => {
  it('picks the logged frequency nearest on a log scale (a factor 1.1 is nearer than 0.89)', () => {
    const rs = [reading({ frequency_hz: 110 }), reading({ frequency_hz: 89 })];
    expect(nearestFrequency(rs, 100)).toBe(110);
  });

  it('takes the latest usable reading of a node (a retake wins), only at that frequency', () => {
    const rs = [
      reading({ hi: 'n1', re: 5, frequency_hz: 1e5 }),
      reading({ hi: 'n1', re: 6, frequency_hz: 1e5 }),
      reading({ hi: 'n1', re: Number.NaN, flag: 'invalid', frequency_hz: 1e5 }),
      reading({ hi: 'n2', re: 7, frequency_hz: 2e5 }),
      reading({ kind: 'two-point', hi: 'n1', lo: 'n2', frequency_hz: 1e5 }),
    ];
    const snap = toGroundNear(rs, 1.01e5)!;
    expect(snap.frequency_hz).toBe(1e5);
    expect([...snap.byNode.keys()]).toEqual(['n1']);
    expect(snap.byNode.get('n1')!.re).toBe(6);
  });

  it('has nothing to show without node-to-ground readings', () => {
    expect(toGroundNear([reading({ kind: 'two-point', lo: 'n2' })], 1e5)).toBeUndefined();
  });
});

describe('sweeps', () => {
  it('are terminals read at three or more frequencies, one reading per frequency, ascending', () => {
    const rs = [3e5, 1e5, 2e5, 2e5].map((f, i) => reading({ frequency_hz: f, point: i + 1 }));
    rs.push(reading({ hi: 'n2', frequency_hz: 1e5 }), reading({ hi: 'n2', frequency_hz: 2e5 }));
    const s = sweeps(rs);
    expect(s).toHaveLength(1);
    expect(s[0].hi).toBe('n1');
    expect(s[0].readings.map((r) => r.frequency_hz)).toEqual([1e5, 2e5, 3e5]);
    expect(s[0].readings[1].point).toBe(4);
  });
});

describe('transfer-mapped profile', () => {
  const r = -10 / 33;
  const phi: Record<string, number> = { n1: 1, n2: 0, n3: r, n4: 0, n5: r * r };
  const g = { re: 2.5e3, im: 40 };
  const transfer = (drive: string, sense: string, pred = 1): Reading =>
    reading({ kind: 'transfer', hi: drive, sense, re: g.re * phi[drive] * phi[sense], im: g.im * phi[drive] * phi[sense], pred_re: pred * g.re * phi[drive] * phi[sense], pred_im: 0 });

  it('normalizes re to the drive node and so recovers φ_s / φ_d with its sign', () => {
    const rs = ['n1', 'n2', 'n3', 'n4', 'n5'].map((s) => transfer('n1', s));
    const [p] = transferProfiles(rs, 1e5);
    expect(p.source).toBe('transfer');
    for (const point of p.points) expect(point.measured).toBeCloseTo(phi[point.node] / phi.n1, 12);
    expect(p.points.find((x) => x.node === 'n3')!.measured).toBeLessThan(0);
  });

  it('falls back to the drive node’s reading to ground, which is the same quantity', () => {
    const rs = ['n3', 'n5'].map((s) => transfer('n1', s));
    rs.push(reading({ hi: 'n1', re: g.re, im: g.im, pred_re: g.re, pred_im: 0 }));
    const [p] = transferProfiles(rs, 1e5);
    expect(p.source).toBe('to-ground');
    expect(p.points.find((x) => x.node === 'n5')!.measured).toBeCloseTo(r * r, 12);
  });

  it('normalizes the prediction by its own reference, so a scale error alone does not show', () => {
    const rs = ['n1', 'n3'].map((s) => transfer('n1', s, 3));
    const [p] = transferProfiles(rs, 1e5);
    expect(p.points.find((x) => x.node === 'n3')!.predicted).toBeCloseTo(r, 12);
  });

  it('uses the largest reading when the drive node was not read, and says so', () => {
    const rs = ['n3', 'n5'].map((s) => transfer('n1', s));
    const [p] = transferProfiles(rs, 1e5);
    expect(p.source).toBe('largest');
    expect(Math.max(...p.points.map((x) => Math.abs(x.measured!)))).toBeCloseTo(1, 12);
  });
});

describe('phase bands', () => {
  it('keep an arc inside ±180° as one interval', () => {
    expect(phaseIntervals({ phase_lo_deg: -20, phase_hi_deg: 30 })).toEqual([[-20, 30]]);
  });

  it('split an arc that crosses ±180° into two (counter-clockwise from lo to hi)', () => {
    const parts = phaseIntervals({ phase_lo_deg: 170, phase_hi_deg: -170 });
    expect(parts).toHaveLength(2);
    expect(parts[0]).toEqual([170, 180]);
    expect(parts[1][0]).toBe(-180);
    expect(parts[1][1]).toBeCloseTo(-170, 9);
  });

  it('treat −180 … 180 as the full circle', () => {
    expect(phaseIntervals({ phase_lo_deg: -180, phase_hi_deg: 180 })).toEqual([[-180, 180]]);
  });
});
