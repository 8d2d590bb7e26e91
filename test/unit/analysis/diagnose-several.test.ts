// Two faults at once: no single part can explain them. The diagnosis must say so, and its greedy
// second-part search must find both injected faults (the truth is the pair of faults injected).
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { diagnose } from '../../../src/analysis/diagnose.js';
import { scanReadings } from '../../bench/diagnose-scan.util.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const corner = loadBoard('shared/boards/corner-8x8.yaml');

describe('two faults', () => {
  const cases = [
    { board: chain, faults: ['L_tanka_5=26.4u', 'C_intra_9=open'], refs: ['C_intra_9', 'L_tanka_5'], frequencies: [131e3, 163.6e3, 204.5e3] },
    { board: corner, faults: ['C_yout1_1_1=4.7n', 'C_xin2_2_2=short'], refs: ['C_xin2_2_2', 'C_yout1_1_1'], frequencies: [94e3, 117.3e3, 146.6e3] },
  ];
  for (const c of cases) {
    it(`${c.board.name}: ${c.faults.join(' and ')} are reported as no single part, then found as a pair`, () => {
      const readings = scanReadings(c.board, { faults: c.faults, frequencies: c.frequencies, seed: 21 });
      const d = diagnose(c.board, readings);
      expect(d.verdict).toBe('several-faults');
      expect(d.message).toMatch(/^no single part explains the deviations/);
      // The best single explanation falls short of the threshold share.
      expect(d.candidates[0].share).toBeLessThan(0.9);
      expect(d.pair).toBeDefined();
      expect([d.pair!.first.ref, d.pair!.second.ref].sort()).toEqual([...c.refs].sort());
      expect(d.pair!.share).toBeGreaterThan(0.9);
      expect(d.pair!.misfit).toBeLessThan(3);
    });
  }

  it('with the pair search off, the verdict is unexplained', () => {
    const readings = scanReadings(chain, { faults: cases[0].faults, frequencies: cases[0].frequencies, seed: 21 });
    const d = diagnose(chain, readings, { pairs: false });
    expect(d.verdict).toBe('unexplained');
    expect(d.pair).toBeUndefined();
    expect(d.message).toContain('no single part or fixture path explains');
  });
});
