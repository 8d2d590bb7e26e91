// The one-line wording of candidates and verdicts, kept apart from the search so that the diagnose verb
// and the reports print the same sentences.
import { UNIT_OF_KIND } from '../board/part-values.js';
import { formatQuantity } from '../units/format.js';
import { describeDecades } from './e-series.js';
import type { Candidate, FixtureCandidate, PartCandidate, PartPair, Verdict } from './diagnose-types.js';

export function percent(share: number): string {
  return `${(100 * share).toFixed(1)} %`;
}

export function describePart(c: Omit<PartCandidate, 'summary'>): string {
  return `${partFinding(c)}, explains ${percent(c.share)}`;
}

/** What is fitted to the part, without the share: "C_intra_3 (n7–n8): open (missing or not soldered)". */
export function partFinding(c: Omit<PartCandidate, 'summary'>): string {
  const unit = UNIT_OF_KIND[c.kind];
  const change = c.change;
  let what: string;
  switch (change.kind) {
    case 'value': {
      const off = change.decades !== 0 ? describeDecades(change.decades) : `×${change.scale.toPrecision(3)}`;
      what =
        `${formatQuantity(change.value, unit, 3)} fitted where ${formatQuantity(c.nominal, unit, 3)} placed ` +
        `(${off}; nearest ${change.nearest.series} value ${formatQuantity(change.nearest.value, unit, 3)})`;
      break;
    }
    case 'open':
      what = `open (missing or not soldered)`;
      break;
    case 'short':
      what = `shorted (${c.nodes[0]} bridged to ${c.nodes[1]})`;
      break;
  }
  return `${c.ref} (${c.nodes[0]}–${c.nodes[1]}): ${what}`;
}

export function describeFixture(c: Omit<FixtureCandidate, 'summary'>): string {
  const what =
    c.change.kind === 'series-resistance'
      ? `${formatQuantity(c.change.ohms, 'ohm', 3)} in series`
      : `contact open (${formatQuantity(c.change.farads, 'F', 2)} across the gap)`;
  return `${c.ref}: ${what} on its ${c.readings} readings, explains ${percent(c.share)}`;
}

export function fixtureName(node: string, path: 'hi' | 'lo'): string {
  return `fixture at node ${node} (${path.toUpperCase()} path)`;
}

export function describeVerdict(verdict: Verdict, leader: Candidate | undefined, pair: PartPair | undefined): string {
  switch (verdict) {
    case 'as-designed':
      return 'the readings agree with the board as designed, within the noise; nothing to blame';
    case 'single-part':
      return `one part explains the deviations: ${leader!.summary}`;
    case 'fixture':
      return `the deviations point at the test fixture rather than a part: ${leader!.summary}`;
    case 'several-faults':
      return (
        `no single part explains the deviations (best: ${leader!.summary}); ` +
        `two parts together explain ${percent(pair!.share)}: ${partFinding(pair!.first)}, and ${partFinding(pair!.second)}`
      );
    case 'unexplained': {
      const best = leader ? ` (best: ${leader.summary})` : '';
      const two = pair ? `; two parts together explain only ${percent(pair.share)}` : '';
      return `no single part or fixture path explains the deviations${best}${two}: look for several faults or a change of the board itself`;
    }
  }
}
