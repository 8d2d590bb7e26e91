// Monte Carlo tolerance spreads: the board is solved nominally and once per tolerance sample (see
// tolerance-samples.ts for the assumed distribution), and every reading keeps the envelope of its sample
// values. The envelope of N independent samples covers a further draw with probability (N − 1)/(N + 1)
// (order statistics, distribution-free; common practice), which is the coverage the plan records.
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import type { Complex } from '../circuit/admittance.js';
import { evaluateSchedule, scheduleByFrequency, type ReadingRequest } from './tolerance-evaluate.js';
import { samplePartMap, type ToleranceSample } from './tolerance-samples.js';
import { SpreadAccumulator, type PointSpread } from './tolerance-spread.js';

/** Nominal predicted value of every point of every request. */
export function nominalValues(laplacian: GroundedLaplacian, requests: readonly ReadingRequest[]): Complex[][] {
  const out = requests.map((r) => new Array<Complex>(r.frequencies.length));
  evaluateSchedule(laplacian, requests, scheduleByFrequency(requests), (r, p, z) => (out[r][p] = z));
  return out;
}

export function monteCarloSpreads(laplacian: GroundedLaplacian, requests: readonly ReadingRequest[], samples: readonly ToleranceSample[]): PointSpread[][] {
  const schedule = scheduleByFrequency(requests);
  const nominal = nominalValues(laplacian, requests);
  const accumulators = nominal.map((row) => row.map((z) => new SpreadAccumulator(z)));
  for (const sample of samples) {
    evaluateSchedule(laplacian, requests, schedule, (r, p, z) => accumulators[r][p].add(z), samplePartMap(sample));
  }
  return accumulators.map((row) => row.map((a) => a.result()));
}

/** Probability that the envelope of `samples` draws covers one more draw: (N − 1)/(N + 1). */
export function envelopeCoverage(samples: number): number {
  return samples < 1 ? 0 : (samples - 1) / (samples + 1);
}
