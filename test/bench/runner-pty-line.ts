// Readings per second over a pseudo-terminal at 115200 baud, through the real serialport stack, as a
// share of what the line can carry. `topoprobe sim --pty --pace-baud 115200` runs in its own process and
// paces both directions (a pty has no baud rate of its own): a message is handed on only when its last
// byte would have crossed a 115200 baud line, 10 bits a byte for 8N1 (common practice). The byte budget
// is honest arithmetic: every byte a reading costs, commands out and answers back with their terminators,
// counted at our end of the line, over the line's 11520 bytes a second. The session keeps one query
// outstanding at a time, so the two directions add up; 100 % would keep the line busy every moment. The
// raw driver loop (set frequency, read; relays closed once) over the same line is the reference.
import { SerialTransport, type Transport } from '../../src/instruments/index.js';
import { analyzerLink, switchLink } from '../../src/run/bench/instrument-link.js';
import { startBench } from '../../src/run/bench/connect-bench.js';
import { existsSync } from 'node:fs';
import { testPlan } from '../run/support/test-plan.js';
import { startSim } from '../support/sim-process.js';
import { printTable } from './timing.util.js';
import { chainBoard, median, profiles, runJob } from './runner-bench.util.js';

const BAUD = 115200;
const BITS_PER_BYTE = 10;
const TARGET_SHARE = 0.8;

/** Counts the bytes both ways through a transport. */
function counted(inner: Transport, tally: { bytes: number }): Transport {
  return {
    get endpoint() {
      return inner.endpoint;
    },
    get isOpen() {
      return inner.isOpen;
    },
    medium: inner.medium,
    open: () => inner.open(),
    close: () => inner.close(),
    onClose: (l) => inner.onClose(l),
    write: (data) => {
      tally.bytes += typeof data === 'string' ? Buffer.byteLength(data, 'latin1') : data.length;
      return inner.write(data);
    },
    onData: (receiver) =>
      inner.onData((chunk) => {
        tally.bytes += chunk.length;
        receiver(chunk);
      }),
  };
}

export async function run(): Promise<void> {
  if (!['/usr/bin/socat', '/usr/local/bin/socat'].some((p) => existsSync(p))) {
    console.log('\nrunner over a pty: SKIPPED, socat is not installed');
    return;
  }
  const board = chainBoard();
  // Sweeps of 4 nodes over 60 frequencies: mostly readings and a few relay moves, as a plan's sweeps are.
  const frequencies = Array.from({ length: 60 }, (_, i) => 140e3 + i * 1e3);
  const plan = testPlan(board, { frequencies, steps: ['n1', 'n2', 'n12', 'n24'].map((hi) => ({ hi })) });
  const readings = plan.steps.length * frequencies.length;
  const sim = await startSim(['--pty', '--pace-baud', String(BAUD), '--timing', 'instant', '--board', 'shared/boards/chain-24.yaml']);
  const tally = { bytes: 0 };
  const p = profiles();
  const noSleep = { driver: { sleep: () => Promise.resolve() } };
  const line = (path: string) => counted(new SerialTransport({ path, baudRate: BAUD }), tally);
  const bench = {
    analyzer: analyzerLink(p.analyzer, line(sim.endpoints.analyzer), noSleep),
    switchMatrix: switchLink(p.switchMatrix, line(sim.endpoints.switch), noSleep),
    close: async () => undefined,
  };
  try {
    await startBench(bench);
    const shares: { raw: number[]; runner: number[] } = { raw: [], runner: [] };
    const rows: string[][] = [];
    const report = (what: 'raw' | 'runner', ms: number, n: number) => {
      const perReading = tally.bytes / n;
      const lineLimit = BAUD / BITS_PER_BYTE / perReading;
      const achieved = (n / ms) * 1000;
      shares[what].push(achieved / lineLimit);
      rows.push([what === 'raw' ? 'raw driver loop (reference)' : 'runner + scan log', perReading.toFixed(1), lineLimit.toFixed(1), achieved.toFixed(1), `${((100 * achieved) / lineLimit).toFixed(1)} %`]);
    };
    for (let round = 0; round < 3; round++) {
      await bench.switchMatrix.driver.openAll();
      await bench.switchMatrix.driver.close(plan.steps[0].channels);
      const a = bench.analyzer.driver;
      tally.bytes = 0;
      const t0 = performance.now();
      for (const point of plan.steps[0].points) {
        await a.setFrequency(point.frequency_hz);
        await a.measure();
      }
      report('raw', performance.now() - t0, plan.steps[0].points.length);
      await bench.switchMatrix.driver.openAll();
      tally.bytes = 0;
      const { ms, done } = await runJob(plan, bench, { log: true, timing: 'instant' });
      if (done.readings !== readings) throw new Error(`expected ${readings} readings, the run made ${done.readings}`);
      report('runner', ms, readings);
    }
    printTable(
      `over a pty paced at ${BAUD} baud (8N1: ${BAUD / BITS_PER_BYTE} bytes/s each way), ${readings} readings a run; target >= ${TARGET_SHARE * 100} % of the line`,
      ['', 'bytes/reading', 'line limit/s', 'readings/s', 'share'],
      rows,
    );
    const share = median(shares.runner);
    console.log(`runner: median ${(100 * share).toFixed(1)} % of the line (${share >= TARGET_SHARE ? 'meets' : 'BELOW'} the ${TARGET_SHARE * 100} % target); raw loop ${(100 * median(shares.raw)).toFixed(1)} %`);
  } finally {
    await bench.analyzer.close().catch(() => undefined);
    await bench.switchMatrix.close().catch(() => undefined);
    await sim.stop();
  }
}
