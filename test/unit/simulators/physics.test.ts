// The simulated analyzer's readings against the engine and against closed forms. Every number the bench
// returns is computed from the board as built through the closed relays; these checks hold it to
// textbook circuit theory (named beside each check) and to the engine on the same board.
import { describe, expect, it } from 'vitest';
import { loadBoard } from '../../../src/board/index.js';
import { GROUND } from '../../../src/board/types.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { defaultFixtureMap, loadFixtureMap } from '../../../src/instruments/fixture-map.js';
import { NO_PARASITICS } from '../../../simulators/bench-physics.js';
import { buildBoardAsBuilt } from '../../../simulators/board-as-built.js';
import { parseFaults } from '../../../simulators/faults.js';
import { makeBoard } from '../../support/make-board.js';
import { testBench, type TestBench, relativeError, closeOnly } from '../../support/physics-bench.js';


const chain = loadBoard('shared/boards/chain-24.yaml');
const chainMap = defaultFixtureMap(chain);
// Default map (contract): hi = 1000 + k, lo = 2000 + k, sense = 3000 + k; ground hi 1000, lo 2000, sense 3000.
const HI = (k: number) => 1000 + k;
const SENSE = (k: number) => 3000 + k;
const GND_LO = 2000;
const FREQUENCIES = [50e3, 100e3, 163.6e3, 250e3, 1e6];
const TINY = 1e-6; // ohms: an "ideal" relay contact

describe('IMPedance to ground against the engine (chain-24, default map)', () => {
  it('with a tiny contact resistance equals ImpedanceSolver.toGround at every node', () => {
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS, contactResistance: TINY });
    for (const f of FREQUENCIES) {
      const engine = new ImpedanceSolver(new GroundedLaplacian(chain)).at(f);
      for (let k = 1; k <= 24; k++) {
        closeOnly(bench, HI(k), GND_LO);
        // The reference is the engine on the same board without the fixture (the two 1 µΩ contacts taken
        // off); 1e-6 relative leaves room for the digits such tiny contacts cost near a resonance.
        const z = bench.value(f);
        expect(relativeError({ re: z.re - 2 * TINY, im: z.im }, engine.toGround(`n${k}`))).toBeLessThan(1e-6);
      }
    }
  });

  it('with 0.15 Ω contacts reads exactly 2 × 0.15 Ω more (two contacts in series, common practice)', () => {
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS, contactResistance: 0.15 });
    for (const f of FREQUENCIES) {
      const engine = new ImpedanceSolver(new GroundedLaplacian(chain)).at(f);
      for (const k of [1, 2, 7, 13, 24]) {
        closeOnly(bench, HI(k), GND_LO);
        const z = bench.value(f);
        const ref = engine.toGround(`n${k}`);
        const scale = Math.hypot(ref.re, ref.im);
        expect(Math.abs(z.re - ref.re - 0.3)).toBeLessThan(1e-10 * scale + 1e-12);
        expect(Math.abs(z.im - ref.im)).toBeLessThan(1e-10 * scale + 1e-12);
      }
    }
  });

  it('the example fixture map wires the same nodes on other channels and reads the same', () => {
    const example = loadFixtureMap('shared/fixtures/chain-24.yaml', chain);
    const a = testBench(chain, chainMap, { ...NO_PARASITICS });
    const b = testBench(chain, example, { ...NO_PARASITICS });
    closeOnly(a, HI(5), GND_LO);
    closeOnly(b, example.channel('n5', 'hi')!, example.channel(GROUND, 'lo')!);
    // Same circuit, same arithmetic: the channel numbers must not matter.
    expect(b.value(163.6e3)).toEqual(a.value(163.6e3));
  });
});

describe('closed forms', () => {
  it('a single tank at resonance: Re Z = L/(rC), Im Z = -sqrt(L/C) (parallel LC with lossy L, common practice)', () => {
    const L = 22e-6;
    const C = 47e-9;
    const r = 0.4;
    const board = makeBoard('tank', [
      ['L', 't', GROUND, L, r],
      ['C', 't', GROUND, C],
    ]);
    const bench = testBench(board, { nodes: { t: { hi: 11, sense: 13 } }, gnd: { lo: 22 } }, { ...NO_PARASITICS, contactResistance: 0.15 });
    closeOnly(bench, 11, 22);
    const f0 = 1 / (2 * Math.PI * Math.sqrt(L * C));
    // (r + jw0L) / (jw0Cr) = L/(rC) - j/(w0C) exactly at w0 = 1/sqrt(LC); plus the two contacts.
    const z = bench.value(f0);
    const expected = { re: L / (r * C) + 0.3, im: -Math.sqrt(L / C) };
    expect(relativeError(z, expected)).toBeLessThan(1e-9);
  });

  it('a resistor divider: IMPedance adds contacts and leads, TRANsfer only the LO contact (Kelvin sensing, common practice)', () => {
    // R1 a-b 1 kΩ, R2 b-gnd 2 kΩ, R3 a-gnd 6 kΩ: Z(a) = 6k || 3k = 2 kΩ; V(b)/I = 2 kΩ · 2/3.
    const board = makeBoard('divider', [
      ['R', 'a', 'b', 1000],
      ['R', 'b', GROUND, 2000],
      ['R', 'a', GROUND, 6000],
    ]);
    const rc = 0.15;
    const rLead = 0.02;
    const lLead = 50e-9;
    const f = 10e3;
    const bench = testBench(board, { nodes: { a: { hi: 1 }, b: { sense: 3 } }, gnd: { lo: 2 } }, {
      ...NO_PARASITICS,
      contactResistance: rc,
      leadResistance: rLead,
      leadInductance: lLead,
    });
    closeOnly(bench, 1, 2, 3);
    const z = bench.value(f, 'impedance');
    expect(relativeError(z, { re: 2000 + 2 * rc + 2 * rLead, im: 2 * (2 * Math.PI * f) * lLead })).toBeLessThan(1e-10);
    // The current returns through the gnd LO contact, so the LO bus sits rc·I below ground.
    const t = bench.value(f, 'transfer');
    expect(relativeError(t, { re: (2000 * 2) / 3 + rc, im: 0 })).toBeLessThan(1e-10);
  });
});

describe('TRANsfer against the engine', () => {
  it('equals ImpedanceSolver.transfer(drive, sense) plus the LO contact (chain-24)', () => {
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS, contactResistance: TINY });
    for (const f of [100e3, 163.6e3, 250e3]) {
      const engine = new ImpedanceSolver(new GroundedLaplacian(chain)).at(f);
      for (const [drive, sense] of [
        [1, 3],
        [3, 5],
        [8, 7],
        [12, 20],
      ]) {
        closeOnly(bench, HI(drive), GND_LO, SENSE(sense));
        const t = bench.value(f, 'transfer');
        const ref = engine.transfer(`n${drive}`, `n${sense}`);
        expect(relativeError({ re: t.re - TINY, im: t.im }, ref)).toBeLessThan(1e-6);
      }
    }
  });
});

describe('board as built', () => {
  it('C_intra_3=open changes the reading at n7 and n8 and barely at nodes six or more away (decay in a band gap, common practice)', () => {
    const faulty = buildBoardAsBuilt(chain, parseFaults(['C_intra_3=open'], chain));
    const good = testBench(chain, chainMap, { ...NO_PARASITICS });
    const bad = testBench(faulty, chainMap, { ...NO_PARASITICS });
    // 100 kHz lies below the chain's lower band (f0 ≈ 163.6 kHz sits in the gap between bands): there a
    // local change decays exponentially along the chain.
    const f = 100e3;
    const change = (k: number) => {
      closeOnly(good, HI(k), GND_LO);
      closeOnly(bad, HI(k), GND_LO);
      return relativeError(bad.value(f), good.value(f));
    };
    expect(change(7)).toBeGreaterThan(0.05);
    expect(change(8)).toBeGreaterThan(0.05);
    for (const far of [1, 14, 20, 24]) expect(change(far)).toBeLessThan(1e-4);
  });
});

describe('relays', () => {
  it('two nodes on the HI bus read as merged (the engine with n3 and n4 joined by a tiny resistor)', () => {
    const joined = { ...chain, parts: [...chain.parts, { ref: 'Rjoin', kind: 'R' as const, nodes: ['n3', 'n4'] as [string, string], value: TINY, origin: 'test' }] };
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS, contactResistance: TINY });
    for (const f of [100e3, 163.6e3, 250e3]) {
      closeOnly(bench, HI(3), HI(4), GND_LO);
      const merged = new ImpedanceSolver(new GroundedLaplacian(joined)).at(f).toGround('n3');
      const alone = new ImpedanceSolver(new GroundedLaplacian(chain)).at(f).toGround('n3');
      expect(relativeError(bench.value(f), merged)).toBeLessThan(1e-5);
      // And it is not the single node's reading: the merge is real.
      expect(relativeError(bench.value(f), alone)).toBeGreaterThan(1e-2);
    }
  });

  it('overloads when nothing is closed, when HI or LO reaches nothing, or TRANsfer has no SENSE', () => {
    const bench = testBench(chain, chainMap, {});
    closeOnly(bench);
    expect(bench.read(100e3)).toBe('overload');
    closeOnly(bench, HI(3));
    expect(bench.read(100e3)).toBe('overload');
    closeOnly(bench, GND_LO, SENSE(3));
    expect(bench.read(100e3)).toBe('overload');
    closeOnly(bench, HI(3), GND_LO);
    expect(bench.read(100e3, 'transfer')).toBe('overload');
    expect(bench.read(100e3, 'impedance')).not.toBe('overload');
    // A channel the fixture does not wire joins nothing.
    closeOnly(bench, 9999, 1);
    expect(bench.read(100e3)).toBe('overload');
  });

  it('ignores channels the fixture does not wire', () => {
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS });
    closeOnly(bench, HI(3), GND_LO);
    const plain = bench.value(100e3);
    closeOnly(bench, HI(3), GND_LO, 9999, 4321);
    expect(bench.value(100e3)).toEqual(plain);
  });

  it('overloads outside the analyzer range (above 100 MΩ, below 1 mΩ)', () => {
    const high = makeBoard('high', [['R', 'x', GROUND, 1e9]]);
    const low = makeBoard('low', [['R', 'x', GROUND, 1e-5]]);
    const map = { nodes: { x: { hi: 1 } }, gnd: { lo: 2 } };
    const a = testBench(high, map, { ...NO_PARASITICS });
    const b = testBench(low, map, { ...NO_PARASITICS, contactResistance: 1e-7 });
    const c = testBench(high, map, { ...NO_PARASITICS, range: { maxOhms: 1e10 } });
    for (const bench of [a, b, c]) closeOnly(bench, 1, 2);
    expect(a.read(1e3)).toBe('overload');
    expect(b.read(1e3)).toBe('overload');
    // Within a wider range the same board reads 1 GΩ; 1e-6 relative, as a 0.15 Ω contact next to 1 GΩ
    // costs about nine digits of the nodal solve.
    expect(relativeError(c.value(1e3), { re: 1e9 + 0.3, im: 0 })).toBeLessThan(1e-6);
  });

  it('caches one circuit per relay state, least recently used dropped first', () => {
    const bench = testBench(chain, chainMap, { ...NO_PARASITICS, cacheSize: 2 });
    closeOnly(bench, HI(1), GND_LO);
    const first = bench.value(100e3);
    bench.value(120e3);
    expect(bench.physics.relayStatesCached).toBe(1);
    closeOnly(bench, HI(2), GND_LO);
    bench.value(100e3);
    closeOnly(bench, HI(3), GND_LO);
    bench.value(100e3);
    expect(bench.physics.relayStatesCached).toBe(2);
    closeOnly(bench, GND_LO, HI(1));
    // Rebuilt after eviction, the same state must give the same reading.
    expect(bench.value(100e3)).toEqual(first);
  });
});

// The fixture's own parts: each closed relay hangs a stray capacitance on its node, which pulls a
// tank's resonance down, f = 1 / (2π sqrt(L (C + Cs))) (common practice), and the leads add R + jωL.
const L = 22e-6;
const C = 43e-9;
// R || L || C: Im Z is zero exactly where wC = 1/(wL), and the series contacts add only to Re Z.
const tank = makeBoard('tank', [
  ['R', 't', GROUND, 10e3],
  ['L', 't', GROUND, L],
  ['C', 't', GROUND, C],
]);
const map = { nodes: { t: { hi: 1, lo: 4, sense: 3 } }, gnd: { hi: 5, lo: 2 } };

/** The frequency where Im Z changes sign, by bisection (Im Z > 0 below resonance, inductive). */
function zeroOfReactance(bench: TestBench, low: number, high: number): number {
  let a = low;
  let b = high;
  expect(bench.value(a).im).toBeGreaterThan(0);
  expect(bench.value(b).im).toBeLessThan(0);
  for (let i = 0; i < 80; i++) {
    const mid = (a + b) / 2;
    if (bench.value(mid).im > 0) a = mid;
    else b = mid;
  }
  return (a + b) / 2;
}

const resonance = (capacitance: number) => 1 / (2 * Math.PI * Math.sqrt(L * capacitance));

describe('stray capacitance of closed relays', () => {
  const strayCapacitance = 15e-12;

  it('with no stray the tank resonates at 1/(2π sqrt(LC))', () => {
    const bench = testBench(tank, map, { ...NO_PARASITICS, strayCapacitance: 0 });
    closeOnly(bench, 1, 2);
    expect(zeroOfReactance(bench, 150e3, 180e3) / resonance(C) - 1).toBeCloseTo(0, 10);
  });

  it('one closed relay on the node shifts it to 1/(2π sqrt(L(C + Cs)))', () => {
    const bench = testBench(tank, map, { ...NO_PARASITICS, strayCapacitance });
    closeOnly(bench, 1, 2);
    const f = zeroOfReactance(bench, 150e3, 180e3);
    expect(f / resonance(C + strayCapacitance) - 1).toBeCloseTo(0, 10);
    // First order: Δf/f = -Cs/(2C) (common practice).
    expect((f - resonance(C)) / resonance(C) / (-strayCapacitance / (2 * C))).toBeCloseTo(1, 3);
  });

  it('two closed relays on the node (HI and SENSE) add two strays; ground relays add none', () => {
    const bench = testBench(tank, map, { ...NO_PARASITICS, strayCapacitance });
    closeOnly(bench, 1, 2, 3, 5);
    expect(zeroOfReactance(bench, 150e3, 180e3) / resonance(C + 2 * strayCapacitance) - 1).toBeCloseTo(0, 10);
  });
});

describe('leads', () => {
  it('add 2(R + jωL) to IMPedance (both in series with the current, common practice)', () => {
    const resistor = makeBoard('r', [['R', 'x', GROUND, 50]]);
    const bench = testBench(resistor, { nodes: { x: { hi: 1 } }, gnd: { lo: 2 } }, {
      ...NO_PARASITICS,
      contactResistance: 0.1,
      leadResistance: 0.03,
      leadInductance: 80e-9,
    });
    closeOnly(bench, 1, 2);
    const f = 1e6;
    const z = bench.value(f);
    expect(z.re).toBeCloseTo(50 + 0.2 + 0.06, 10);
    expect(z.im).toBeCloseTo(2 * 2 * Math.PI * f * 80e-9, 10);
  });

  it('the defaults are small but not zero (0.15 Ω contacts, 15 pF strays, leads)', () => {
    const resistor = makeBoard('r', [['R', 'x', GROUND, 50]]);
    const ideal = testBench(resistor, { nodes: { x: { hi: 1 } }, gnd: { lo: 2 } }, { ...NO_PARASITICS });
    const real = testBench(resistor, { nodes: { x: { hi: 1 } }, gnd: { lo: 2 } }, { noise: { relative: 0, floor: 0 } });
    closeOnly(ideal, 1, 2);
    closeOnly(real, 1, 2);
    const a = ideal.value(1e6);
    const b = real.value(1e6);
    expect(a.re).toBeCloseTo(50.3, 10);
    expect(b.re).not.toBeCloseTo(a.re, 6);
    expect(b.im).not.toBeCloseTo(a.im, 6);
  });
});
