// The simulated bench's misbehaviour switches, seen from the product's own SCPI session over loopback TCP:
// each kind of trouble must reach the client as the failure it would be on real hardware.
import { afterEach, describe, expect, it } from 'vitest';
import { builtinProfile, parseAddress, sessionFor, transportFor, TransportError, type AnalyzerProfile, type ScpiSession } from '../../src/instruments/index.js';
import { startSim, type SimProcess } from '../support/sim-process.js';

let sim: SimProcess | undefined;
let session: ScpiSession | undefined;
afterEach(async () => {
  await session?.close();
  await sim?.stop();
  sim = undefined;
  session = undefined;
});

async function analyzerSession(misbehave: string[], timeoutMs = 1000): Promise<ScpiSession> {
  sim = await startSim(['--tcp', '0', '--timing', 'instant', ...misbehave.flatMap((m) => ['--misbehave', m])]);
  const profile = builtinProfile('generic-analyzer') as AnalyzerProfile;
  session = sessionFor(profile, transportFor(parseAddress(sim.endpoints.analyzer), profile), { timeoutMs });
  await session.open();
  return session;
}

describe('misbehaving simulated instruments over TCP', () => {
  it('spurious error-queue entries are drained as -200 Execution error (SCPI-99 vol. 2 (from memory))', async () => {
    const s = await analyzerSession(['analyzer:errors=2']);
    await s.write('FREQ 100k');
    await s.write('FREQ 120k');
    const errors = await s.drainErrors();
    expect(errors.map((e) => e.code)).toContain(-200);
  });

  it('a disconnect after N commands reaches the client as a closed connection', async () => {
    const s = await analyzerSession(['analyzer:disconnect=3']);
    await s.query('*IDN?');
    await s.query('*IDN?');
    const third = s.query('*IDN?').catch((e: unknown) => e);
    const fourth = await third.then(() => s.query('*IDN?').catch((e: unknown) => e));
    expect(fourth).toBeInstanceOf(TransportError);
    expect((fourth as TransportError).failure === 'closed' || (fourth as TransportError).failure === 'timeout').toBe(true);
  });

  it('a late answer times out with a one-line message naming the endpoint and the command', async () => {
    const s = await analyzerSession(['analyzer:late=1:3000', 'analyzer:spare=1'], 500);
    await s.query('*IDN?'); // spared: the first message of a connection is left alone
    const err = await s.query('FREQ?').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TransportError);
    expect((err as Error).message).toMatch(/127\.0\.0\.1:\d+/);
    expect((err as Error).message).toMatch(/FREQ\?/);
    expect((err as Error).message).not.toContain('\n');
  });

  it('garbage bytes are refused, with the hint of a wrong setting', async () => {
    const s = await analyzerSession(['analyzer:garbage=1:replace', 'analyzer:spare=1']);
    await s.query('*IDN?');
    const err = await s.query('FREQ?').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Error);
    expect((err as Error).message).toMatch(/garbage|unreadable|not ASCII|wrong/i);
    expect((err as { exitCode?: number }).exitCode).toBe(3);
  });

  it('dropped answers time out instead of hanging', async () => {
    const s = await analyzerSession(['analyzer:drop=1', 'analyzer:spare=1'], 400);
    await s.query('*IDN?');
    const err = await s.query('FREQ?').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TransportError);
    expect((err as TransportError).failure).toBe('timeout');
  });
});

describe('sim flags', () => {
  it.each([
    [['--tcp', '0', '--misbehave', 'analyzer:late'], /--misbehave analyzer:late: RATE must be a number/],
    [['--tcp', '0', '--misbehave', 'printer:drop=1'], /expected TARGET:KIND/],
    [['--tcp', '0', '--stuck', '5=maybe'], /--stuck 5=maybe/],
    [['--tcp', '0', '--pty'], /exactly one of --tcp PORT or --pty/],
    [['--tcp', '0', '--fault', 'C99=open'], /C99/],
    [['--tcp', '0', '--timing', 'slow'], /--timing slow/],
  ])('%j is refused with one line and exit 2', async (args, message) => {
    const { runCli } = await import('../support/run-cli.js');
    const r = runCli(['sim', ...(args as string[])]);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(message as RegExp);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
  });
});
