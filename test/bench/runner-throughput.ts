// Readings per second through the simulated bench in process with zero latency (instant timing, drivers
// that do not sleep), the runner against the raw driver loop doing the same relay moves and readings
// without it: what the runner's pipeline, break-before-make checks, judging and logging cost.
import { loadBoard } from '../../src/board/index.js';
import { testPlan } from '../run/support/test-plan.js';
import { printTable } from './timing.util.js';
import { CHAIN, median, runJob, simulatedBench } from './runner-bench.util.js';

const TARGET_PER_S = 2000;

export async function run(): Promise<void> {
  const board = loadBoard(CHAIN);
  const frequencies = Array.from({ length: 100 }, (_, i) => 100e3 + i * 1e3);
  const plan = testPlan(board, { frequencies, steps: board.nodes.map((n) => ({ hi: n.name })) });
  const readings = plan.steps.length * frequencies.length;
  const bench = await simulatedBench(board, plan, 'instant');
  const raw: number[] = [];
  const runner: number[] = [];
  const logged: number[] = [];
  for (let round = 0; round < 4; round++) {
    const t0 = performance.now();
    const a = bench.analyzer.driver;
    const s = bench.switchMatrix!.driver;
    for (const step of plan.steps) {
      await s.openAll();
      await s.close(step.channels);
      for (const p of step.points) {
        await a.setFrequency(p.frequency_hz);
        await a.measure();
      }
    }
    raw.push(performance.now() - t0);
    runner.push((await runJob(plan, bench, { log: false, timing: 'instant' })).ms);
    logged.push((await runJob(plan, bench, { log: true, timing: 'instant' })).ms);
  }
  await bench.close();
  // The first round warms the JIT and the bench's caches; the median of the rest is reported.
  const rate = (ms: number[]) => (readings / median(ms.slice(1))) * 1000;
  const rows = [
    ['raw driver loop (reference)', rate(raw).toFixed(0), '1.00', ''],
    ['runner', rate(runner).toFixed(0), (rate(runner) / rate(raw)).toFixed(2), rate(runner) >= TARGET_PER_S ? 'meets' : 'BELOW'],
    ['runner + scan log', rate(logged).toFixed(0), (rate(logged) / rate(raw)).toFixed(2), rate(logged) >= TARGET_PER_S ? 'meets' : 'BELOW'],
  ];
  printTable(`runner throughput, zero-latency simulated bench in process (${readings} readings: 24 nodes x 100 frequencies; target >= ${TARGET_PER_S}/s)`, ['', 'readings/s', 'vs raw', `>= ${TARGET_PER_S}/s`], rows);
}
