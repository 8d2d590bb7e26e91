// The fit recovers known values from noisy scans. The scans are the engine's readings of chain-24 with
// its parts changed in a known way (the board "as built"), plus seeded Gaussian noise of 0.1 % of |Z| on
// re and im, as the simulated bench adds it; the fit starts from the nominal board and never sees the
// changed one. The checks follow the usual reading of a standard uncertainty (common practice, GUM
// JCGM 100:2008, from memory): the true value lies within 3σ, and σ is as small as the scan allows.
import { describe, expect, it } from 'vitest';
import { loadBoard, parseBoardText } from '../../../src/board/index.js';
import { boardToYaml } from '../../../src/board/write-board.js';
import type { Board, Part } from '../../../src/board/types.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { fitBoard, type FitParameterResult } from '../../../src/analysis/fit.js';
import type { Reading } from '../../../src/analysis/readings.js';
import { GaussianNoise } from '../../../simulators/bench-physics-noise.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const NOISE = 1e-3;

function asBuilt(board: Board, change: (part: Part, k: number) => Part): Board {
  return { ...board, parts: board.parts.map(change) };
}

/** To-ground readings of every node (or of `nodes`) at `count` frequencies, plus seeded noise. */
function scan(built: Board, seed: number, options: { nodes?: string[]; count?: number; from?: number; to?: number } = {}): Reading[] {
  const solver = new ImpedanceSolver(new GroundedLaplacian(built));
  const noise = new GaussianNoise(seed);
  const nodes = options.nodes ?? built.nodes.map((n) => n.name);
  const count = options.count ?? 24;
  const from = options.from ?? 120e3;
  const to = options.to ?? 210e3;
  const readings: Reading[] = [];
  for (let i = 0; i < count; i++) {
    const f = from + ((to - from) * i) / (count - 1);
    const solved = solver.at(f);
    for (const node of nodes) {
      const z = solved.toGround(node);
      const sigma = NOISE * Math.hypot(z.re, z.im);
      readings.push({
        step: i, point: readings.length, kind: 'to-ground', hi: node, lo: 'gnd', frequency_hz: f,
        re: z.re + sigma * noise.next(), im: z.im + sigma * noise.next(), pred_re: 0, pred_im: 0, flag: 'ok',
      });
    }
  }
  return readings;
}

function parameter(result: { parameters: FitParameterResult[] }, label: string): FitParameterResult {
  const found = result.parameters.find((p) => p.label === label || p.ref === label);
  expect(found, label).toBeDefined();
  return found!;
}

describe('global parameters of chain-24', () => {
  const TRUE_SCALE = 1.03;
  const TRUE_R = 0.4; // ohms, where the board states Q = 50 at 100 kHz (276 mΩ)
  const built = asBuilt(chain, (p) => (p.kind === 'C' ? { ...p, value: p.value * TRUE_SCALE } : p.kind === 'L' ? { ...p, esr: TRUE_R } : p));
  const readings = scan(built, 11);

  it('recovers a capacitance scale of 1.03 and a coil resistance of 0.4 Ω within 3σ', () => {
    const fit = fitBoard(chain, readings, { capacitanceScale: true, inductorResistance: { form: 'ohms' } });
    expect(fit.converged, fit.message).toBe(true);
    const scale = parameter(fit, 'capacitance scale');
    const r = parameter(fit, 'inductor series resistance');
    expect(Math.abs(scale.value - TRUE_SCALE)).toBeLessThan(3 * scale.sigma);
    expect(Math.abs(r.value - TRUE_R)).toBeLessThan(3 * r.sigma);
    // Plausibly small: 576 readings at 0.1 % noise pin a global scale far below the 5 % tolerance.
    expect(scale.relativeSigma).toBeGreaterThan(0);
    expect(scale.relativeSigma).toBeLessThan(1e-4);
    expect(r.relativeSigma).toBeLessThan(1e-2);
    // The noise estimated from the residuals is the noise put in.
    expect(fit.noise.source).toBe('estimated');
    expect(fit.noise.relative / NOISE).toBeGreaterThan(0.9);
    expect(fit.noise.relative / NOISE).toBeLessThan(1.1);
    // The nominal board is far outside that: the fit moved.
    expect(Math.abs(scale.nominal - TRUE_SCALE)).toBeGreaterThan(100 * scale.sigma);
  });

  it('recovers the same loss as a Q at 100 kHz, Q = ωL/R (common practice)', () => {
    const fit = fitBoard(chain, readings, { capacitanceScale: true, inductorResistance: { form: 'q', atHz: 100e3 } });
    expect(fit.converged, fit.message).toBe(true);
    const q = parameter(fit, 'inductor Q at 100 kHz');
    const trueQ = (2 * Math.PI * 100e3 * 22e-6) / TRUE_R;
    expect(Math.abs(q.value - trueQ)).toBeLessThan(3 * q.sigma);
    expect(q.nominal).toBeCloseTo(50, 9); // what the board file states
  });

  it('with the noise given, the residual variance is near 1 (χ²/dof of a correct model; common practice)', () => {
    const fit = fitBoard(chain, readings, { capacitanceScale: true, inductorResistance: { form: 'ohms' } }, { noise: { relative: NOISE } });
    expect(fit.noise.source).toBe('given');
    // dof ≈ 1150, so χ²/dof scatters by about √(2/dof) ≈ 0.04 around 1.
    expect(Math.abs(fit.residualVariance - 1)).toBeLessThan(0.15);
    expect(fit.degreesOfFreedom).toBe(2 * readings.length - 2);
  });

  it('returns the fitted board, with its unit cell scaled alike', () => {
    const fit = fitBoard(chain, readings, { capacitanceScale: true, inductorResistance: { form: 'ohms' } });
    const scale = parameter(fit, 'capacitance scale').value;
    const r = parameter(fit, 'inductor series resistance').value;
    fit.board.parts.forEach((part, k) => {
      const nominal = chain.parts[k];
      if (part.kind === 'C') expect(part.value).toBeCloseTo(nominal.value * scale, 20);
      if (part.kind === 'L') {
        expect(part.value).toBe(nominal.value);
        expect(part.esr).toBe(r);
      }
    });
    const cell = fit.board.lattice!.cellParts.find((p) => p.kind === 'C')!;
    expect(cell.value / chain.lattice!.cellParts.find((p) => p.kind === 'C')!.value).toBeCloseTo(scale, 12);
    // The design is untouched.
    expect(chain.parts[0].value).toBe(10e-9);
    // And the fitted board survives a board file: the loader reads back exactly the fitted values.
    const back = parseBoardText(boardToYaml(fit.board), 'fitted.yaml');
    expect(back.parts.map((p) => [p.ref, p.value, p.esr])).toEqual(fit.board.parts.map((p) => [p.ref, p.value, p.esr]));
  });
});

describe('all parts of chain-24', () => {
  // Parts spread as a real series does: seeded Gaussian deviations, 2 % for the capacitors, 3 % for the
  // inductors (inside their 5 % and 10 % tolerances).
  const draw = new GaussianNoise(5);
  const truth = chain.parts.map((p) => p.value * (1 + (p.kind === 'C' ? 0.02 : 0.03) * draw.next()));
  const built = asBuilt(chain, (p, k) => ({ ...p, value: truth[k] }));

  it('recovers every part within 4σ and the spread of each kind', () => {
    const fit = fitBoard(chain, scan(built, 12), { allParts: true });
    expect(fit.converged, fit.message).toBe(true);
    for (const [k, part] of chain.parts.entries()) {
      const p = parameter(fit, part.ref);
      expect(Math.abs(p.value - truth[k]) / p.sigma, part.ref).toBeLessThan(4);
      expect(p.relativeSigma).toBeLessThan(0.01);
    }
    for (const kind of ['C', 'L'] as const) {
      const deviations = chain.parts.flatMap((p, k) => (p.kind === kind ? [truth[k] / p.value - 1] : []));
      const mean = deviations.reduce((s, d) => s + d, 0) / deviations.length;
      const std = Math.sqrt(deviations.reduce((s, d) => s + (d - mean) ** 2, 0) / (deviations.length - 1));
      const spread = fit.spread!.find((s) => s.kind === kind)!;
      expect(spread.counted).toBe(deviations.length);
      expect(spread.spread / std).toBeGreaterThan(0.95);
      expect(spread.spread / std).toBeLessThan(1.05);
      expect(spread.meanDeviation).toBeCloseTo(mean, 2);
      expect(spread.tolerance).toBe(kind === 'C' ? 0.05 : 0.1);
      expect(spread.spreadToTolerance).toBeCloseTo(std / spread.tolerance!, 2);
    }
    // The fitted board carries each part's own value, so the unit cell no longer describes it.
    expect(fit.board.lattice).toBeUndefined();
  });

  it('stays sane when the readings cannot see most parts: those stay near nominal and say so', () => {
    // Only the first four nodes are read; the far end of the chain is barely coupled to them.
    const seen = ['n1', 'n2', 'n3', 'n4'];
    const fit = fitBoard(chain, scan(built, 13, { nodes: seen }), { allParts: true });
    expect(fit.converged, fit.message).toBe(true);
    const far = chain.parts.filter((p) => p.nodes.every((n) => n === 'gnd' || Number(n.slice(1)) >= 20));
    expect(far.length).toBeGreaterThan(3);
    for (const part of far) {
      const p = parameter(fit, part.ref);
      expect(Math.abs(p.value / part.value - 1), part.ref).toBeLessThan(part.tolerance!);
      // Its uncertainty is about the prior's width, the tolerance: the readings add little.
      expect(p.relativeSigma, part.ref).toBeGreaterThan(part.tolerance! / 3);
    }
    const near = parameter(fit, 'L_tanka_0');
    expect(near.relativeSigma).toBeLessThan(0.01);
    for (const s of fit.spread!) expect(s.counted).toBeLessThan(s.parts);
  });
});

describe('a fit that does not converge', () => {
  const built = asBuilt(chain, (p) => (p.kind === 'C' ? { ...p, value: p.value * 1.15 } : p.kind === 'L' ? { ...p, value: p.value * 0.9 } : p));
  const readings = scan(built, 14, { count: 12 });
  const spec = { capacitanceScale: true, inductanceScale: true, inductorResistance: { form: 'ohms' } } as const;

  it('says so plainly when it runs out of steps', () => {
    const fit = fitBoard(chain, readings, spec, { maxIterations: 2 });
    expect(fit.converged).toBe(false);
    expect(fit.stop).toBe('iteration-limit');
    expect(fit.iterations).toBe(2);
    expect(fit.message).toMatch(/^did not converge/);
    expect(fit.message).toMatch(/not a fit result/);
    expect(fit.message).not.toMatch(/\n/);
    // It still returns what it has, with numbers, not a crash.
    for (const p of fit.parameters) expect(Number.isFinite(p.value)).toBe(true);
    // Given the steps, the same fit gets there.
    const full = fitBoard(chain, readings, spec);
    expect(full.converged, full.message).toBe(true);
    expect(parameter(full, 'capacitance scale').value).toBeCloseTo(1.15, 3);
    expect(parameter(full, 'inductance scale').value).toBeCloseTo(0.9, 3);
    expect(Math.abs(parameter(fit, 'capacitance scale').value - 1.15)).toBeGreaterThan(1e-4);
  });
});
