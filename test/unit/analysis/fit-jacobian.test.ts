// The fit's Jacobian from adjoint sensitivities against central finite differences of its own residuals
// (the usual check of an analytic derivative; common practice), for every kind of parameter and reading.
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import type { Board } from '../../../src/board/types.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { FitModel } from '../../../src/analysis/fit-model.js';
import { FitParameters } from '../../../src/analysis/fit-parameters.js';
import { prepareReadings } from '../../../src/analysis/fit-readings.js';
import { checkFitSpec, type FitSpec } from '../../../src/analysis/fit-spec.js';
import { admittanceDerivatives } from '../../../src/analysis/sensitivity-admittance.js';
import { partAdmittance } from '../../../src/circuit/admittance.js';
import type { Reading } from '../../../src/analysis/readings.js';
import type { CommonLeads } from '../../../src/analysis/diagnose-leads.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const tank = loadBoard('shared/boards/tank-3.json');

/** Readings of every kind at a few frequencies near the band, with values from the engine. */
function mixedReadings(board: Board, frequencies: number[]): Reading[] {
  const solver = new ImpedanceSolver(new GroundedLaplacian(board));
  const names = board.nodes.map((n) => n.name);
  const out: Reading[] = [];
  const push = (kind: Reading['kind'], hi: string, lo: string, f: number, z: { re: number; im: number }, sense?: string) => {
    const reading: Reading = { step: out.length, point: 0, kind, hi, lo, frequency_hz: f, re: z.re * 1.01, im: z.im * 0.99, pred_re: 0, pred_im: 0, flag: 'ok' };
    if (sense !== undefined) reading.sense = sense;
    out.push(reading);
  };
  for (const f of frequencies) {
    const s = solver.at(f);
    for (const n of names.slice(0, 4)) push('to-ground', n, 'gnd', f, s.toGround(n));
    push('two-point', names[0], names[2], f, s.between(names[0], names[2]));
    push('transfer', names[1], 'gnd', f, s.transfer(names[1], names[names.length - 1]), names[names.length - 1]);
    // Drive n1 -> n3, sense n2 against n3: V(n2) - V(n3) for 1 A in at n1 and out at n3.
    const drive = s.responseTo(names[0]);
    const back = s.responseTo(names[2]);
    const row = (name: string) => names.indexOf(name);
    const v = (name: string) => ({
      re: drive.re[row(name)] - back.re[row(name)],
      im: drive.im[row(name)] - back.im[row(name)],
    });
    const z = { re: v(names[1]).re - v(names[2]).re, im: v(names[1]).im - v(names[2]).im };
    push('transfer', names[0], names[2], f, z, names[1]);
  }
  return out;
}

function modelFor(board: Board, spec: FitSpec, readings: Reading[], leads?: CommonLeads) {
  const laplacian = new GroundedLaplacian(board);
  const prepared = prepareReadings(readings, laplacian.index, board);
  const parameters = new FitParameters(board, checkFitSpec(board, spec), { referenceHz: 150e3 });
  return { model: new FitModel(laplacian, prepared, parameters, { relative: 1e-3, floor: 0 }, leads), theta: parameters.start };
}

/** Largest |adjoint - central difference| over all entries, relative to the largest entry. */
function worstMismatch(board: Board, spec: FitSpec, readings: Reading[], moveBy: number[] = [], leads?: CommonLeads): number {
  const { model, theta: start } = modelFor(board, spec, readings, leads);
  // Away from nominal, so that no derivative is special by symmetry.
  const theta = start.map((t, m) => t + (moveBy[m] ?? 0.01 * Math.sin(3 * m + 1)));
  const { jacobian } = model.residualsAndJacobian(theta);
  const P = model.parameterCount;
  const h = 1e-6;
  let worst = 0;
  let largest = 0;
  for (let m = 0; m < P; m++) {
    const plus = Float64Array.from(theta);
    const minus = Float64Array.from(theta);
    plus[m] += h;
    minus[m] -= h;
    const rp = model.residuals(plus);
    const rm = model.residuals(minus);
    for (let i = 0; i < rp.length; i++) {
      const fd = (rp[i] - rm[i]) / (2 * h);
      largest = Math.max(largest, Math.abs(jacobian[i * P + m]));
      worst = Math.max(worst, Math.abs(fd - jacobian[i * P + m]));
    }
  }
  expect(largest).toBeGreaterThan(0);
  return worst / largest;
}

describe('adjoint Jacobian of the fit', () => {
  const chainReadings = mixedReadings(chain, [140e3, 163.6e3, 190e3]);

  it('matches finite differences for the global scales and a shared inductor resistance', () => {
    expect(worstMismatch(chain, { capacitanceScale: true, inductanceScale: true, inductorResistance: { form: 'ohms' } }, chainReadings)).toBeLessThan(1e-6);
  });

  it('matches finite differences for a shared inductor Q (which follows the fitted inductance too)', () => {
    expect(worstMismatch(chain, { inductanceScale: true, inductorResistance: { form: 'q', atHz: 100e3 } }, chainReadings)).toBeLessThan(1e-6);
  });

  it('matches finite differences for named parts, a resistor among them, next to a scale', () => {
    const readings = mixedReadings(tank, [80e3, 120e3, 200e3]);
    expect(worstMismatch(tank, { parts: ['R1', 'C12', 'L2'], capacitanceScale: true }, readings)).toBeLessThan(1e-6);
  });

  it('matches finite differences through the fixture leads (the chain rule through Z_s + Z/(1 + Z·Y_o))', () => {
    // Leads larger than any real fixture's, so that the factor 1/(1 + Z·Y_o)² is far from 1.
    const leads: CommonLeads = {
      twoTerminal: { ohms: 0.5, henries: 200e-9, farads: 2e-9 },
      transfer: { ohms: 0.2, henries: 0, farads: 1e-9 },
    };
    const spec: FitSpec = { capacitanceScale: true, inductanceScale: true, inductorResistance: { form: 'ohms' } };
    expect(worstMismatch(chain, spec, chainReadings, [], leads)).toBeLessThan(1e-6);
  });

  it('matches finite differences for an all-parts fit, prior rows included', () => {
    expect(worstMismatch(chain, { allParts: true, inductorResistance: { form: 'ohms' } }, chainReadings)).toBeLessThan(1e-6);
  });
});

describe('admittance derivatives', () => {
  // Central differences of the admittance itself (common practice), for each kind with and without loss.
  const omega = 2 * Math.PI * 150e3;
  const cases: [string, 'C' | 'L' | 'R', number, number][] = [
    ['a capacitor with ESR', 'C', 33e-9, 0.02],
    ['an ideal capacitor', 'C', 33e-9, 0],
    ['an inductor', 'L', 22e-6, 0.28],
    ['a resistor', 'R', 100e3, 0],
  ];
  for (const [name, kind, value, esr] of cases) {
    it(`of ${name} match finite differences`, () => {
      const d = admittanceDerivatives(kind, value, esr, omega);
      const h = value * 1e-6;
      const yp = partAdmittance({ kind, value: value + h, esr }, omega);
      const ym = partAdmittance({ kind, value: value - h, esr }, omega);
      const scale = Math.hypot(d.byValue.re, d.byValue.im);
      expect(Math.abs((yp.re - ym.re) / (2 * h) - d.byValue.re) / scale).toBeLessThan(1e-7);
      expect(Math.abs((yp.im - ym.im) / (2 * h) - d.byValue.im) / scale).toBeLessThan(1e-7);
      if (kind !== 'R') {
        const hr = 1e-6;
        const rp = partAdmittance({ kind, value, esr: esr + hr }, omega);
        const rm = partAdmittance({ kind, value, esr: Math.max(0, esr - hr) }, omega);
        const span = esr + hr - Math.max(0, esr - hr);
        const rs = Math.hypot(d.byResistance.re, d.byResistance.im);
        expect(Math.abs((rp.re - rm.re) / span - d.byResistance.re) / rs).toBeLessThan(1e-4);
        expect(Math.abs((rp.im - rm.im) / span - d.byResistance.im) / rs).toBeLessThan(1e-4);
      }
    });
  }
});

describe('the model reads the same impedances as the engine', () => {
  it('gives zero residuals on readings computed by the engine at the same values', () => {
    // Each reading kind against ImpedanceSolver's own toGround, between and transfer (the model builds Z
    // from the columns of J⁻¹ itself; the two must agree).
    const readings = mixedReadings(chain, [150e3]).map((r) => ({ ...r, re: r.re / 1.01, im: r.im / 0.99 }));
    const { model, theta } = modelFor(chain, { capacitanceScale: true }, readings);
    const residuals = model.residuals(theta);
    const sigma = 1e-3;
    for (const r of residuals) expect(Math.abs(r * sigma)).toBeLessThan(1e-9);
  });
});
