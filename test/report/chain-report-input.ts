// A realistic report input built the way a scan of our chain-24 board would produce it: predictions from
// the engine on the design, "measured" values from the engine on the board as built with C_intra_0 left
// open (simulators/board-as-built.ts), seeded noise of 1e-3 relative, bands around the predictions, one
// reading lost to an overload (invalid), and the diagnosis run on the readings. Not a test file itself.
import { loadBoard } from '../../src/board/index.js';
import { GROUND, type Board } from '../../src/board/types.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import type { Complex } from '../../src/circuit/admittance.js';
import { predictModes } from '../../src/predict/modes.js';
import { diagnose } from '../../src/analysis/diagnose.js';
import type { Reading, ReadingKind } from '../../src/analysis/readings.js';
import { buildBoardAsBuilt } from '../../simulators/board-as-built.js';
import { parseFaults } from '../../simulators/faults.js';
import { GaussianNoise } from '../../simulators/bench-physics-noise.js';
import type { ReportBand, ReportFit, ReportInput } from '../../src/report/report-input.js';

export const FAULT = 'C_intra_0=open';
/** Design resonance of every node of chain-24: 1 / (2π √(22 µH · 43 nF)) (the board file's own comment; common practice). */
export const F0 = 1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9));
export const SWEPT_NODES = ['n1', 'n2', 'n12'];
export const TRANSFER_DRIVE = 'n3';
/** The reading lost to an overload: step and point. */
export const INVALID_AT = { node: 'n20' };

interface Step {
  kind: ReadingKind;
  hi: string;
  lo: string;
  sense?: string;
  frequencies: number[];
}

/** Band around a prediction: |Z| within ×0.8 … ×1.25, phase within ±12° (a stand-in for the plan's tolerance bands). */
function bandAround(step: number, point: number, z: Complex): ReportBand {
  const mag = Math.hypot(z.re, z.im);
  const phase = (Math.atan2(z.im, z.re) * 180) / Math.PI;
  const wrap = (d: number) => ((((d + 180) % 360) + 360) % 360) - 180;
  return { step, point, mag_lo_ohm: mag * 0.8, mag_hi_ohm: mag * 1.25, phase_lo_deg: wrap(phase - 12), phase_hi_deg: wrap(phase + 12) };
}

function inBand(re: number, im: number, b: ReportBand): boolean {
  const mag = Math.hypot(re, im);
  const phase = (Math.atan2(im, re) * 180) / Math.PI;
  const width = b.phase_hi_deg >= b.phase_lo_deg ? b.phase_hi_deg - b.phase_lo_deg : b.phase_hi_deg - b.phase_lo_deg + 360;
  const offset = (((phase - b.phase_lo_deg) % 360) + 360) % 360;
  return mag >= b.mag_lo_ohm && mag <= b.mag_hi_ohm && offset <= width;
}

export function chainReportInput(): ReportInput {
  const board = loadBoard('shared/boards/chain-24.yaml');
  const design = new ImpedanceSolver(new GroundedLaplacian(board));
  const built = new ImpedanceSolver(new GroundedLaplacian(buildBoardAsBuilt(board, parseFaults([FAULT], board))));
  const mode = predictModes(new GroundedLaplacian(board), { count: 1, near: F0 }).modes[0];
  const sweep = Array.from({ length: 29 }, (_, i) => 140e3 * (190e3 / 140e3) ** (i / 28));
  const names = board.nodes.map((n) => n.name);
  const steps: Step[] = [
    ...names.map((hi) => ({ kind: 'to-ground' as const, hi, lo: GROUND, frequencies: [mode.frequency_hz] })),
    ...SWEPT_NODES.map((hi) => ({ kind: 'to-ground' as const, hi, lo: GROUND, frequencies: sweep })),
    ...names.map((sense) => ({ kind: 'transfer' as const, hi: TRANSFER_DRIVE, lo: GROUND, sense, frequencies: [mode.frequency_hz] })),
  ];
  const noise = new GaussianNoise(7);
  const readings: Reading[] = [];
  const bands: ReportBand[] = [];
  steps.forEach((s, i) => {
    s.frequencies.forEach((f, j) => {
      const read = (solver: ImpedanceSolver): Complex => (s.kind === 'transfer' ? solver.at(f).transfer(s.hi, s.sense!) : solver.at(f).toGround(s.hi));
      const pred = read(design);
      const z = read(built);
      const size = Math.hypot(z.re, z.im);
      const re = z.re + 1e-3 * size * noise.next();
      const im = z.im + 1e-3 * size * noise.next();
      const band = bandAround(i + 1, j + 1, pred);
      bands.push(band);
      const lost = s.kind === 'to-ground' && s.hi === INVALID_AT.node && s.frequencies.length === 1;
      readings.push({
        step: i + 1,
        point: j + 1,
        kind: s.kind,
        hi: s.hi,
        lo: s.lo,
        sense: s.sense,
        frequency_hz: f,
        re: lost ? Number.NaN : re,
        im: lost ? Number.NaN : im,
        pred_re: pred.re,
        pred_im: pred.im,
        flag: lost ? 'invalid' : inBand(re, im, band) ? 'ok' : 'deviation',
      });
    });
  });
  const diagnosis = diagnose(board, readings, { noise: 1e-3 });
  // A fit result as the fit stage hands it over (values of our own: the shape is what is drawn here).
  const fit: ReportFit = {
    message: 'converged after 9 iterations; residuals near the noise',
    converged: true,
    parameters: [
      { label: 'capacitance scale', nominal: 1, value: 0.987, sigma: 0.004 },
      { label: 'inductance scale', nominal: 1, value: 1.021, sigma: 0.006 },
      { label: 'C_intra_0', ref: 'C_intra_0', unit: 'F', nominal: 10e-9, value: 0.2e-9, sigma: Infinity, identifiable: false },
      { label: 'L_tanka_3', ref: 'L_tanka_3', unit: 'H', nominal: 22e-6, value: 22.9e-6, sigma: 0.3e-6, identifiable: true },
    ],
    spread: [
      { kind: 'C', counted: 21, meanDeviation: -0.004, partSpread: 0.021, tolerance: 0.05, spreadToTolerance: 0.42, withinTolerance: 21 },
      { kind: 'L', counted: 24, meanDeviation: 0.012, partSpread: 0.047, tolerance: 0.1, spreadToTolerance: 0.47, withinTolerance: 23 },
    ],
  };
  return {
    board,
    readings,
    bands,
    modes: [mode],
    diagnosis,
    fit,
    meta: {
      started: '2025-03-14T09:12:05Z',
      ended: '2025-03-14T09:14:47Z',
      status: 'complete',
      instruments: [
        { role: 'analyzer', identity: 'TOPOPROBE,SIM-ANALYZER,0001,0.1.0', profile: 'sim-polar-analyzer', address: 'tcp://127.0.0.1:5025' },
        { role: 'switch', identity: 'TOPOPROBE,SIM-SWITCH,0002,0.1.0', profile: 'sim-slot-switch', address: 'tcp://127.0.0.1:5026' },
      ],
      software: { name: 'topoprobe', version: '0.1.0' },
      plan: { file: 'plans/chain-24-edge.yaml', sha256: 'a3f1c9d2e4b5a6978877665544332211ffeeddccbbaa00998877665544332211' },
      log: 'logs/chain-24-edge.csv',
      simulated: { faults: [FAULT], seed: 7 },
    },
  };
}

/** The same input with one node renamed everywhere (board, parts, readings, mode profile). */
export function renameNode(input: ReportInput, from: string, to: string): ReportInput {
  const swap = (n: string) => (n === from ? to : n);
  const board: Board = {
    ...input.board,
    nodes: input.board.nodes.map((n) => ({ ...n, name: swap(n.name) })),
    parts: input.board.parts.map((p) => ({ ...p, nodes: [swap(p.nodes[0]), swap(p.nodes[1])] })),
  };
  return {
    ...input,
    board,
    readings: input.readings.map((r) => ({ ...r, hi: swap(r.hi), lo: swap(r.lo), sense: r.sense === undefined ? undefined : swap(r.sense) })),
    modes: input.modes?.map((m) => ({ ...m, profile: Object.fromEntries(Object.entries(m.profile).map(([k, v]) => [swap(k), v])) })),
  };
}
