// `topoprobe sim`: the simulated bench (switch matrix + analyzer + the physics of the board as built) on
// loopback TCP ports or on pseudo-terminal pairs, until interrupted.
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Command } from 'commander';
import { loadBoard } from '../board/load.js';
import { loadFixtureMap, writeFixtureMap } from '../instruments/fixture-map.js';
import { SimulatedBench, type BenchTiming } from '../../simulators/bench.js';
import { Misbehaviour } from '../../simulators/misbehaviour.js';
import { LOOPBACK, serveTcp, type RunningServer } from '../../simulators/serve/tcp-server.js';
import { servePty } from '../../simulators/serve/pty-server.js';
import type { SimulatedDevice } from '../../simulators/device.js';
import { EXIT, UsageError } from './exit-codes.js';
import { openTraffic, parseClosed, parseMisbehaviour, parseStuck, parseTerminator } from './sim-options.js';

interface SimOptions {
  board: string;
  fault: string[];
  seed: string;
  tcp?: string;
  pty?: boolean;
  fixture?: string;
  timing: string;
  noise?: string;
  stuck: string[];
  senseContacts?: boolean;
  closed?: string;
  traffic?: string;
  misbehave: string[];
  terminator: string;
  paceBaud?: string;
}

const collect = (value: string, previous: string[] = []) => [...previous, value];
export const DEFAULT_SIM_BOARD = 'shared/boards/chain-24.yaml';

export function simCommand(): Command {
  return new Command('sim')
    .description('start the simulated bench (switch matrix and impedance analyzer measuring a board as built) and serve it until interrupted')
    .option('--board <file>', 'the board on the simulated fixture', DEFAULT_SIM_BOARD)
    .option('--fault <REF=open|short|VALUE>', 'an assembly fault on the board as built, e.g. C_intra_3=open, L_tanka_5=2.2uH; repeatable', collect, [])
    .option('--tcp <port>', 'serve on 127.0.0.1: the analyzer on PORT, the switch matrix on PORT+1 (0 picks free ports)')
    .option('--pty', 'serve each instrument on a pseudo-terminal pair made by socat')
    .option('--fixture <file>', 'fixture map to use (default: the default map for the board, written to a temporary file)')
    .option('--seed <n>', 'seed of the measurement noise', '1')
    .option('--timing <mode>', 'realistic (relay operate 5 ms, 20 ms + 5 ms per average a reading) or instant', 'realistic')
    .option('--noise <relative>', 'relative noise of a reading (default 1e-4; 0 for none)')
    .option('--stuck <CH=open|closed>', 'a relay that ignores commands; repeatable', collect, [])
    .option('--sense-contacts', 'the matrix reads back its contacts: its queries report what the relays did, so a stuck relay shows')
    .option('--closed <CH,CH..>', 'relays already closed at start, as a crashed session may leave them, e.g. 1003,2000')
    .option('--traffic <file>', 'append every message each instrument receives (in) and sends (out) to this file, one line each')
    .option('--misbehave <TARGET:KIND[=ARGS]>', 'link trouble for reliability tests, e.g. analyzer:late=0.1:3000, switch:disconnect=50, both:errors=20; repeatable', collect, [])
    .option('--terminator <lf|crlf|cr>', 'response terminator (both accept any on input)', 'lf')
    .option('--pace-baud <baud>', 'with --pty: carry bytes no faster than a serial line at this rate, 10 bits a byte (a pty has no rate of its own)')
    .addHelpText(
      'after',
      `
On start it prints one JSON line on stdout, then serves until Ctrl-C or SIGTERM:
  {"analyzer":"<port or host:port>","switch":"<port or host:port>","fixture":"<path of the map in use>",...}

Examples:
  topoprobe sim --tcp 5025
  topoprobe sim --pty --fault C_intra_3=open
  topoprobe sim --tcp 0 --closed 1005,2000 --traffic bench.traffic
  topoprobe sim --board shared/boards/corner-8x8.yaml --tcp 0 --timing instant --noise 0`,
    )
    .action(async (options: SimOptions) => {
      process.exitCode = await runSim(options);
    });
}

async function runSim(options: SimOptions): Promise<number> {
  if (!options.pty === (options.tcp === undefined)) throw new UsageError('give exactly one of --tcp PORT or --pty');
  const seed = Number(options.seed);
  if (!Number.isSafeInteger(seed)) throw new UsageError(`--seed ${options.seed}: expected a whole number (at most 2^53 - 1 in size)`);
  const timing = options.timing as BenchTiming;
  if (timing !== 'realistic' && timing !== 'instant') throw new UsageError(`--timing ${options.timing}: expected realistic or instant`);
  let noise: number | undefined;
  if (options.noise !== undefined) {
    noise = Number(options.noise);
    if (!Number.isFinite(noise) || noise < 0 || noise > 1) throw new UsageError(`--noise ${options.noise}: expected a relative level from 0 to 1, e.g. 1e-4`);
  }
  let port = 0;
  if (options.tcp !== undefined) {
    // Loopback only, by design: a simulated bench is never offered to the network.
    if (/:|^\d+\.\d+\.\d+\.\d+$|[a-z]{2,}/i.test(options.tcp)) throw new UsageError(`--tcp ${options.tcp}: give a port only; the simulated bench listens on ${LOOPBACK} and nowhere else`);
    port = Number(options.tcp);
    if (!Number.isInteger(port) || port < 0 || port > 65534) throw new UsageError(`--tcp ${options.tcp}: expected a port number from 0 to 65534`);
  }
  const terminator = parseTerminator(options.terminator);
  let paceBaud: number | undefined;
  if (options.paceBaud !== undefined) {
    paceBaud = Number(options.paceBaud);
    if (!options.pty) throw new UsageError('--pace-baud goes with --pty');
    if (!Number.isInteger(paceBaud) || paceBaud < 50 || paceBaud > 4_000_000) throw new UsageError(`--pace-baud ${options.paceBaud}: expected a baud rate from 50 to 4000000, e.g. 115200`);
  }
  const stuck = parseStuck(options.stuck);
  const closedAtStart = options.closed === undefined ? [] : parseClosed(options.closed);
  const misbehaviour = parseMisbehaviour(options.misbehave, seed);

  const board = loadBoard(options.board);
  const fixture = options.fixture ? loadFixtureMap(options.fixture, board) : undefined;
  const bench = new SimulatedBench({
    board,
    faults: options.fault,
    fixture,
    seed,
    timing,
    stuck,
    senseContacts: options.senseContacts === true,
    closedAtStart,
    physics: noise === undefined ? undefined : { noise: { relative: noise, floor: noise === 0 ? 0 : undefined } },
  });
  const fixturePath = options.fixture
    ? path.resolve(options.fixture)
    : writeFixtureMap(bench.fixture, path.join(mkdtempSync(path.join(tmpdir(), 'topoprobe-sim-')), `${board.name}-fixture.yaml`));

  const traffic = options.traffic === undefined ? undefined : openTraffic(options.traffic);
  const serve = async (device: SimulatedDevice, which: 'analyzer' | 'switch', offset: number): Promise<RunningServer> => {
    const m = misbehaviour[which];
    const serveOptions = { terminator, misbehaviour: m ? new Misbehaviour(m) : undefined, onTraffic: traffic?.recorder(which) };
    if (options.pty) return servePty(device, { ...serveOptions, paceBaud, name: which });
    return serveTcp(device, port === 0 ? 0 : port + offset, serveOptions);
  };
  const servers: RunningServer[] = [];
  try {
    servers.push(await serve(bench.analyzer, 'analyzer', 0));
    servers.push(await serve(bench.switchMatrix, 'switch', 1));
  } catch (err) {
    await Promise.all(servers.map((s) => s.close()));
    traffic?.close();
    throw Object.assign(new Error((err as Error).message), { exitCode: EXIT.instrument });
  }
  const [analyzer, switchMatrix] = servers;
  process.stdout.write(
    JSON.stringify({
      analyzer: analyzer.endpoint,
      switch: switchMatrix.endpoint,
      fixture: fixturePath,
      board: board.name,
      transport: options.pty ? 'pty' : 'tcp',
      seed,
      faults: bench.faults.map((f) => f.text),
    }) + '\n',
  );
  process.stderr.write(`simulated bench for ${board.name} is running (${options.pty ? 'pseudo-terminals' : 'loopback TCP'}); Ctrl-C stops it\n`);

  const signal = await new Promise<NodeJS.Signals>((resolve) => {
    process.once('SIGINT', () => resolve('SIGINT'));
    process.once('SIGTERM', () => resolve('SIGTERM'));
  });
  await Promise.all(servers.map((s) => s.close()));
  traffic?.close();
  process.stderr.write('simulated bench stopped\n');
  return signal === 'SIGINT' ? EXIT.interrupted : EXIT.ok;
}
