// Tolerance bands: the sampled distribution, the Monte Carlo envelope against a brute-force recomputation
// of the samples as ordinary boards, and the first-order band against the Monte Carlo one.
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { mean, std } from 'mathjs';
import { GROUND, loadBoard, type Board } from '../../src/board/index.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { predictImpedances } from '../../src/predict/impedances.js';
import { readingSensitivities } from '../../src/predict/sensitivity.js';
import { firstOrderHalfWidths, QUADRATURE_COVERAGE_FACTOR } from '../../src/predict/tolerance-first-order.js';
import type { ReadingRequest } from '../../src/predict/tolerance-evaluate.js';
import { envelopeCoverage, monteCarloSpreads } from '../../src/predict/tolerance-monte-carlo.js';
import { boardWithSample, drawToleranceSamples } from '../../src/predict/tolerance-samples.js';
import { ROOT } from '../support/run-cli.js';

const chain = loadBoard(path.join(ROOT, 'shared/boards/chain-24.yaml'));
const toGround = (hi: string) => ({ kind: 'to-ground' as const, hi, lo: GROUND });
// Sample statistics from mathjs (the reference library), as plain numbers.
const sd = (xs: number[]): number => std(xs) as unknown as number;
const average = (xs: number[]): number => mean(xs) as unknown as number;

describe('drawToleranceSamples: uniform within ±tolerance (the documented assumption)', () => {
  const samples = drawToleranceSamples(chain, { count: 4000, seed: 3 });

  it('keeps every value within its tolerance, with the mean and standard deviation of a uniform distribution', () => {
    // A uniform distribution on [−t, t] has mean 0 and standard deviation t/√3 (common practice).
    for (const ref of ['C_intra_0', 'L_tanka_3']) {
      const part = chain.parts.find((p) => p.ref === ref)!;
      const t = part.tolerance!;
      const relative = samples.map((s) => s.values.get(ref)! / part.value - 1);
      expect(Math.max(...relative.map(Math.abs))).toBeLessThanOrEqual(t);
      // 4000 draws: the standard error of the mean is t/√3/√4000 ≈ 0.009 t, of the deviation about 0.5 %.
      expect(Math.abs(average(relative))).toBeLessThan(0.04 * t);
      expect(sd(relative) / (t / Math.sqrt(3))).toBeGreaterThan(0.97);
      expect(sd(relative) / (t / Math.sqrt(3))).toBeLessThan(1.03);
      // Both ends are reached: a normal distribution of σ = t/2 would rarely stay inside, a uniform fills it.
      expect(Math.max(...relative)).toBeGreaterThan(0.99 * t);
      expect(Math.min(...relative)).toBeLessThan(-0.99 * t);
    }
  });

  it('gives the same samples for the same seed and others for another seed', () => {
    const again = drawToleranceSamples(chain, { count: 3, seed: 3 });
    const other = drawToleranceSamples(chain, { count: 3, seed: 4 });
    expect([...again[2].values]).toEqual([...samples[2].values]);
    expect(other[0].values.get('C_intra_0')).not.toBe(samples[0].values.get('C_intra_0'));
  });

  it('leaves parts without a tolerance at their nominal value', () => {
    const board: Board = { ...chain, parts: chain.parts.map((p) => (p.ref === 'C_intra_2' ? { ...p, tolerance: undefined } : p)) };
    const [sample] = drawToleranceSamples(board, { count: 1, seed: 1 });
    expect(sample.values.has('C_intra_2')).toBe(false);
    expect(boardWithSample(board, sample).parts.find((p) => p.ref === 'C_intra_2')!.value).toBe(10e-9);
  });
});

describe('monteCarloSpreads', () => {
  const laplacian = new GroundedLaplacian(chain);
  const frequencies = [150e3, 163.6e3, 175e3];
  const requests: ReadingRequest[] = ['n1', 'n2', 'n12', 'n24'].map((hi) => ({ reading: toGround(hi), frequencies }));
  const samples = drawToleranceSamples(chain, { count: 40, seed: 11 });
  const spreads = monteCarloSpreads(laplacian, requests, samples);

  it('is exactly the envelope of the samples solved as ordinary boards with the engine, nominal included', () => {
    const pairs = requests.map((r) => ({ hi: r.reading.hi, lo: GROUND }));
    const nominal = predictImpedances(laplacian, frequencies, pairs).impedances;
    const bySample = samples.map((s) => predictImpedances(new GroundedLaplacian(boardWithSample(chain, s)), frequencies, pairs).impedances);
    requests.forEach((r, i) =>
      frequencies.forEach((f, k) => {
        const pick = (list: typeof nominal) => list.find((z) => z.hi === r.reading.hi && z.frequency_hz === f)!;
        const mags = [pick(nominal), ...bySample.map(pick)].map((z) => Math.hypot(z.re, z.im));
        const spread = spreads[i][k];
        expect(spread.nominal.re).toBeCloseTo(pick(nominal).re, 9);
        expect(spread.mag_min_ohm / Math.min(...mags)).toBeCloseTo(1, 9);
        expect(spread.mag_max_ohm / Math.max(...mags)).toBeCloseTo(1, 9);
        // The phases of all samples, measured from the nominal phase, lie inside the spread.
        const phase0 = Math.atan2(pick(nominal).im, pick(nominal).re);
        for (const z of bySample.map(pick)) {
          const dev = Math.atan2(Math.sin(Math.atan2(z.im, z.re) - phase0), Math.cos(Math.atan2(z.im, z.re) - phase0));
          expect(dev).toBeGreaterThanOrEqual(spread.phase_dev_min_rad - 1e-12);
          expect(dev).toBeLessThanOrEqual(spread.phase_dev_max_rad + 1e-12);
        }
      }),
    );
  });

  it('records the distribution-free coverage of an envelope of N samples, (N − 1)/(N + 1) (order statistics; common practice)', () => {
    expect(envelopeCoverage(200)).toBeCloseTo(199 / 201, 15);
    expect(envelopeCoverage(1)).toBe(0);
  });
});

describe('first-order bands against Monte Carlo for small tolerances', () => {
  // All tolerances 0.1 %: the response is then linear in the part values to a good approximation.
  const small: Board = { ...chain, parts: chain.parts.map((p) => ({ ...p, tolerance: 0.001 })) };
  const laplacian = new GroundedLaplacian(small);
  // Off the peak: at the peak |Z| is stationary and its spread is of second order (see below).
  const cases: [string, number][] = [['n1', 158e3], ['n3', 168e3], ['n2', 150e3], ['n12', 150e3], ['n24', 170e3]];
  const samples = drawToleranceSamples(small, { count: 3000, seed: 5 });

  it.each(cases)('%s at %d Hz: the quadrature σ of ln|Z| and of the phase match the sample standard deviations', (node, f) => {
    const solved = new ImpedanceSolver(laplacian).at(f);
    const sensitivity = readingSensitivities(laplacian, solved, toGround(node));
    const { logMag, phase } = firstOrderHalfWidths(sensitivity, 'quadrature');
    const z0 = sensitivity.z;
    const logs: number[] = [];
    const phases: number[] = [];
    for (const s of samples) {
      const z = new ImpedanceSolver(new GroundedLaplacian(boardWithSample(small, s))).at(f).toGround(node);
      logs.push(Math.log(Math.hypot(z.re, z.im) / Math.hypot(z0.re, z0.im)));
      phases.push(Math.atan2(z.im * z0.re - z.re * z0.im, z.re * z0.re + z.im * z0.im));
    }
    // 3000 samples: the standard deviation is known to about 1.3 %; 5 % leaves room for the nonlinearity.
    expect(sd(logs) / (logMag / QUADRATURE_COVERAGE_FACTOR)).toBeGreaterThan(0.95);
    expect(sd(logs) / (logMag / QUADRATURE_COVERAGE_FACTOR)).toBeLessThan(1.05);
    expect(sd(phases) / (phase / QUADRATURE_COVERAGE_FACTOR)).toBeGreaterThan(0.95);
    expect(sd(phases) / (phase / QUADRATURE_COVERAGE_FACTOR)).toBeLessThan(1.05);
    // The worst case bounds every sample, to first order.
    const worst = firstOrderHalfWidths(sensitivity, 'worst-case');
    expect(Math.max(...logs.map(Math.abs))).toBeLessThanOrEqual(worst.logMag * 1.01);
    expect(Math.max(...phases.map(Math.abs))).toBeLessThanOrEqual(worst.phase * 1.01);
  });

  it('understates the magnitude spread on the peak itself, where |Z| is stationary in frequency and the first order vanishes', () => {
    const f = 163634.4; // the edge mode
    const solved = new ImpedanceSolver(laplacian).at(f);
    const sensitivity = readingSensitivities(laplacian, solved, toGround('n1'));
    const sigma = firstOrderHalfWidths(sensitivity, 'quadrature').logMag / QUADRATURE_COVERAGE_FACTOR;
    const z0 = Math.hypot(sensitivity.z.re, sensitivity.z.im);
    const logs = samples.slice(0, 1000).map((s) => {
      const z = new ImpedanceSolver(new GroundedLaplacian(boardWithSample(small, s))).at(f).toGround('n1');
      return Math.log(Math.hypot(z.re, z.im) / z0);
    });
    expect(sd(logs) / sigma).toBeGreaterThan(1.1);
  });
});
