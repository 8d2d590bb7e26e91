// A 200-point frequency sweep of the impedance to ground at 20 nodes of a 10,000-node square LC lattice
// (10 nF bonds, 22 µH + 0.2 Ω to ground, 100–200 kHz, across the band where J's diagonal nearly cancels).
// One ImpedanceSolver analyzes the pattern once and refactors at every frequency (replaying the previous
// pivots while they hold); the reference re-analyzes and factors afresh at every frequency. Also shown:
// reading all 10,000 nodes per point by selected inversion instead of 20 solves.
import { pathToFileURL } from 'node:url';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import type { Complex } from '../../src/circuit/admittance.js';
import { lcLatticeBoard } from './all-node-impedance.js';
import { printTable } from './timing.util.js';

const POINTS = 200;
const PROBES = 20;
const START_HZ = 100e3;
const STOP_HZ = 200e3;
/** The reference is timed on every REFERENCE_STRIDE-th point and extrapolated to the whole sweep. */
const REFERENCE_STRIDE = 5;
const ALL_NODE_POINTS = 10;

export async function run(): Promise<void> {
  const lap = new GroundedLaplacian(lcLatticeBoard([100, 100]));
  const n = lap.index.size;
  const probes = Array.from({ length: PROBES }, (_, k) => lap.index.names[Math.floor(((k + 0.5) * n) / PROBES)]);
  const frequencies = Array.from({ length: POINTS }, (_, k) => START_HZ + ((STOP_HZ - START_HZ) * k) / (POINTS - 1));
  const read = (solver: ImpedanceSolver, hz: number) => {
    const solved = solver.at(hz);
    return probes.map((node) => solved.toGround(node));
  };
  read(new ImpedanceSolver(lap), frequencies[0]); // warm-up, untimed

  // Reusing the symbolic analysis: one solver for the whole sweep.
  const t0 = performance.now();
  const solver = new ImpedanceSolver(lap);
  const sweep: Complex[][] = frequencies.map((hz) => read(solver, hz));
  const reuseMs = performance.now() - t0;

  // Reference: analysis and fresh factorization at every frequency (a sample of points, extrapolated).
  const sampled = frequencies.map((_, k) => k).filter((k) => k % REFERENCE_STRIDE === 0);
  let worst = 0;
  const t1 = performance.now();
  for (const k of sampled) {
    const fresh = read(new ImpedanceSolver(lap), frequencies[k]);
    fresh.forEach((z, p) => {
      const ours = sweep[k][p];
      worst = Math.max(worst, Math.hypot(ours.re - z.re, ours.im - z.im) / Math.hypot(z.re, z.im));
    });
  }
  const referenceMs = ((performance.now() - t1) / sampled.length) * POINTS;

  // Every node per point by selected inversion, on the same reused solver.
  const t2 = performance.now();
  const allSolver = new ImpedanceSolver(lap);
  for (let k = 0; k < ALL_NODE_POINTS; k++) {
    allSolver.at(frequencies[Math.floor((k * POINTS) / ALL_NODE_POINTS)]).allToGround();
  }
  const allNodeMs = (performance.now() - t2) / ALL_NODE_POINTS;

  const perPoint = (t: number) => `${(t / POINTS).toFixed(1)} ms`;
  printTable(
    `${POINTS}-point sweep ${START_HZ / 1e3}–${STOP_HZ / 1e3} kHz, ${PROBES} nodes of a ${n}-node 2D LC lattice`,
    ['method', 'total', 'per point', 'ratio', 'note'],
    [
      ['reused analysis (ImpedanceSolver)', `${(reuseMs / 1000).toFixed(2)} s`, perPoint(reuseMs), '1×', 'all points'],
      [
        're-analyze every point',
        `${(referenceMs / 1000).toFixed(2)} s`,
        perPoint(referenceMs),
        `${(referenceMs / reuseMs).toFixed(2)}×`,
        `${sampled.length} points timed ×${REFERENCE_STRIDE}; max rel diff ${worst.toExponential(1)}`,
      ],
      [
        `all ${n} nodes per point (allToGround)`,
        `${((allNodeMs * POINTS) / 1000).toFixed(2)} s`,
        `${allNodeMs.toFixed(1)} ms`,
        `${((allNodeMs * POINTS) / reuseMs).toFixed(2)}×`,
        `${ALL_NODE_POINTS} points timed, extrapolated`,
      ],
    ],
  );
  // Per extra probe, the reused sweep pays one solve; allToGround pays a fixed amount for every node.
  const perProbe = reuseMs / POINTS / PROBES; // upper bound: includes the refactorization share
  const breakEven = (allNodeMs / perProbe).toFixed(0);
  console.log(`\nallToGround costs about as much as ${breakEven} probes read by solves at one point`);
}

// Also runnable on its own: npx tsx test/bench/sweep.ts
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  run().catch((err: unknown) => {
    console.error(err);
    process.exitCode = 1;
  });
}
