// Readings for the diagnosis tests and benchmark, made the way the simulated bench makes them: from the
// board AS BUILT (the design with injected faults, simulators/board-as-built.ts) through the engine, with
// seeded Gaussian noise on re and im (simulators/bench-physics-noise.ts). The predictions in the rows
// come from the design, as a plan's would. Not a benchmark module itself (*.util.ts).
import { GROUND, type Board } from '../../src/board/types.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import type { Complex } from '../../src/circuit/admittance.js';
import type { Reading, ReadingKind } from '../../src/analysis/readings.js';
import { buildBoardAsBuilt } from '../../simulators/board-as-built.js';
import { parseFaults } from '../../simulators/faults.js';
import { GaussianNoise } from '../../simulators/bench-physics-noise.js';

export interface ScanSetup {
  /** Faults as the simulated bench takes them: REF=open, REF=short, REF=VALUE. */
  faults?: string[];
  /** Frequencies of every step, Hz. */
  frequencies: number[];
  /** Relative standard deviation of the noise on re and im (of |Z|); default 1e-3. */
  noise?: number;
  seed?: number;
  /** Two-point steps between these node pairs, and transfer steps (drive, sense; lo ground). */
  twoPoint?: [string, string][];
  transfer?: [string, string][];
  /**
   * A fixture fault, not a board fault, on the HI path of one node: a resistance (ohms) in series with its
   * two-terminal readings, or an open contact bridged only by the capacitance across its gap (farads).
   */
  fixtureSeries?: { node: string; ohms?: number; gapFarads?: number };
}

interface Terminals {
  kind: ReadingKind;
  hi: string;
  lo: string;
  sense?: string;
}

/** To-ground steps at every node, then the two-point and transfer steps, each at every frequency. */
export function scanReadings(design: Board, setup: ScanSetup): Reading[] {
  const built = buildBoardAsBuilt(design, parseFaults(setup.faults ?? [], design));
  const steps: Terminals[] = [
    ...design.nodes.map((n) => ({ kind: 'to-ground' as const, hi: n.name, lo: GROUND })),
    ...(setup.twoPoint ?? []).map(([hi, lo]) => ({ kind: 'two-point' as const, hi, lo })),
    ...(setup.transfer ?? []).map(([hi, sense]) => ({ kind: 'transfer' as const, hi, lo: GROUND, sense })),
  ];
  const noise = new GaussianNoise(setup.seed ?? 1);
  const relative = setup.noise ?? 1e-3;
  const designSolver = new ImpedanceSolver(new GroundedLaplacian(design));
  const builtSolver = new ImpedanceSolver(new GroundedLaplacian(built));
  const readings: Reading[] = [];
  setup.frequencies.forEach((f, point) => {
    const planned = designSolver.at(f);
    const actual = builtSolver.at(f);
    steps.forEach((t, s) => {
      const read = (solved: typeof actual): Complex => (t.kind === 'transfer' ? solved.transfer(t.hi, t.sense!) : solved.between(t.hi, t.lo));
      const pred = read(planned);
      const z = read(actual);
      const fixture = setup.fixtureSeries;
      if (fixture && t.kind !== 'transfer' && t.hi === fixture.node) {
        z.re += fixture.ohms ?? 0;
        if (fixture.gapFarads) z.im -= 1 / (2 * Math.PI * f * fixture.gapFarads);
      }
      const size = Math.hypot(z.re, z.im);
      const re = z.re + relative * size * noise.next();
      const im = z.im + relative * size * noise.next();
      const off = Math.hypot(re - pred.re, im - pred.im) / Math.hypot(pred.re, pred.im);
      readings.push({
        step: s + 1,
        point: point + 1,
        ...t,
        frequency_hz: f,
        re,
        im,
        pred_re: pred.re,
        pred_im: pred.im,
        flag: off > 0.05 ? 'deviation' : 'ok',
      });
    });
  });
  return readings;
}

/** Three frequencies around a board's main resonance f0: below, at and above it. */
export function framingFrequencies(f0: number): number[] {
  return [0.8 * f0, f0, 1.25 * f0];
}
