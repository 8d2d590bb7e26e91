// The scan of the memory benchmark, run in a process of its own (started by runner-memory.ts with
// --expose-gc) so that nothing the other benchmarks left behind is counted. Prints one JSON line.
import { loadBoard } from '../../src/board/index.js';
import type { ScanPlan } from '../../src/plan/types.js';
import { testPlan } from '../run/support/test-plan.js';
import { CHAIN, runJob, simulatedBench } from './runner-bench.util.js';

const READINGS = Number(process.argv[2] ?? 1_000_000);
const POINTS_PER_STEP = 1000;
const SAMPLE_EVERY = 50_000;

const collect = (globalThis as { gc?: () => void }).gc ?? (() => undefined);
const memory = () => {
  const m = process.memoryUsage();
  return { rss: m.rss / 2 ** 20, heap: m.heapUsed / 2 ** 20 };
};

const board = loadBoard(CHAIN);
const frequencies = Array.from({ length: POINTS_PER_STEP }, (_, i) => 100e3 + i * 100);
const template = testPlan(board, { frequencies, steps: board.nodes.map((n) => ({ hi: n.name })) });
// Every step shares one points array: the plan, which a real plan this size would hold whole, stays small,
// so what is measured is the runner, the log and the bench.
const points = template.steps[0].points;
const steps = Array.from({ length: Math.ceil(READINGS / POINTS_PER_STEP) }, (_, i) => ({ ...template.steps[i % template.steps.length], step: i + 1, points }));
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
const { ms, done } = await runJob(plan, bench, {
  log: true,
  timing: 'instant',
  each: (e) => {
    if (e.event === 'reading' && ++readings % SAMPLE_EVERY === 0) sample(readings);
  },
});
await bench.close();
process.stdout.write(JSON.stringify({ readings: done.readings, ms, samples }) + '\n');
