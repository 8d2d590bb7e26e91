// Checks a logged scan against the board it was made on, from the log alone: the predictions are
// recomputed from the board snapshot in the log's metadata, each reading gets a first-order tolerance
// band (the parts' stated tolerances plus the measurement floor), and readings outside it are deviations.
// A logged prediction that disagrees with the recomputed one is reported too (a stale or foreign plan).
import { GroundedLaplacian } from '../circuit/laplacian.js';
import type { Board } from '../board/types.js';
import { firstOrderSpreads } from '../predict/tolerance-first-order.js';
import type { ReadingRequest } from '../predict/tolerance-evaluate.js';
import { bandFromSpread } from '../plan/reading-band.js';
import { readingInBand } from '../plan/band-membership.js';
import type { BandFloor, ReadingBand } from '../plan/types.js';
import type { Reading } from './readings.js';

export interface CheckedReading {
  reading: Reading;
  predicted: { re: number; im: number };
  band: ReadingBand;
  verdict: 'ok' | 'deviation' | 'invalid';
  /** |measured| / |predicted|. */
  ratio: number;
}

export interface ScanCheck {
  checked: CheckedReading[];
  deviations: CheckedReading[];
  invalid: number;
  /** Readings whose logged prediction differs from the recomputed one by more than 1e-6 relative. */
  stalePredictions: number;
}

export function checkScan(board: Board, readings: readonly Reading[], floor: BandFloor): ScanCheck {
  const laplacian = new GroundedLaplacian(board);
  // One request per terminal set, with all its frequencies: the spreads share factorizations per frequency.
  const keyOf = (r: Reading) => `${r.kind}|${r.hi}|${r.lo}|${r.sense ?? ''}`;
  const requests: ReadingRequest[] = [];
  const where: [number, number][] = [];
  const byKey = new Map<string, number>();
  for (const r of readings) {
    let i = byKey.get(keyOf(r));
    if (i === undefined) {
      i = requests.length;
      byKey.set(keyOf(r), i);
      requests.push({ reading: { kind: r.kind, hi: r.hi, lo: r.lo, ...(r.sense ? { sense: r.sense } : {}) }, frequencies: [] });
    }
    const freqs = requests[i].frequencies as number[];
    let p = freqs.indexOf(r.frequency_hz);
    if (p < 0) {
      p = freqs.length;
      freqs.push(r.frequency_hz);
    }
    where.push([i, p]);
  }
  const spreads = firstOrderSpreads(laplacian, requests, 'quadrature');
  let stalePredictions = 0;
  const checked = readings.map((reading, k) => {
    const [i, p] = where[k];
    const spread = spreads[i][p];
    const band = bandFromSpread(spread, floor);
    const predicted = { re: spread.nominal.re, im: spread.nominal.im };
    const scale = Math.hypot(predicted.re, predicted.im);
    if (Math.hypot(reading.pred_re - predicted.re, reading.pred_im - predicted.im) > 1e-6 * scale) stalePredictions++;
    const valid = Number.isFinite(reading.re) && Number.isFinite(reading.im) && reading.flag !== 'invalid';
    const verdict: CheckedReading['verdict'] = !valid ? 'invalid' : readingInBand(reading.re, reading.im, band) ? 'ok' : 'deviation';
    return { reading, predicted, band, verdict, ratio: valid ? Math.hypot(reading.re, reading.im) / scale : Number.NaN };
  });
  return {
    checked,
    deviations: checked.filter((c) => c.verdict === 'deviation'),
    invalid: checked.filter((c) => c.verdict === 'invalid').length,
    stalePredictions,
  };
}
