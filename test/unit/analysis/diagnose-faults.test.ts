// Seeded assembly faults on both demo boards, measured on the board as built (the way the simulated
// bench builds it: simulators/board-as-built.ts) with seeded noise of 1e-3 relative; the diagnosis must
// rank the faulted part first and fit the injected value. The truth each check holds against is the
// injected fault itself; E-series values per IEC 60063 (from memory).
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import type { Board } from '../../../src/board/types.js';
import { diagnose, type PartCandidate } from '../../../src/analysis/diagnose.js';
import { scanReadings } from '../../bench/diagnose-scan.util.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const corner = loadBoard('shared/boards/corner-8x8.yaml');

// Frequencies below, at and above each board's design resonance (163.6 kHz and 117.3 kHz, from the board
// files' own comments: f0 = 1 / (2π √(L C_total))).
const FREQUENCIES = { chain: [131e3, 163.6e3, 204.5e3], corner: [94e3, 117.3e3, 146.6e3] };

type Expected = { kind: 'value'; value: number; decades: number; nearest?: number } | { kind: 'open' } | { kind: 'short' };

interface FaultCase {
  board: Board;
  frequencies: number[];
  fault: string;
  ref: string;
  expected: Expected;
}

const cases: FaultCase[] = [
  // A value off by 20 % (an inductor from the wrong tolerance bin): 22 µH × 1.2 = 26.4 µH, nearest E12 27 µH.
  { board: chain, frequencies: FREQUENCIES.chain, fault: 'L_tanka_5=26.4u', ref: 'L_tanka_5', expected: { kind: 'value', value: 26.4e-6, decades: 0, nearest: 27e-6 } },
  // Wrong decade: 3.3 nF placed where 33 nF belongs, and 330 nF.
  { board: chain, frequencies: FREQUENCIES.chain, fault: 'C_inter_4=3.3n', ref: 'C_inter_4', expected: { kind: 'value', value: 3.3e-9, decades: -1, nearest: 3.3e-9 } },
  { board: chain, frequencies: FREQUENCIES.chain, fault: 'C_inter_8=330n', ref: 'C_inter_8', expected: { kind: 'value', value: 330e-9, decades: 1, nearest: 330e-9 } },
  { board: chain, frequencies: FREQUENCIES.chain, fault: 'C_intra_3=open', ref: 'C_intra_3', expected: { kind: 'open' } },
  { board: chain, frequencies: FREQUENCIES.chain, fault: 'C_inter_7=short', ref: 'C_inter_7', expected: { kind: 'short' } },
  { board: corner, frequencies: FREQUENCIES.corner, fault: 'L_tanka_1_2=26.4u', ref: 'L_tanka_1_2', expected: { kind: 'value', value: 26.4e-6, decades: 0, nearest: 27e-6 } },
  { board: corner, frequencies: FREQUENCIES.corner, fault: 'C_yout1_1_1=4.7n', ref: 'C_yout1_1_1', expected: { kind: 'value', value: 4.7e-9, decades: -1, nearest: 4.7e-9 } },
  { board: corner, frequencies: FREQUENCIES.corner, fault: 'C_xin1_2_1=100n', ref: 'C_xin1_2_1', expected: { kind: 'value', value: 100e-9, decades: 1, nearest: 100e-9 } },
  { board: corner, frequencies: FREQUENCIES.corner, fault: 'C_xout1_1_2=open', ref: 'C_xout1_1_2', expected: { kind: 'open' } },
  { board: corner, frequencies: FREQUENCIES.corner, fault: 'C_yin2_2_1=short', ref: 'C_yin2_2_1', expected: { kind: 'short' } },
];

describe('diagnose ranks the seeded part fault first', () => {
  for (const c of cases) {
    it(`${c.board.name}: ${c.fault}`, () => {
      const names = c.board.nodes.map((n) => n.name);
      const readings = scanReadings(c.board, {
        faults: [c.fault],
        frequencies: c.frequencies,
        seed: 11,
        noise: 1e-3,
        twoPoint: [[names[2], names[3]]],
        transfer: [[names[0], names[1]]],
      });
      const d = diagnose(c.board, readings, { noise: 1e-3 });
      expect(d.verdict).toBe('single-part');
      const lead = d.candidates[0] as PartCandidate;
      expect(lead.subject).toBe('part');
      expect(lead.ref).toBe(c.ref);
      expect(lead.share).toBeGreaterThan(0.9);
      // What is left is noise: the mean misfit of pure noise is 2 (chi-square, two degrees of freedom).
      expect(lead.misfit).toBeLessThan(3);
      // The runner-up explains clearly less.
      expect(d.candidates[1].share).toBeLessThan(lead.share - 0.2);
      expect(lead.change.kind).toBe(c.expected.kind);
      if (lead.change.kind === 'value' && c.expected.kind === 'value') {
        expect(Math.abs(lead.change.value / c.expected.value - 1)).toBeLessThan(0.03);
        expect(lead.change.decades).toBe(c.expected.decades);
        if (c.expected.nearest !== undefined) expect(lead.change.nearest.value).toBeCloseTo(c.expected.nearest, 15);
        if (c.expected.decades !== 0) expect(lead.summary).toContain(c.expected.decades > 0 ? 'one decade high' : 'one decade low');
      }
      expect(d.message).toContain(c.ref);
    });
  }
});

describe('parts these readings cannot tell apart', () => {
  it('names every part in parallel with a shorted one (a short across parallel parts is one short; common practice)', () => {
    // At corner a0_0 the inductor L_tanka_0_0 and the two terminating capacitors all run to ground.
    const readings = scanReadings(corner, { faults: ['L_tanka_0_0=short'], frequencies: FREQUENCIES.corner, seed: 2 });
    const d = diagnose(corner, readings);
    expect(d.verdict).toBe('single-part');
    const parallel = ['L_tanka_0_0', 'C_xout1_0_0_to', 'C_yout1_0_0_to'];
    expect(d.candidates.slice(0, 3).map((c) => c.ref).sort()).toEqual([...parallel].sort());
    for (const c of d.candidates.slice(0, 3)) expect(c.change.kind).toBe('short');
    const note = d.notes.find((n) => n.includes('in parallel'));
    expect(note).toBeDefined();
    for (const ref of parallel) {
      expect(note).toContain(ref);
      expect(d.message).toContain(ref);
    }
  });
});
