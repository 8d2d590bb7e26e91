// End to end through the serial path: `topoprobe sim --pty` in its own process (socat pseudo-terminals,
// the real serialport stack on both ends) and `topoprobe run --analyzer PTY --switch PTY` with the
// planner's own plan for the demo chain, bands from Monte Carlo over the part tolerances. A seeded fault
// is flagged near the part and not far from it; Ctrl-C leaves every relay open (asked of the matrix over
// its port), the excitation at its minimum and the log interrupted. (kill -9 and resume, 20 times in one
// scan: test/reliability/kills.test.ts.)
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { builtinProfile, ScpiSession, SerialTransport, sessionFor, type AnalyzerProfile } from '../../src/instruments/index.js';
import { toolAvailable } from '../support/requirements.js';
import { runCli } from '../support/run-cli.js';
import { startSim, type SimProcess } from '../support/sim-process.js';
import { loggedRows, planKeys, readMetaFile, startRun } from './support/run-process.js';

const run = toolAvailable('socat');
let dir: string;
let planFile: string;

/** Node number of a terminal (n13 -> 13); ground counts as far from everything. */
const nodeNumber = (name: string) => (name === 'gnd' ? Infinity : Number(name.slice(1)));

async function ask(port: string, profileName: 'generic-switch' | 'generic-analyzer', query: string): Promise<string> {
  const profile = builtinProfile(profileName);
  const session: ScpiSession = sessionFor(profile, new SerialTransport({ path: port, baudRate: 115200 }));
  await session.open();
  try {
    return await session.query(query);
  } finally {
    await session.close();
  }
}

describe.skipIf(!run)('run over pseudo-terminals', () => {
  beforeAll(() => {
    dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-run-pty-'));
    planFile = path.join(dir, 'chain-24.plan.json');
    const made = runCli(['plan', 'shared/boards/chain-24.yaml', '-o', planFile]);
    expect(made.status).toBe(0);
  });

  describe('a seeded fault (C_intra_0 open, between n1 and n2)', () => {
    let faulty: SimProcess;
    let clean: SimProcess;
    beforeAll(async () => {
      [faulty, clean] = await Promise.all([startSim(['--pty', '--timing', 'instant', '--fault', 'C_intra_0=open']), startSim(['--pty', '--timing', 'instant'])]);
    });
    afterAll(async () => {
      await faulty?.stop();
      await clean?.stop();
    });

    it('is flagged at the nodes it affects and not at far nodes; the same plan on a good board flags nothing', () => {
      const faultLog = path.join(dir, 'fault.csv');
      const r = runCli(['run', planFile, '--analyzer', faulty.endpoints.analyzer, '--switch', faulty.endpoints.switch, '--log', faultLog]);
      expect(r.status).toBe(1);
      const rows = loggedRows(faultLog);
      expect(rows.map((x) => `${x.step}:${x.point}`)).toEqual(planKeys(planFile));
      const flagged = rows.filter((x) => x.flag !== 'ok');
      // n1 carries the left edge mode, which the missing coupling to n2 destroys.
      expect(flagged.some((x) => x.hi === 'n1')).toBe(true);
      // Eleven cells away the edge mode has decayed by (10/33)^11 (Su, Schrieffer, Heeger, PRL 42, 1698 (1979), from memory): nothing there moves.
      const far = rows.filter((x) => [x.hi, x.lo, x.sense || 'gnd'].every((n) => nodeNumber(n) >= 13));
      expect(far.length).toBeGreaterThan(100);
      expect(far.filter((x) => x.flag !== 'ok')).toEqual([]);
      expect(readMetaFile(faultLog)).toMatchObject({ status: 'complete' });

      const cleanLog = path.join(dir, 'clean.csv');
      const ok = runCli(['run', planFile, '--analyzer', clean.endpoints.analyzer, '--switch', clean.endpoints.switch, '--log', cleanLog]);
      expect(ok.status).toBe(0);
      expect(loggedRows(cleanLog).filter((x) => x.flag !== 'ok')).toEqual([]);
    });
  });

  describe('Ctrl-C', () => {
    let sim: SimProcess;
    beforeAll(async () => {
      // Realistic timing: 20 ms + 5 ms per average a reading, so there is a scan to interrupt.
      sim = await startSim(['--pty', '--timing', 'realistic']);
    });
    afterAll(async () => {
      await sim?.stop();
    });

    it('leaves every relay open and the excitation at its minimum, the log interrupted, exit 130, even pressed twice', async () => {
      const log = path.join(dir, 'aborted.csv');
      const child = startRun([planFile, '--analyzer', sim.endpoints.analyzer, '--switch', sim.endpoints.switch, '--log', log, '--json']);
      const lines = await child.lines(6);
      expect(JSON.parse(lines[0]).event).toBe('started');
      child.child.kill('SIGINT');
      await new Promise((r) => setTimeout(r, 20));
      child.child.kill('SIGINT');
      const { code } = await child.exited;
      expect(code).toBe(130);
      expect(child.stderr().match(/stopping safely…/g)?.length).toBe(2);
      const events = child.stdout().trim().split('\n').map((l) => JSON.parse(l) as { event: string; status?: string; safe?: boolean });
      expect(events.at(-1)).toMatchObject({ event: 'done', status: 'interrupted', safe: true });
      const meta = readMetaFile(log);
      expect(meta.status).toBe('interrupted');
      const rows = loggedRows(log);
      expect(rows.length).toBe(meta.readings);
      expect(rows.length).toBeLessThan(planKeys(planFile).length);
      // Asked of the simulated matrix over its own port (SCPI ROUTe:CLOSe:LIST?, the closed channels).
      expect(await ask(sim.endpoints.switch, 'generic-switch', 'ROUTe:CLOSe:LIST?')).toBe('(@)');
      const minimum = (builtinProfile('generic-analyzer') as AnalyzerProfile).limits.levelV.min;
      expect(Number(await ask(sim.endpoints.analyzer, 'generic-analyzer', 'SOURce:VOLTage:LEVel?'))).toBe(minimum);
    });
  });
});
