// A fault in the test fixture, not on the board: 5 Ω in series with one node's HI path (a worn relay
// contact; milliohm contacts are common practice, so 5 Ω is a fault), or that path open with only a
// fraction of a picofarad across the gap. The diagnosis must not pin it on a part, and the fixture
// pseudo-candidate of that node must lead with the series element fitted. The truth is the injected
// fixture fault.
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { diagnose } from '../../../src/analysis/diagnose.js';
import { scanReadings } from '../../bench/diagnose-scan.util.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const corner = loadBoard('shared/boards/corner-8x8.yaml');

describe('a fixture fault is not blamed on a part', () => {
  const cases = [
    { board: chain, node: 'n9', frequencies: [131e3, 163.6e3, 204.5e3] },
    { board: corner, node: 'b2_1', frequencies: [94e3, 117.3e3, 146.6e3] },
  ];
  for (const c of cases) {
    it(`${c.board.name}: 5 Ω in series with the HI path of ${c.node}`, () => {
      const readings = scanReadings(c.board, { frequencies: c.frequencies, seed: 5, fixtureSeries: { node: c.node, ohms: 5 } });
      const d = diagnose(c.board, readings);
      expect(d.verdict).toBe('fixture');
      const lead = d.candidates[0];
      expect(lead.subject).toBe('fixture');
      expect(lead.ref).toBe(`fixture at node ${c.node} (HI path)`);
      if (lead.subject !== 'fixture' || lead.change.kind !== 'series-resistance') throw new Error(`expected a series resistance, got ${lead.summary}`);
      expect(Math.abs(lead.change.ohms / 5 - 1)).toBeLessThan(0.05);
      expect(lead.share).toBeGreaterThan(0.9);
      // No part explains a high share of it.
      for (const candidate of d.candidates.filter((x) => x.subject === 'part')) expect(candidate.share).toBeLessThan(0.5);
      expect(d.message).toContain('fixture');
    });
  }

  it('chain-24: the HI path of n14 open, 0.5 pF across the gap', () => {
    const readings = scanReadings(chain, { frequencies: [131e3, 163.6e3, 204.5e3], seed: 8, fixtureSeries: { node: 'n14', gapFarads: 0.5e-12 } });
    const d = diagnose(chain, readings);
    expect(d.verdict).toBe('fixture');
    const lead = d.candidates[0];
    if (lead.subject !== 'fixture' || lead.change.kind !== 'open-contact') throw new Error(`expected an open contact, got ${lead.summary}`);
    expect(lead.node).toBe('n14');
    expect(Math.abs(lead.change.farads / 0.5e-12 - 1)).toBeLessThan(0.05);
    for (const candidate of d.candidates.filter((x) => x.subject === 'part')) expect(candidate.share).toBeLessThan(0.5);
  });

  it('a part fault at the same node is still put on the part, not on the fixture', () => {
    // L_tankb_6 sits at n14: the fixture candidate of n14 must not win over the part.
    const readings = scanReadings(chain, { faults: ['L_tankb_6=18u'], frequencies: [131e3, 163.6e3, 204.5e3], seed: 9 });
    const d = diagnose(chain, readings);
    expect(d.verdict).toBe('single-part');
    expect(d.candidates[0].ref).toBe('L_tankb_6');
    const fixture = d.candidates.find((x) => x.subject === 'fixture');
    if (fixture) expect(fixture.share).toBeLessThan(0.9);
  });
});
