// The plan's own estimate of its duration against the real duration of the run on the simulated bench
// with realistic timing (relays take 5 ms to operate, a reading 20 ms plus 5 ms per average, the drivers
// wait their profiles' settling times), in process. The plan is the planner's for the demo chain with
// the planner's defaults; the target is agreement within 10 %.
import { loadBoard } from '../../src/board/index.js';
import { builtinProfile, type AnalyzerProfile, type SwitchProfile } from '../../src/instruments/index.js';
import { derivePlan, DEFAULT_AVERAGES, DEFAULT_FLOOR } from '../../src/plan/index.js';
import { printTable } from './timing.util.js';
import { CHAIN, runJob, simulatedBench } from './runner-bench.util.js';

const TOLERANCE = 0.1;

export async function run(): Promise<void> {
  const board = loadBoard(CHAIN);
  const { plan } = derivePlan(board, {
    modes: { count: 2 },
    neighbours: true,
    transfer: true,
    bands: { method: 'first-order', combine: 'quadrature' },
    floor: DEFAULT_FLOOR,
    analyzer: { name: 'generic-analyzer', profile: builtinProfile('generic-analyzer') as AnalyzerProfile },
    switch: { name: 'generic-switch', profile: builtinProfile('generic-switch') as SwitchProfile },
    averages: DEFAULT_AVERAGES,
  });
  const bench = await simulatedBench(board, plan, 'realistic');
  let stepsWithMoves = 0;
  const { ms, done } = await runJob(plan, bench, { log: true, timing: 'realistic', each: (e) => void (e.event === 'step-started' && stepsWithMoves++) });
  await bench.close();
  const actual = ms / 1000;
  const estimate = plan.estimate.duration_s;
  const ratio = actual / estimate;
  printTable(
    `plan estimate against the simulated bench with realistic timing (${plan.board.name}: ${done.readings} readings, ${plan.steps.length} steps, ${plan.estimate.frequency_changes} frequency changes)`,
    ['estimate s', 'actual s', 'actual / estimate', `within ${TOLERANCE * 100} %`],
    [[estimate.toFixed(2), actual.toFixed(2), ratio.toFixed(3), Math.abs(ratio - 1) <= TOLERANCE ? 'yes' : 'NO']],
  );
  // Where the time goes that the estimate does not count: per step and per reading, beyond its model.
  const perReading = (actual - estimate) / done.readings;
  console.log(`unaccounted: ${(actual - estimate).toFixed(2)} s, ${(1000 * perReading).toFixed(2)} ms a reading over ${stepsWithMoves} steps`);
}
