// Band paths: sample layout and reciprocal-space lengths. Reference values are textbook geometry
// (common practice, e.g. Ashcroft & Mermin ch. 5, from memory): for a square lattice of spacing a,
// |Γ-X| = pi/a, |X-M| = pi/a, |M-Γ| = sqrt(2) pi/a; for a triangular lattice of spacing a the M point (half a
// reciprocal vector) lies at 2 pi / (sqrt(3) a) from Γ.
import { describe, expect, it } from 'vitest';
import { defaultBlochPath, pathMetric, samplePath } from '../../../src/predict/bloch-path.js';

describe('band paths', () => {
  it('samples Γ-X-M-Γ of a square lattice with labelled vertices and the right lengths', () => {
    const a = 0.8;
    const metric = pathMetric([[a, 0, 0], [0, a, 0]], 2);
    const samples = samplePath(defaultBlochPath(2), 10, metric);
    expect(samples.length).toBe(31);
    expect([0, 10, 20, 30].map((i) => samples[i].label)).toEqual(['Γ', 'X', 'M', 'Γ']);
    expect(samples.filter((s) => s.label !== undefined).length).toBe(4);
    expect(samples[10].distance).toBeCloseTo(Math.PI / a, 12);
    expect(samples[20].distance).toBeCloseTo((2 * Math.PI) / a, 12);
    expect(samples[30].distance).toBeCloseTo(((2 + Math.SQRT2) * Math.PI) / a, 12);
    expect(samples[15].theta[0]).toBeCloseTo(Math.PI, 12);
    expect(samples[15].theta[1]).toBeCloseTo(Math.PI / 2, 12);
  });

  it('uses the reciprocal metric of a non-orthogonal lattice', () => {
    const a = 1.3;
    const metric = pathMetric([[a, 0, 0], [a / 2, (Math.sqrt(3) * a) / 2, 0]], 2);
    const samples = samplePath([{ label: 'Γ', theta: [0, 0] }, { label: 'M', theta: [Math.PI, 0] }], 4, metric);
    expect(samples[4].distance).toBeCloseTo((2 * Math.PI) / (Math.sqrt(3) * a), 12);
  });

  it('ends the 3D default path at R = (pi, pi, pi)', () => {
    const path = defaultBlochPath(3);
    expect(path.map((p) => p.label)).toEqual(['Γ', 'X', 'M', 'Γ', 'R']);
    expect(path[4].theta).toEqual([Math.PI, Math.PI, Math.PI]);
  });

  it('rejects mismatched phase vectors and bad sample counts', () => {
    const metric = pathMetric([[1, 0, 0]], 1);
    expect(() => samplePath([{ label: 'a', theta: [0] }, { label: 'b', theta: [1, 2] }], 4, metric)).toThrow(RangeError);
    expect(() => samplePath(defaultBlochPath(1), 0, metric)).toThrow(RangeError);
  });
});
