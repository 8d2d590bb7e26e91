// Rank-one updated impedances against two independent computations: a fresh factorization of the board
// with the part changed (built the way the simulated bench builds a faulted board), and mathjs's dense
// inverse on a small board. Both must agree with the Sherman–Morrison update (J. Sherman, W. Morrison,
// Ann. Math. Stat. 21, 124 (1950)) to 1e-9 relative.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { loadBoard } from '../../../src/board/index.js';
import { GROUND, type Board, type Part } from '../../../src/board/types.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { partAdmittance, type Complex } from '../../../src/circuit/admittance.js';
import { buildBoardAsBuilt } from '../../../simulators/board-as-built.js';
import { parseFaults } from '../../../simulators/faults.js';
import { coupling, SolvedEntries, updatedReading, UpdatedEntries, bilinear, type NodePair } from '../../../src/analysis/rank-one.js';
import { admittanceChange, type PartChange } from '../../../src/analysis/diagnose-change.js';
import { mathjsAdmittanceMatrix } from '../../support/mathjs-admittance.js';
import { RankOneModel } from '../../../src/analysis/rank-one-model.js';
import { RefactorModel } from '../../../src/analysis/diagnose-refactor.js';
import { prepareScan } from '../../../src/analysis/diagnose-scan.js';
import { scanReadings } from '../../bench/diagnose-scan.util.js';
import { makeBoard } from '../../support/make-board.js';

const chain = loadBoard('shared/boards/chain-24.yaml');
const corner = loadBoard('shared/boards/corner-8x8.yaml');

function relativeError(a: Complex, b: Complex): number {
  return Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im);
}

/**
 * Relative error, except where the change makes a reading vanish (an open part cutting a transfer path
 * gives exactly 0): there it is taken against a millionth of the unchanged reading, the size of the
 * terms the update subtracts.
 */
function updateError(ours: Complex, fresh: Complex, unchanged: Complex): number {
  const scale = Math.max(Math.hypot(fresh.re, fresh.im), 1e-6 * Math.hypot(unchanged.re, unchanged.im));
  return Math.hypot(ours.re - fresh.re, ours.im - fresh.im) / scale;
}

/** The fault text the simulated bench takes for a change, in the part's own unit. */
function faultText(part: Part, change: PartChange): string {
  if (change.kind !== 'scale') return `${part.ref}=${change.kind}`;
  const unit = part.kind === 'C' ? 'F' : part.kind === 'L' ? 'H' : 'ohm';
  return `${part.ref}=${part.value * change.scale}${unit}`;
}

interface Probe {
  q: NodePair;
  p: NodePair;
  read: (s: ReturnType<ImpedanceSolver['at']>) => Complex;
}

/** Every node to ground, plus two-point and transfer readings between a few neighbours. */
function probes(board: Board, lap: GroundedLaplacian): Probe[] {
  const row = (n: string) => lap.index.row(n);
  const names = board.nodes.map((n) => n.name);
  const list: Probe[] = names.map((n) => ({ q: { plus: row(n), minus: -1 }, p: { plus: row(n), minus: -1 }, read: (s) => s.toGround(n) }));
  for (let i = 0; i + 2 < names.length; i += 5) {
    const [a, b, c] = [names[i], names[i + 1], names[i + 2]];
    const pair = { plus: row(a), minus: row(b) };
    list.push({ q: pair, p: pair, read: (s) => s.between(a, b) });
    list.push({ q: { plus: row(c), minus: -1 }, p: { plus: row(a), minus: -1 }, read: (s) => s.transfer(a, c) });
  }
  return list;
}

describe('Sherman–Morrison update of Z against a fresh factorization of the changed board', () => {
  const cases: [Board, string, number[]][] = [
    [chain, 'chain-24', [120e3, 163.6e3, 210e3]],
    [corner, 'corner-8x8', [95e3, 117.3e3, 140e3]],
  ];
  const changes: PartChange[] = [{ kind: 'scale', scale: 1.2 }, { kind: 'scale', scale: 0.1 }, { kind: 'open' }, { kind: 'short' }];
  for (const [board, name, frequencies] of cases) {
    it(`${name}: value ×1.2, ×0.1, open and short of several parts, every reading kind`, () => {
      const lap = new GroundedLaplacian(board);
      const solver = new ImpedanceSolver(lap);
      const refs = [board.parts[0].ref, board.parts[7].ref, board.parts[Math.floor(board.parts.length / 2)].ref, board.parts.at(-1)!.ref];
      const list = probes(board, lap);
      let worst = 0;
      let compared = 0;
      for (const f of frequencies) {
        const entries = new SolvedEntries(solver.at(f), lap.index.names);
        for (const ref of refs) {
          const part = board.parts.find((p) => p.ref === ref)!;
          const u = { plus: lap.index.row(part.nodes[0]), minus: lap.index.row(part.nodes[1]) };
          for (const change of changes) {
            const omega = 2 * Math.PI * f;
            const dy = admittanceChange(part, change, omega, partAdmittance(part, omega));
            const changed = buildBoardAsBuilt(board, parseFaults([faultText(part, change)], board));
            const fresh = new ImpedanceSolver(new GroundedLaplacian(changed)).at(f);
            for (const probe of list) {
              const c = coupling(entries, probe.q, probe.p, u);
              worst = Math.max(worst, updateError(updatedReading(c, dy), probe.read(fresh), c.base));
              compared++;
            }
          }
        }
      }
      expect(compared).toBeGreaterThan(100);
      expect(worst).toBeLessThan(1e-9);
    });
  }

  it('two changes in turn (UpdatedEntries) equal the board with both faults, factored afresh', () => {
    const lap = new GroundedLaplacian(chain);
    const f = 163.6e3;
    const omega = 2 * Math.PI * f;
    const first = chain.parts.find((p) => p.ref === 'C_intra_9')!;
    const second = chain.parts.find((p) => p.ref === 'L_tanka_5')!;
    const pair = (p: Part): NodePair => ({ plus: lap.index.row(p.nodes[0]), minus: lap.index.row(p.nodes[1]) });
    const base = new SolvedEntries(new ImpedanceSolver(lap).at(f), lap.index.names);
    const afterFirst = new UpdatedEntries(base, pair(first), admittanceChange(first, { kind: 'open' }, omega, partAdmittance(first, omega)));
    const dy2 = admittanceChange(second, { kind: 'scale', scale: 1.2 }, omega, partAdmittance(second, omega));
    const both = buildBoardAsBuilt(chain, parseFaults(['C_intra_9=open', `L_tanka_5=${22e-6 * 1.2}H`], chain));
    const fresh = new ImpedanceSolver(new GroundedLaplacian(both)).at(f);
    let worst = 0;
    for (const probe of probes(chain, lap)) {
      worst = Math.max(worst, relativeError(updatedReading(coupling(afterFirst, probe.q, probe.p, pair(second)), dy2), probe.read(fresh)));
    }
    expect(worst).toBeLessThan(1e-9);
  });
});

describe('Sherman–Morrison update against mathjs inv of the changed J', () => {
  // A small lossy LC ladder with a resistor across it; J is stamped and inverted by mathjs, independently
  // of the project's assembly and LU.
  const board = makeBoard('ladder', [
    ['L', 'x1', GROUND, 10e-6, 0.3],
    ['C', 'x1', 'x2', 22e-9, 0.05],
    ['L', 'x2', GROUND, 15e-6, 0.2],
    ['C', 'x2', 'x3', 10e-9],
    ['L', 'x3', GROUND, 22e-6, 0.4],
    ['R', 'x1', 'x3', 470],
    ['C', 'x3', GROUND, 4.7e-9, 0.1],
  ]);
  const names = board.nodes.map((n) => n.name);
  const omega = 2 * Math.PI * 250e3;

  const mathjsJ = (parts: readonly Part[]) => mathjsAdmittanceMatrix(parts, names, omega);

  for (const [index, scale] of [
    [1, 1.5],
    [5, 0.01],
    [2, 3.3],
  ] as const) {
    it(`every entry of Z after ${board.parts[index].ref} ×${scale} equals mathjs inv`, () => {
      const part = board.parts[index];
      const changedParts = board.parts.map((p, k) => (k === index ? { ...p, value: p.value * scale } : p));
      const Zref = math.inv(mathjsJ(changedParts)) as math.Matrix;
      const lap = new GroundedLaplacian(board);
      const entries = new SolvedEntries(new ImpedanceSolver(lap).at(omega / (2 * Math.PI)), lap.index.names);
      const u = { plus: lap.index.row(part.nodes[0]), minus: lap.index.row(part.nodes[1]) };
      const dy = admittanceChange(part, { kind: 'scale', scale }, omega, partAdmittance(part, omega));
      const after = new UpdatedEntries(entries, u, dy);
      let worst = 0;
      for (let i = 0; i < names.length; i++) {
        for (let k = 0; k < names.length; k++) {
          const ref = Zref.get([i, k]) as math.Complex;
          const ours = after.entry(lap.index.row(names[i]), lap.index.row(names[k]));
          worst = Math.max(worst, relativeError(ours, { re: ref.re, im: ref.im }));
          // The same entry through the reading form (e_i, e_k) must agree with the entry form.
          const viaReading = updatedReading(
            coupling(entries, { plus: lap.index.row(names[i]), minus: -1 }, { plus: lap.index.row(names[k]), minus: -1 }, u),
            dy,
          );
          worst = Math.max(worst, relativeError(viaReading, { re: ref.re, im: ref.im }));
        }
      }
      expect(worst).toBeLessThan(1e-9);
    });
  }

  it('the unchanged bilinear form is mathjs inv of J itself', () => {
    const Zref = math.inv(mathjsJ(board.parts)) as math.Matrix;
    const lap = new GroundedLaplacian(board);
    const entries = new SolvedEntries(new ImpedanceSolver(lap).at(omega / (2 * Math.PI)), lap.index.names);
    // Two-point impedance between x1 and x3: (e1 - e3)ᵀ Z (e1 - e3) = Z11 + Z33 - 2 Z13 (common practice).
    const z = (i: number, k: number) => Zref.get([i, k]) as math.Complex;
    const expected = math.subtract(math.add(z(0, 0), z(2, 2)), math.multiply(2, z(0, 2))) as math.Complex;
    const pair = { plus: lap.index.row('x1'), minus: lap.index.row('x3') };
    expect(relativeError(bilinear(entries, pair, pair), { re: expected.re, im: expected.im })).toBeLessThan(1e-9);
  });
});

describe('the rank-one reading model against the refactoring reference model', () => {
  it('predicts the same readings for every kind of change on chain-24', () => {
    const readings = scanReadings(chain, {
      frequencies: [120e3, 163.6e3, 210e3],
      twoPoint: [['n3', 'n4']],
      transfer: [['n1', 'n3']],
    });
    const scan = prepareScan(chain, readings);
    const lap = new GroundedLaplacian(chain);
    const solver = new ImpedanceSolver(lap);
    const entries = scan.groups.map((g) => new SolvedEntries(solver.at(g.frequencyHz), lap.index.names));
    const parts = chain.parts.filter((_, k) => k % 6 === 0);
    const fast = new RankOneModel(scan, parts, entries);
    const reference = new RefactorModel(scan, parts, chain);
    const a = new Float64Array(2 * scan.readings.length);
    const b = new Float64Array(2 * scan.readings.length);
    const before = new Float64Array(2 * scan.readings.length);
    reference.nominal(before);
    let worst = 0;
    for (let k = 0; k < parts.length; k++) {
      for (const change of [{ kind: 'scale', scale: 0.37 }, { kind: 'scale', scale: 12 }, { kind: 'open' }, { kind: 'short' }] as PartChange[]) {
        fast.predict(k, change, a);
        reference.predict(k, change, b);
        for (let i = 0; i < scan.readings.length; i++) {
          const at = (v: Float64Array) => ({ re: v[2 * i], im: v[2 * i + 1] });
          worst = Math.max(worst, updateError(at(a), at(b), at(before)));
        }
      }
    }
    expect(worst).toBeLessThan(1e-9);
  });
});
