// Resident memory across a scan of 1,000,000 readings on the zero-latency simulated bench in process, log
// on, in a process of its own (runner-memory-scan.util.ts). The runner keeps counts, not readings, so
// what it holds must not grow with the scan: the live heap after a full collection is sampled every
// 50,000 readings alongside the resident set. Target: flat, and under 200 MB.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { ROOT } from '../support/run-cli.js';
import { writePlan } from '../../src/plan/write-plan.js';
import { testPlan } from '../run/support/test-plan.js';
import { chainBoard } from './runner-bench.util.js';
import { printTable } from './timing.util.js';

const READINGS = 1_000_000;
const LIMIT_MB = 200;

interface Sample {
  readings: number;
  rss: number;
  heap: number;
  live: number;
}

export async function run(): Promise<void> {
  const board = chainBoard();
  const frequencies = Array.from({ length: 1000 }, (_, i) => 100e3 + i * 100);
  const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-memory-'));
  const planFile = path.join(dir, 'chain-1000.plan.json');
  writePlan(testPlan(board, { frequencies, steps: board.nodes.map((n) => ({ hi: n.name })) }), planFile);
  const child = spawnSync(process.execPath, ['--expose-gc', '--import', 'tsx', path.join(ROOT, 'test/bench/runner-memory-scan.util.ts'), planFile, String(READINGS)], {
    cwd: ROOT,
    encoding: 'utf8',
    maxBuffer: 1 << 24,
  });
  rmSync(dir, { recursive: true, force: true });
  if (child.status !== 0) throw new Error(`the memory scan failed: ${child.stderr.trim().split('\n').slice(-3).join(' / ')}`);
  const result = JSON.parse(child.stdout.trim().split('\n').pop()!) as { readings: number; ms: number; samples: Sample[]; peakRss: number };
  if (result.readings !== READINGS) throw new Error(`expected ${READINGS} readings, the scan logged ${result.readings}`);
  const s = result.samples;
  const start = s[0];
  const peakRss = Math.max(result.peakRss, ...s.map((x) => x.rss));
  const secondHalf = s.filter((x) => x.readings >= READINGS / 2);
  const liveGrowth = secondHalf[secondHalf.length - 1].live - secondHalf[0].live;
  printTable(
    `memory over a ${READINGS.toLocaleString('en')}-reading scan, log on (${((READINGS / result.ms) * 1000).toFixed(0)} readings/s); target flat, under ${LIMIT_MB} MB`,
    ['readings', 'RSS MB', 'heap MB', 'live heap after GC MB'],
    s.filter((_, i) => i % 4 === 0 || i === s.length - 1).map((x) => [x.readings.toLocaleString('en'), x.rss.toFixed(1), x.heap.toFixed(1), x.live.toFixed(1)]),
  );
  console.log(
    `RSS before the scan ${start.rss.toFixed(1)} MB (the process with tsx, its libraries, the board and the plan loaded), peak ${peakRss.toFixed(1)} MB (read every 1000 readings) (${peakRss < LIMIT_MB ? 'under' : 'OVER'} ${LIMIT_MB} MB), ` +
      `the scan's share ${(peakRss - start.rss).toFixed(1)} MB; live heap ${start.live.toFixed(1)} -> ${s[s.length - 1].live.toFixed(1)} MB, ${liveGrowth >= 0 ? '+' : ''}${liveGrowth.toFixed(2)} MB over the second half (${Math.abs(liveGrowth) < 5 ? 'flat' : 'GROWING'})`,
  );
}
