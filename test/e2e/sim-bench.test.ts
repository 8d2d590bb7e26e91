// End to end: `topoprobe sim` as a separate process, talked to through the product's own instrument layer
// (profiles, drivers, SCPI session) over loopback TCP and over a real pseudo-terminal pair with the real
// serialport stack. The readings are checked against the engine (the simulated bench computes from the
// board as built, so with noise off a fault-free board must read what the engine predicts, up to the
// fixture's small contact and lead resistances).
import { realpathSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadBoard } from '../../src/board/index.js';
import { GroundedLaplacian } from '../../src/circuit/laplacian.js';
import { ImpedanceSolver } from '../../src/circuit/impedance.js';
import { GROUND } from '../../src/board/types.js';
import { loadFixtureMap } from '../../src/instruments/fixture-map.js';
import {
  analyzerDriver,
  builtinProfile,
  parseAddress,
  sessionFor,
  switchDriver,
  transportFor,
  type AnalyzerProfile,
  type ScpiSession,
  type SwitchProfile,
} from '../../src/instruments/index.js';
import { toolAvailable } from '../support/requirements.js';
import { startSim, type SimProcess } from '../support/sim-process.js';

const BOARD = 'shared/boards/chain-24.yaml';
const board = loadBoard(BOARD);
const solver = new ImpedanceSolver(new GroundedLaplacian(board));
// Common practice: the ground-cancelling frequency of a node with 43 nF against 22 uH.
const f0 = 1 / (2 * Math.PI * Math.sqrt(22e-6 * 43e-9));
const mag = (z: { re: number; im: number }) => Math.hypot(z.re, z.im);

async function connect(sim: SimProcess) {
  const aProfile = builtinProfile('generic-analyzer') as AnalyzerProfile;
  const sProfile = builtinProfile('generic-switch') as SwitchProfile;
  const aSession = sessionFor(aProfile, transportFor(parseAddress(sim.endpoints.analyzer), aProfile));
  const sSession = sessionFor(sProfile, transportFor(parseAddress(sim.endpoints.switch), sProfile));
  await aSession.open();
  await sSession.open();
  const analyzer = analyzerDriver(aProfile, aSession);
  const matrix = switchDriver(sProfile, sSession);
  await analyzer.start();
  await matrix.start();
  const map = loadFixtureMap(sim.endpoints.fixture, board);
  return { analyzer, matrix, map, sessions: [aSession, sSession] as ScpiSession[] };
}

for (const transport of ['tcp', 'pty'] as const) {
  const run = transport === 'tcp' || toolAvailable('socat');
  describe.skipIf(!run)(`the simulated bench over ${transport}`, () => {
    let sim: SimProcess;
    let bench: Awaited<ReturnType<typeof connect>>;
    beforeAll(async () => {
      sim = await startSim([transport === 'tcp' ? '--tcp=0' : '--pty', '--timing', 'instant', '--noise', '0', '--board', BOARD]);
      bench = await connect(sim);
    });
    afterAll(async () => {
      for (const s of bench?.sessions ?? []) await s.close();
      expect(await sim?.stop()).toBe(130);
    });

    it('prints its endpoints and the fixture map in use', () => {
      expect(sim.endpoints.transport).toBe(transport);
      if (transport === 'tcp') expect(sim.endpoints.analyzer).toMatch(/^127\.0\.0\.1:\d+$/);
      // A pty end is offered under a fixed link name (it comes back there after a replug), pointing at the pty.
      else expect(realpathSync(sim.endpoints.analyzer)).toMatch(/^\/dev\/pts\/\d+$/);
      expect(sim.endpoints.fixture).toMatch(/fixture\.yaml$/);
    });

    it('node-to-ground readings match the engine, break before make', async () => {
      const { analyzer, matrix, map } = bench;
      await analyzer.setFunction('impedance');
      for (const node of ['n1', 'n2', 'n12']) {
        await matrix.openAll();
        const channels = [map.channel(node, 'hi')!, map.channel(GROUND, 'lo')!];
        await matrix.close(channels);
        expect(await matrix.closedStates(channels)).toEqual([true, true]);
        for (const f of [150e3, f0]) {
          await analyzer.setFrequency(f);
          const z = await analyzer.measure();
          expect(z).not.toBe('invalid');
          const expected = solver.at(f).toGround(node);
          // contact (2 x 0.15 ohm) and lead resistances add well under an ohm; strays of 15 pF barely move 43 nF
          expect(Math.abs(mag(z as { re: number; im: number }) - mag(expected))).toBeLessThan(0.01 * mag(expected) + 1);
        }
      }
      await matrix.openAll();
    });

    it('the edge node reads the impedance peak at f0', async () => {
      const { analyzer, matrix, map } = bench;
      await analyzer.setFrequency(f0);
      const read = async (node: string) => {
        await matrix.openAll();
        await matrix.close([map.channel(node, 'hi')!, map.channel(GROUND, 'lo')!]);
        return mag((await analyzer.measure()) as { re: number; im: number });
      };
      expect(await read('n1')).toBeGreaterThan(100 * (await read('n12')));
      await matrix.openAll();
    });

    it('nothing connected reads as an invalid (overload) reading', async () => {
      await bench.matrix.openAll();
      expect(await bench.analyzer.measure()).toBe('invalid');
    });

    it('a transfer reading maps the edge mode with its sign', async () => {
      // Drive n1, sense n3: the edge mode has ratio -v/w = -10/33 per cell (Su, Schrieffer, Heeger, PRL 42, 1698 (1979), from memory),
      // so the voltage at n3 is about -0.3 of n1's, in antiphase.
      const { analyzer, matrix, map } = bench;
      await analyzer.setFrequency(f0);
      await analyzer.setFunction('transfer');
      await matrix.openAll();
      await matrix.close([map.channel('n1', 'hi')!, map.channel(GROUND, 'lo')!, map.channel('n3', 'sense')!]);
      const t = (await analyzer.measure()) as { re: number; im: number };
      const expected = solver.at(f0).transfer('n1', 'n3');
      expect(Math.abs(t.re - expected.re)).toBeLessThan(0.01 * mag(expected) + 1);
      const z11 = solver.at(f0).toGround('n1');
      expect(t.re / z11.re).toBeCloseTo(-10 / 33, 1);
      await analyzer.setFunction('impedance');
      await matrix.openAll();
    });

    it('a bad command is answered from the error queue', async () => {
      const [aSession] = bench.sessions;
      await aSession.write('FREQuency 20MHz');
      await aSession.write('NO:SUCH:COMMand');
      const errors = await aSession.drainErrors();
      // SCPI-99 vol. 2 error codes (from memory): -222 Data out of range, -113 Undefined header
      expect(errors.map((e) => e.code)).toEqual([-222, -113]);
    });
  });
}

describe('a seeded fault on the board as built', () => {
  let sim: SimProcess;
  let bench: Awaited<ReturnType<typeof connect>>;
  beforeAll(async () => {
    sim = await startSim(['--tcp', '0', '--timing', 'instant', '--noise', '0', '--fault', 'C_intra_0=open']);
    bench = await connect(sim);
  });
  afterAll(async () => {
    for (const s of bench?.sessions ?? []) await s.close();
    await sim?.stop();
  });

  it('moves the reading at the faulty part and not far from it', async () => {
    const { analyzer, matrix, map } = bench;
    await analyzer.setFrequency(f0);
    const read = async (node: string, f = f0) => {
      await analyzer.setFrequency(f);
      await matrix.openAll();
      await matrix.close([map.channel(node, 'hi')!, map.channel(GROUND, 'lo')!]);
      return mag((await analyzer.measure()) as { re: number; im: number });
    };
    const predicted = (node: string, f = f0) => mag(solver.at(f).toGround(node));
    // C_intra_0 joins n1 and n2: with it open the edge peak at n1 collapses
    expect(await read('n1')).toBeLessThan(0.2 * predicted('n1'));
    // the middle of the chain is far from it (and from the other edge's mode)
    // (at 150 kHz, in the lower band, where a bulk node reads ohms, well above the fixture's own fraction of one)
    for (const node of ['n11', 'n12', 'n13']) {
      expect(predicted(node, 150e3)).toBeGreaterThan(5);
      expect(Math.abs((await read(node, 150e3)) - predicted(node, 150e3))).toBeLessThan(0.02 * predicted(node, 150e3) + 1);
    }
    expect(sim.endpoints.faults).toEqual(['C_intra_0=open']);
  });
});
