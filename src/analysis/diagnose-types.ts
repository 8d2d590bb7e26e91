// The shapes a diagnosis hands to its readers (the diagnose verb, reports): ranked explanations of the
// deviations in a set of readings, each with the share of the deviation it accounts for.
import type { PartKind } from '../board/types.js';
import type { CommonLeads } from './diagnose-leads.js';
import type { ESeriesMatch } from './e-series.js';

/** What happened to a part, as the diagnosis fits it. */
export type PartFinding =
  | {
      kind: 'value';
      /** Fitted value in the part's SI unit (F, H or Ω). */
      value: number;
      /** Fitted value over the placed (nominal) value. */
      scale: number;
      /** Preferred value nearest to the fitted one, from the series the part's tolerance implies. */
      nearest: ESeriesMatch;
      /** Whole decades off the placed value (33 nF where 3.3 nF was placed: 1), 0 for a plain drift. */
      decades: number;
    }
  | { kind: 'open' }
  /** The part bridged by a short of `ohms` (a solder bridge). */
  | { kind: 'short'; ohms: number };

/** What happened in the test fixture on one terminal path: outside the board, in series with it. */
export type FixtureFinding =
  /** A resistance in series with the path (a dirty or worn relay contact, a cracked joint at the pad). */
  | { kind: 'series-resistance'; ohms: number }
  /** The path open; only the capacitance across the gap (`farads`) still couples it. */
  | { kind: 'open-contact'; farads: number };

export type FixturePath = 'hi' | 'lo';

interface Explanation {
  /** Mean robust misfit per reading with this explanation applied (about 2 when only noise is left). */
  misfit: number;
  /**
   * 1 - misfit / misfit of the nominal board, both beyond what noise alone leaves: the part of the
   * deviation this explains (0 to 1).
   */
  share: number;
  /** One line for people: what is fitted and how much it explains. */
  summary: string;
}

export interface PartCandidate extends Explanation {
  subject: 'part';
  ref: string;
  kind: PartKind;
  nodes: [string, string];
  /** The placed (nominal) value in SI units. */
  nominal: number;
  change: PartFinding;
}

/** A pseudo-candidate: the deviations come from the fixture path of one node, not from the board. */
export interface FixtureCandidate extends Explanation {
  subject: 'fixture';
  /** "fixture at node n5 (HI path)". */
  ref: string;
  kind: 'fixture';
  node: string;
  path: FixturePath;
  change: FixtureFinding;
  /** How many readings pass through this path. */
  readings: number;
}

export type Candidate = PartCandidate | FixtureCandidate;

/** Two parts found one after the other (the second fitted on what the first leaves). */
export interface PartPair {
  first: PartCandidate;
  second: PartCandidate;
  misfit: number;
  share: number;
}

export type Verdict =
  /** The readings agree with the nominal board within the noise. */
  | 'as-designed'
  /** One part explains the deviations. */
  | 'single-part'
  /** A fixture path explains the deviations better than any part. */
  | 'fixture'
  /** No single part does, two parts together do. */
  | 'several-faults'
  /** Neither one part, nor the fixture, nor two parts explain the deviations. */
  | 'unexplained';

export interface Diagnosis {
  board: string;
  verdict: Verdict;
  /** One or two sentences saying what the verdict means for these readings. */
  message: string;
  /** Readings used, and skipped because they were flagged invalid. */
  readings: { used: number; skipped: number };
  /** Relative scatter of a single reading assumed for the misfit. */
  noise: number;
  /** Mean robust misfit per reading of the nominal board (seen through the common leads, if fitted). */
  nominalMisfit: number;
  /** The common fixture (series R and L, stray C) fitted to all two-terminal readings; see diagnose-leads.ts. */
  leads?: CommonLeads;
  /** The leading explanations, best first (parts and fixture paths ranked together). */
  candidates: Candidate[];
  /** Set when the greedy two-part search ran (no single explanation was enough). */
  pair?: PartPair;
  /** Other observations: near-ties between candidates, frequencies that could not be used. */
  notes: string[];
}

export interface DiagnoseOptions {
  /** Relative scatter (standard deviation) of re and im of a single reading; default 1e-3. */
  noise?: number;
  /** Absolute floor of a reading in ohms (fixture contacts and leads); default 0. See MisfitMeter. */
  floorOhms?: number;
  /** A single explanation must account for at least this share of the deviation; default 0.9. */
  minShare?: number;
  /**
   * Mean misfit per reading still put down to noise (pure noise gives about 2); default 5. An explanation
   * must also bring the misfit down to this.
   */
  noiseMisfit?: number;
  /** How many candidates to report; default 5. */
  limit?: number;
  /** Refs of the parts to consider; default every part of the board. */
  parts?: readonly string[];
  /** Also test the fixture paths of each node; default true. */
  fixture?: boolean;
  /** Fit the fixture common to all readings (series R + L, stray C to ground) and see predictions through it; default true. */
  leads?: boolean;
  /** Search a second part when no single explanation is enough; default true. */
  pairs?: boolean;
  /**
   * How candidate readings are computed: 'rank-one' updates (default) or 'refactor', a fresh
   * factorization of J per candidate value (the slow reference the rank-one updates are checked against).
   */
  method?: 'rank-one' | 'refactor';
}
