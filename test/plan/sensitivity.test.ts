// First-order sensitivities (adjoint, two responses of the factored J) against finite differences of the
// engine's own solves on a board with one part changed (central differences; common practice).
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadBoard, type Board, type Part } from '../../src/board/index.js';
import { partAdmittance } from '../../src/circuit/admittance.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { predictModes } from '../../src/predict/modes.js';
import { readingSensitivities } from '../../src/predict/sensitivity.js';
import { modeFrequencySensitivities } from '../../src/predict/sensitivity-modes.js';
import { admittanceLogDerivative } from '../../src/predict/sensitivity-parts.js';
import { readingValue, type Reading } from '../../src/predict/tolerance-readings.js';
import { ROOT } from '../support/run-cli.js';

const chain = loadBoard(path.join(ROOT, 'shared/boards/chain-24.yaml'));
const H = 1e-5;

function withPart(board: Board, ref: string, factor: number): Board {
  return { ...board, parts: board.parts.map((p) => (p.ref === ref ? { ...p, value: p.value * factor } : p)) };
}

/**
 * Central difference improved by one Richardson step, (4·D(h/2) − D(h))/3, good to O(h⁴) (common practice):
 * near a sharp resonance the plain O(h²) error is not small, the readings' derivatives being large there.
 */
function richardson(difference: (h: number) => { re: number; im: number }): { re: number; im: number } {
  const coarse = difference(1e-4);
  const fine = difference(5e-5);
  return { re: (4 * fine.re - coarse.re) / 3, im: (4 * fine.im - coarse.im) / 3 };
}

function reading(board: Board, r: Reading, f: number) {
  return readingValue(new ImpedanceSolver(new GroundedLaplacian(board)).at(f), r);
}

describe('admittanceLogDerivative', () => {
  it('matches a central difference of the part admittance in ln p for C, L (with esr) and R', () => {
    const omega = 2 * Math.PI * 150e3;
    const parts: Pick<Part, 'kind' | 'value' | 'esr'>[] = [
      { kind: 'C', value: 33e-9, esr: 0.02 },
      { kind: 'L', value: 22e-6, esr: 0.41 },
      { kind: 'C', value: 10e-9 },
      { kind: 'R', value: 1000 },
    ];
    for (const part of parts) {
      const up = partAdmittance({ ...part, value: part.value * Math.exp(H) }, omega);
      const down = partAdmittance({ ...part, value: part.value * Math.exp(-H) }, omega);
      const d = admittanceLogDerivative(part, omega);
      const scale = Math.hypot(d.re, d.im);
      expect(Math.abs(d.re - (up.re - down.re) / (2 * H)) / scale).toBeLessThan(1e-8);
      expect(Math.abs(d.im - (up.im - down.im) / (2 * H)) / scale).toBeLessThan(1e-8);
    }
  });
});

describe('readingSensitivities (adjoint)', () => {
  const laplacian = new GroundedLaplacian(chain);
  const cases: [Reading, number][] = [
    [{ kind: 'to-ground', hi: 'n1', lo: 'gnd' }, 170e3],
    [{ kind: 'to-ground', hi: 'n3', lo: 'gnd' }, 163.6e3],
    [{ kind: 'two-point', hi: 'n1', lo: 'n2' }, 163e3],
    [{ kind: 'transfer', hi: 'n1', lo: 'gnd', sense: 'n5' }, 160e3],
  ];
  const refs = ['C_intra_0', 'C_inter_0', 'C_inter_11_from', 'L_tanka_0', 'L_tankb_2', 'C_intra_5'];

  it.each(cases)('%o at %d Hz agrees with the finite-difference sensitivity of every checked part', (r, f) => {
    const solved = new ImpedanceSolver(laplacian).at(f);
    const { z, parts } = readingSensitivities(laplacian, solved, r);
    const size = Math.hypot(z.re, z.im);
    for (const ref of refs) {
      const adjoint = parts.find((p) => p.part.ref === ref)!.dz;
      const fd = richardson((h) => {
        const up = reading(withPart(chain, ref, Math.exp(h)), r, f);
        const down = reading(withPart(chain, ref, Math.exp(-h)), r, f);
        return { re: (up.re - down.re) / (2 * h), im: (up.im - down.im) / (2 * h) };
      });
      expect(Math.hypot(adjoint.re - fd.re, adjoint.im - fd.im) / size).toBeLessThan(1e-6);
    }
  });

  it('finds the sensitivities that matter: at the edge mode n1 depends on the end tank, not on a part in the middle', () => {
    const solved = new ImpedanceSolver(laplacian).at(163.6e3);
    const { parts } = readingSensitivities(laplacian, solved, { kind: 'to-ground', hi: 'n1', lo: 'gnd' });
    const size = (ref: string) => Math.hypot(parts.find((p) => p.part.ref === ref)!.dz.re, parts.find((p) => p.part.ref === ref)!.dz.im);
    expect(size('L_tanka_0')).toBeGreaterThan(1e3 * size('C_intra_6'));
  });
});

describe('modeFrequencySensitivities', () => {
  // tank-3 has three well separated modes, so each can be followed under a small change of one part.
  const tank = loadBoard(path.join(ROOT, 'shared/boards/tank-3.json'));
  const modes = predictModes(new GroundedLaplacian(tank), { count: 3 }).modes.sort((a, b) => a.frequency_hz - b.frequency_hz);
  const frequencies = (board: Board) => predictModes(new GroundedLaplacian(board), { count: 3 }).modes.map((m) => m.frequency_hz).sort((a, b) => a - b);

  it('matches the finite-difference d ln f / d ln p of every mode and part (eigenvalue perturbation; common practice)', () => {
    modes.forEach((mode, k) => {
      const sensitivities = modeFrequencySensitivities(new GroundedLaplacian(tank), mode.profile);
      for (const { part, value } of sensitivities) {
        if (part.kind === 'R') {
          expect(value).toBe(0);
          continue;
        }
        const up = frequencies(withPart(tank, part.ref, Math.exp(H)))[k];
        const down = frequencies(withPart(tank, part.ref, Math.exp(-H)))[k];
        expect(value).toBeCloseTo(Math.log(up / down) / (2 * H), 6);
      }
    });
  });

  it('sums to −1/2 over the capacitors and −1/2 over the inductors: f ∝ 1/√(LC) (common practice)', () => {
    for (const mode of modes) {
      const s = modeFrequencySensitivities(new GroundedLaplacian(tank), mode.profile);
      const sum = (kind: string) => s.filter((x) => x.part.kind === kind).reduce((a, x) => a + x.value, 0);
      expect(sum('C')).toBeCloseTo(-0.5, 12);
      expect(sum('L')).toBeCloseTo(-0.5, 12);
    }
  });
});
