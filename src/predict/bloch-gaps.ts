// Band gaps read off sampled bands: frequency windows where no band lives at any sampled phase.

export interface BandGap {
  /** Index (0-based, ascending frequency) of the band just below the gap. */
  band: number;
  /** Top of that band over the samples (Hz). */
  below_hz: number;
  /** Bottom of the next band over the samples (Hz). */
  above_hz: number;
}

/**
 * Gaps between consecutive bands: band b's maximum below band b+1's minimum. The frequencies of every
 * sample are sorted ascending, so band b lies pointwise under every higher band and these are all the
 * windows free of bands. They are only as good as the sampling: a sparse one can report a gap wider than the
 * true one (or one that a band crosses between samples). Infinite bands (sites without capacitance) have
 * no finite top, so no gap is reported above them. Windows narrower than `minRelativeWidth` of their upper
 * edge are taken for bands that touch, split only by round-off, and not reported.
 */
export function bandGaps(samples: readonly { frequencies_hz: readonly number[] }[], minRelativeWidth = 1e-9): BandGap[] {
  if (samples.length === 0) return [];
  const count = samples[0].frequencies_hz.length;
  const top = new Array<number>(count).fill(-Infinity);
  const bottom = new Array<number>(count).fill(Infinity);
  for (const s of samples) {
    if (s.frequencies_hz.length !== count) throw new RangeError('every sample must carry the same number of bands');
    s.frequencies_hz.forEach((f, b) => {
      top[b] = Math.max(top[b], f);
      bottom[b] = Math.min(bottom[b], f);
    });
  }
  const gaps: BandGap[] = [];
  for (let b = 0; b + 1 < count; b++) {
    if (Number.isFinite(top[b]) && Number.isFinite(bottom[b + 1]) && bottom[b + 1] - top[b] > minRelativeWidth * bottom[b + 1]) {
      gaps.push({ band: b, below_hz: top[b], above_hz: bottom[b + 1] });
    }
  }
  return gaps;
}
