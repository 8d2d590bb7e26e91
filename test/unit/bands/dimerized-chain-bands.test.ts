// Bloch bands of the dimerized capacitor chain against its closed-form dispersion.
// Source (common practice): the dimerized (SSH) chain with intracell hopping v and intercell w has
// h(k) eigenvalues t = ±|v + w e^{ik}| (W. P. Su, J. R. Schrieffer, A. J. Heeger, PRL 42, 1698 (1979), from
// memory). In the circuit every site carries v + w of
// capacitance in the bulk, so C(k) = (v + w) I - h(k), K = I / L and w^2 = 1 / (L (v + w - t)).
import { describe, expect, it } from 'vitest';
import { bandGaps, bandsAlongPath, bandsAt, blochMatrices, defaultBlochPath } from '../../../src/predict/bloch-bands.js';
import { dimerizedChain } from './lattices.js';

const v = 10e-9;
const w = 33e-9;
const L = 22e-6;
const a = 2.5; // lattice constant in position units (arbitrary)
const f0 = 1 / (2 * Math.PI * Math.sqrt(L * (v + w)));

/** Closed form, ascending; the upper band is infinite where v + w - t = 0 (theta = 0). */
function closedForm(theta: number): number[] {
  const t = Math.hypot(v + w * Math.cos(theta), w * Math.sin(theta));
  const f = (tt: number) => {
    const denom = L * (v + w - tt);
    return denom <= 1e-12 * L * (v + w) ? Infinity : 1 / (2 * Math.PI * Math.sqrt(denom));
  };
  return [f(-t), f(t)];
}

describe('dimerized chain Bloch bands', () => {
  const lattice = dimerizedChain(v, w, L, a);

  it('builds Hermitian C(theta) with the bulk diagonal v + w and off-diagonal -(v + w e^{-i theta})', () => {
    const theta = 0.7;
    const { n, capacitance, inverseInductance } = blochMatrices(lattice, [theta]);
    expect(n).toBe(2);
    expect(capacitance.re[0]).toBeCloseTo(v + w, 20);
    expect(capacitance.re[3]).toBeCloseTo(v + w, 20);
    // Hermitian: C[0][1] = conj(C[1][0]); its modulus is |v + w e^{i theta}| whatever the phase convention.
    expect(capacitance.re[1]).toBeCloseTo(capacitance.re[2], 20);
    expect(capacitance.im[1]).toBeCloseTo(-capacitance.im[2], 20);
    expect(Math.hypot(capacitance.re[1], capacitance.im[1]) / Math.hypot(v + w * Math.cos(theta), w * Math.sin(theta))).toBeCloseTo(1, 12);
    expect(inverseInductance.re[0]).toBeCloseTo(1 / L, 6);
    expect(inverseInductance.re[1]).toBe(0);
  });

  it.each([0.1, 0.5, 1.2, 2, 2.9, Math.PI, -1.3, -Math.PI])('matches |v + w e^{i theta}| at theta = %f', (theta) => {
    const ours = bandsAt(lattice, [theta]);
    closedForm(theta).forEach((f, b) => expect(Math.abs(ours[b] / f - 1)).toBeLessThan(1e-10));
  });

  it('reports the band without capacitance at theta = 0 as Infinity', () => {
    const ours = bandsAt(lattice, [0]);
    expect(Math.abs(ours[0] / closedForm(0)[0] - 1)).toBeLessThan(1e-10);
    expect(ours[1]).toBe(Infinity);
  });

  it('follows the closed form along the default path and measures it in reciprocal space', () => {
    const path = defaultBlochPath(1);
    const { samples } = bandsAlongPath(lattice, path, 24);
    expect(samples.length).toBe(25);
    expect(samples[0].label).toBe('Γ');
    expect(samples[24].label).toBe('X');
    // Common practice: the 1D zone boundary lies at k = pi / a.
    expect(samples[24].distance).toBeCloseTo(Math.PI / a, 12);
    for (const s of samples) {
      const ref = closedForm(s.theta[0]);
      ref.forEach((f, b) => (f === Infinity ? expect(s.frequencies_hz[b]).toBe(Infinity) : expect(Math.abs(s.frequencies_hz[b] / f - 1)).toBeLessThan(1e-9)));
    }
  });

  it('has one gap, from sqrt(2 L w) to sqrt(2 L v) in period, around the mid-gap frequency', () => {
    // From the dispersion: at theta = pi, t = ±|w - v|, so the gap runs from 1/(2 pi sqrt(2 L w)) to 1/(2 pi sqrt(2 L v)).
    const { samples } = bandsAlongPath(lattice, defaultBlochPath(1), 32);
    const gaps = bandGaps(samples);
    expect(gaps.length).toBe(1);
    expect(gaps[0].band).toBe(0);
    expect(gaps[0].below_hz / (1 / (2 * Math.PI * Math.sqrt(2 * L * w))) - 1).toBeCloseTo(0, 10);
    expect(gaps[0].above_hz / (1 / (2 * Math.PI * Math.sqrt(2 * L * v))) - 1).toBeCloseTo(0, 10);
    expect(gaps[0].below_hz).toBeLessThan(f0);
    expect(gaps[0].above_hz).toBeGreaterThan(f0);
  });

  it('closes the gap when v = w (the transition between the two phases)', () => {
    const uniform = dimerizedChain(w, w, L, a);
    const { samples } = bandsAlongPath(uniform, defaultBlochPath(1), 32);
    expect(bandGaps(samples)).toEqual([]);
  });
});
