// The scan of the memory benchmark, run in a process of its own (started by runner-memory.ts with
// --expose-gc) so that nothing the other benchmarks left behind is counted. Prints one JSON line.
// Arguments: the plan file, the number of readings.
import { loadBoard } from '../../src/board/index.js';
import { loadPlan } from '../../src/plan/read-plan.js';
import type { ScanPlan } from '../../src/plan/types.js';
import { CHAIN, runJob, simulatedBench } from './runner-bench.util.js';

const [planFile, readingsArg] = process.argv.slice(2);
const READINGS = Number(readingsArg ?? 1_000_000);
const SAMPLE_EVERY = 50_000;

const collect = (globalThis as { gc?: () => void }).gc ?? (() => undefined);
const memory = () => {
  const m = process.memoryUsage();
  return { rss: m.rss / 2 ** 20, heap: m.heapUsed / 2 ** 20 };
};

// The plan comes from a file, as with `topoprobe run`: one pass over the board's 24 nodes at 1000 frequencies,
// made by the parent (making it is the planner's work, not the runner's).
const board = loadBoard(CHAIN);
const template = loadPlan(planFile);
// Every step shares one points array: the plan, which a real plan this size would hold whole, stays small,
// so what is measured is the runner, the log and the bench.
const points = template.steps[0].points;
const steps = Array.from({ length: Math.ceil(READINGS / points.length) }, (_, i) => ({ ...template.steps[i % template.steps.length], step: i + 1, points }));
const plan: ScanPlan = { ...template, steps };
const bench = await simulatedBench(board, plan, 'instant');
collect();
const samples: { readings: number; rss: number; heap: number; live: number }[] = [];
const sample = (readings: number) => {
  const before = memory();
  collect();
  samples.push({ readings, rss: before.rss, heap: before.heap, live: memory().heap });
};
sample(0);
let readings = 0;
// Between the collected samples the resident set is read every 1000 readings, so the peak is not missed.
let peakRss = samples[0].rss;
const { ms, done } = await runJob(plan, bench, {
  log: true,
  timing: 'instant',
  each: (e) => {
    if (e.event !== 'reading') return;
    if (++readings % 1000 === 0) peakRss = Math.max(peakRss, process.memoryUsage.rss() / 2 ** 20);
    if (readings % SAMPLE_EVERY === 0) sample(readings);
  },
});
await bench.close();
process.stdout.write(JSON.stringify({ readings: done.readings, ms, samples, peakRss }) + '\n');
