// The common fixture of the diagnosis: predictions seen through Z_s + Z / (1 + Z·Y_o), the open/short
// fixture model of impedance-analyzer practice (common practice; the compensation handbook form is
// Z_dut = (Z_m − Z_s) / (1 − (Z_m − Z_s)·Y_o), from memory). The readings here are made with mathjs
// complex arithmetic (the outside reference) from known leads; the fit must find those leads again.
import { complex, add, divide, multiply, type Complex } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { GROUND } from '../../../src/board/types.js';
import { fitCommonLeads } from '../../../src/analysis/diagnose-leads.js';
import { MisfitMeter } from '../../../src/analysis/diagnose-misfit.js';
import { prepareScan } from '../../../src/analysis/diagnose-scan.js';
import type { Reading } from '../../../src/analysis/readings.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const TRUE_LEADS = { ohms: 0.3, henries: 120e-9, farads: 22e-12 };

/** A spread of predicted impedances, from a fraction of an ohm to kilohms, at three frequencies. */
function predictedAndRead(): { readings: Reading[]; predicted: Float64Array } {
  const readings: Reading[] = [];
  const predicted: number[] = [];
  let k = 0;
  for (const f of [100e3, 160e3, 250e3]) {
    const omega = 2 * Math.PI * f;
    for (const [n, node] of chain.nodes.entries()) {
      const z = complex(0.2 * 1.6 ** n, (n % 2 === 0 ? 1 : -1) * 0.5 * 1.4 ** n);
      const zs = complex(TRUE_LEADS.ohms, omega * TRUE_LEADS.henries);
      const yo = complex(0, omega * TRUE_LEADS.farads);
      const read = add(zs, divide(z, add(1, multiply(z, yo)))) as Complex;
      readings.push({ step: n + 1, point: k++, kind: 'to-ground', hi: node.name, lo: GROUND, frequency_hz: f, re: read.re, im: read.im, pred_re: 0, pred_im: 0, flag: 'ok' });
      predicted.push(z.re, z.im);
    }
  }
  return { readings, predicted: Float64Array.from(predicted) };
}

describe('the common leads', () => {
  it('are found again from readings made through known leads (mathjs complex arithmetic as reference)', () => {
    const { readings, predicted } = predictedAndRead();
    const meter = new MisfitMeter(prepareScan(chain, readings), 1e-3);
    const leads = fitCommonLeads(meter, predicted);
    expect(leads.twoTerminal.ohms / TRUE_LEADS.ohms).toBeCloseTo(1, 3);
    expect(leads.twoTerminal.henries / TRUE_LEADS.henries).toBeCloseTo(1, 2);
    expect(leads.twoTerminal.farads / TRUE_LEADS.farads).toBeCloseTo(1, 2);
    // Seen through them the predictions meet the readings to rounding; without them they do not.
    expect(meter.withLeads(leads).of(predicted)).toBeLessThan(1e-3);
    expect(meter.of(predicted)).toBeGreaterThan(100);
  });

  it('are none at all when the readings are the predictions', () => {
    const { readings, predicted } = predictedAndRead();
    const exact = readings.map((r, i) => ({ ...r, re: predicted[2 * i], im: predicted[2 * i + 1] }));
    const leads = fitCommonLeads(new MisfitMeter(prepareScan(chain, exact), 1e-3), predicted);
    expect(leads.twoTerminal).toEqual({ ohms: 0, henries: 0, farads: 0 });
    expect(leads.transfer).toEqual({ ohms: 0, henries: 0, farads: 0 });
  });
});
