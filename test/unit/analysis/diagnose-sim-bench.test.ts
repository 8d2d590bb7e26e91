// End to end through the simulated bench: readings asked over SCPI-99 commands (ROUTe:CLOSe, FREQuency,
// READ?; SCPI-99 vol. 1 (from memory)) of a simulated analyzer whose board as built carries a fault it
// never tells. First the fixture is made near ideal (1 µΩ contacts, no strays, no leads) so that only the
// board and the 1e-3 noise remain; then the bench keeps its default fixture (contacts, leads, strays) and
// the diagnosis must see through it. The truth is the fault given to the bench and its fixture settings.
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { GROUND } from '../../../src/board/types.js';
import { diagnose, type PartCandidate } from '../../../src/analysis/diagnose.js';
import type { Reading } from '../../../src/analysis/readings.js';
import { SimulatedBench } from '../../../simulators/bench.js';
import { DEFAULT_BENCH } from '../../../simulators/bench-physics.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const IDEAL_FIXTURE = { contactResistance: 1e-6, strayCapacitance: 0, leadResistance: 0, leadInductance: 0, noise: { relative: 1e-3, floor: 0 } };

async function measure(bench: SimulatedBench, frequencies: number[]): Promise<Reading[]> {
  const readings: Reading[] = [];
  for (const [k, node] of chain.nodes.entries()) {
    // Default fixture map: node k+1 on HI channel 1001+k, ground on LO channel 2000.
    await bench.switchMatrix.receive('ROUT:OPEN:ALL');
    await bench.switchMatrix.receive(`ROUT:CLOS (@${1001 + k},2000)`);
    for (const [p, f] of frequencies.entries()) {
      const answer = await bench.analyzer.receive(`FREQ ${f};READ?`);
      const [re, im] = (answer ?? '').split(',').map(Number);
      readings.push({ step: k + 1, point: p + 1, kind: 'to-ground', hi: node.name, lo: GROUND, frequency_hz: f, re, im, pred_re: 0, pred_im: 0, flag: 'ok' });
    }
  }
  return readings;
}

describe('diagnose on readings from the simulated bench', () => {
  it('finds a 3.3 nF part placed where 33 nF belongs, one decade low', async () => {
    const bench = new SimulatedBench({ board: chain, faults: ['C_inter_4=3.3n'], seed: 3, timing: 'instant', physics: IDEAL_FIXTURE });
    const d = diagnose(chain, await measure(bench, [131e3, 163.6e3, 204.5e3]));
    expect(d.verdict).toBe('single-part');
    const lead = d.candidates[0] as PartCandidate;
    expect(lead.ref).toBe('C_inter_4');
    if (lead.change.kind !== 'value') throw new Error(`expected a value, got ${lead.summary}`);
    expect(Math.abs(lead.change.value / 3.3e-9 - 1)).toBeLessThan(0.03);
    expect(lead.change.decades).toBe(-1);
    expect(lead.summary).toContain('fitted where 33 nF placed (one decade low; nearest E24 value 3.3 nF)');
  });

  it('sees through the default fixture: an open C_intra_0 is named alone, and the fitted leads are the bench\'s', async () => {
    const bench = new SimulatedBench({ board: chain, faults: ['C_intra_0=open'], seed: 5, timing: 'instant' });
    const readings = await measure(bench, [131e3, 163.6e3, 204.5e3]);
    const d = diagnose(chain, readings, { floorOhms: 0.5 });
    expect(d.verdict).toBe('single-part');
    expect(d.candidates[0].ref).toBe('C_intra_0');
    expect(d.candidates[0].change.kind).toBe('open');
    // A to-ground reading passes the HI contact and lead, and the LO contact and lead: twice each.
    const b = DEFAULT_BENCH;
    expect(d.leads!.twoTerminal.ohms).toBeCloseTo(2 * (b.contactResistance + b.leadResistance), 2);
    expect(d.leads!.twoTerminal.henries / (2 * b.leadInductance)).toBeCloseTo(1, 1);
    expect(d.leads!.twoTerminal.farads / b.strayCapacitance).toBeCloseTo(1, 1);
    expect(d.notes.some((n) => n.startsWith('fixture common to all readings fitted'))).toBe(true);
    // Without the leads the same readings leave the diagnosis short of an answer.
    const blind = diagnose(chain, readings, { floorOhms: 0.5, leads: false });
    expect(blind.candidates[0].misfit).toBeGreaterThan(d.candidates[0].misfit * 10);
  });
});
