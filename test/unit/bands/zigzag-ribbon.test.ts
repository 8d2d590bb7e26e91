// Flat band of edge states on a honeycomb ribbon with zigzag edges.
// Source: M. Fujita, K. Wakabayashi, K. Nakada, K. Kusakabe, J. Phys. Soc. Jpn. 65, 1920 (1996); K. Nakada,
// M. Fujita, G. Dresselhaus, M. S. Dresselhaus, PRB 54, 17954 (1996): a zigzag ribbon has a band of edge
// states at zero energy for 2 pi/3 <= |k a| <= pi, exactly zero at k a = pi, none for |k a| < 2 pi/3.
//
// Circuit mapping (common practice): every site has total capacitance 3 Ct and L to ground, so with T(theta)
// the hopping (adjacency) matrix, C(theta) = Ct (3 I - T), K = I / L and a hopping eigenvalue tau sits at
// f = f0 sqrt(3 / (3 - tau)), f0 = 1 / (2 pi sqrt(3 L Ct)); tau = 0 maps to f0.
//
// Bounds used for the tolerances (derived here, numerical linear algebra common practice): at fixed theta the
// ribbon cross-section is a chain A1 B1 A2 B2 ... AW BW with in-chain coupling g, |g| = 2|cos(theta/2)|, between
// A_j and B_j and rung coupling 1 between B_j and A_{j+1}. In the sublattice basis T = [[0, M], [M^H, 0]],
// M = g-diagonal plus the unit shift N (||N|| = 1, singular values 1 (W-1 times) and 0), so T's eigenvalues
// are +-sigma(M) and by Weyl's inequality for singular values:
//  - |g| > 1 (|theta| < 2 pi/3): every sigma >= |g| - 1, no eigenvalue in (-(|g|-1), |g|-1);
//  - |g| < 1: all but the smallest sigma are >= 1 - |g|; the smallest is at most the residual of the trial
//    edge state a_j ~ (-g)^(j-1) on A (zero on B), which is |g|^W / ||a|| <= |g|^W.
import { describe, expect, it } from 'vitest';
import { blochMatrices, bandsAt } from '../../../src/predict/bloch-bands.js';
import { hermitianPencilModes } from '../../../src/numeric/hermitian-pencil.js';
import { zigzagRibbon } from './lattices.js';

const W = 12;
const Ct = 4.7e-9;
const L = 10e-6;
const a = 1;
const f0 = 1 / (2 * Math.PI * Math.sqrt(3 * L * Ct));
const ribbon = zigzagRibbon(W, Ct, L, a);
const edgeSites = ['A1', `B${W}`];
const g = (theta: number) => 2 * Math.abs(Math.cos(theta / 2));

/** The hopping eigenvalue a band frequency stands for: 1 / (L w^2) = Ct (3 - tau). */
const tauOf = (f: number) => 3 - 1 / (L * Ct * (2 * Math.PI * f) ** 2);

describe('zigzag honeycomb ribbon, W = 12', () => {
  it('has a uniform diagonal 3 Ct in C(theta) (edge sites compensated)', () => {
    const { n, capacitance } = blochMatrices(ribbon, [0.37]);
    expect(n).toBe(2 * W);
    for (let i = 0; i < n; i++) expect(capacitance.re[i * n + i] / (3 * Ct)).toBeCloseTo(1, 12);
  });

  it.each([0.72, 0.8, 0.9, 0.95, 1].map((x) => x * Math.PI))('theta = %f: two bands at f0 within |g|^W, localized on the edges', (theta) => {
    const { n, capacitance, inverseInductance } = blochMatrices(ribbon, [theta]);
    const modes = hermitianPencilModes(n, inverseInductance, capacitance);
    expect(modes.infinite).toBe(0);
    const f = Array.from(modes.omega2, (w2) => Math.sqrt(w2) / (2 * Math.PI));
    const tau = f.map(tauOf);
    const bound = g(theta) ** W + 1e-9; // + round-off of the eigen solver
    const near = tau.map((t, k) => [t, k] as const).filter(([t]) => Math.abs(t) <= bound);
    expect(near.length).toBe(2);
    // Every other band is at least 1 - |g| away in tau (Weyl bound above).
    tau.forEach((t) => Math.abs(t) > bound && expect(Math.abs(t)).toBeGreaterThanOrEqual(1 - g(theta) - 1e-9));
    for (const [, k] of near) {
      expect(Math.abs(f[k] / f0 - 1)).toBeLessThanOrEqual(Math.sqrt(3 / (3 - bound)) - 1);
      // Weight on the two edge sites: the semi-infinite edge state puts 1 - |g|^2 on its outermost site.
      let total = 0;
      let edge = 0;
      for (let i = 0; i < n; i++) {
        // column k of the n-by-n row-major result
        const p = modes.vectors.re[i * n + k] ** 2 + modes.vectors.im[i * n + k] ** 2;
        total += p;
        if (edgeSites.includes(ribbon.sites[i].name)) edge += p;
      }
      expect(edge / total).toBeGreaterThan(1 - g(theta) ** 2 - 0.02);
    }
  });

  it('is exactly at f0 and entirely on the two edge sites at theta = pi', () => {
    // g = 0: A1 and B_W decouple from everything (tau = 0 exactly); the rest pairs up into rungs at tau = +-1.
    const { n, capacitance, inverseInductance } = blochMatrices(ribbon, [Math.PI]);
    const modes = hermitianPencilModes(n, inverseInductance, capacitance);
    const f = Array.from(modes.omega2, (w2) => Math.sqrt(w2) / (2 * Math.PI));
    const at = f.map((x, k) => [x, k] as const).filter(([x]) => Math.abs(x / f0 - 1) < 1e-12);
    expect(at.length).toBe(2);
    for (const [, k] of at) {
      let edge = 0;
      let total = 0;
      for (let i = 0; i < n; i++) {
        const p = modes.vectors.re[i * n + k] ** 2 + modes.vectors.im[i * n + k] ** 2;
        total += p;
        if (edgeSites.includes(ribbon.sites[i].name)) edge += p;
      }
      expect(edge / total).toBeGreaterThan(1 - 1e-12);
    }
    const rest = f.filter((x) => Math.abs(x / f0 - 1) >= 1e-12).map(tauOf);
    for (const t of rest) expect(Math.abs(Math.abs(t) - 1)).toBeLessThan(1e-9);
  });

  it.each([0, 0.2, -0.35, 0.45, 0.55].map((x) => x * Math.PI))('theta = %f: no band within the |g| - 1 gap around f0', (theta) => {
    const m = g(theta) - 1; // > 0 for |theta| < 2 pi/3
    const f = bandsAt(ribbon, [theta]);
    expect(f.every(Number.isFinite)).toBe(true);
    const lo = f0 * Math.sqrt(3 / (3 + m));
    const hi = f0 * Math.sqrt(3 / (3 - m));
    for (const x of f) expect(x <= lo * (1 + 1e-12) || x >= hi * (1 - 1e-12)).toBe(true);
  });
});
