// What a report is drawn from: plain data only. The report verb reads these from a scan log and its meta
// (and from the analysis stage); the renderer computes no physics and reads no file.
import type { Board, PartKind } from '../board/types.js';
import type { Reading } from '../analysis/readings.js';
import type { Diagnosis } from '../analysis/diagnose-types.js';
import type { UnitName } from '../units/unit-names.js';

/** The band a reading was judged by (from the plan), keyed by the reading's step and point. */
export interface ReportBand {
  step: number;
  point: number;
  mag_lo_ohm: number;
  mag_hi_ohm: number;
  /** The phase arc runs counter-clockwise from phase_lo_deg to phase_hi_deg (it may cross ±180°). */
  phase_lo_deg: number;
  phase_hi_deg: number;
}

/** A predicted mode the scan looked at (the shape predictions give: unit 2-norm profile over the nodes). */
export interface ReportMode {
  frequency_hz: number;
  localization: number;
  profile: Record<string, number>;
}

export interface ReportFitParameter {
  label: string;
  ref?: string;
  /** SI unit of value, nominal and sigma; absent for a dimensionless scale factor. */
  unit?: UnitName;
  nominal: number;
  value: number;
  /** Standard uncertainty of value; Infinity when the readings do not fix it. */
  sigma: number;
  identifiable?: boolean;
}

/** Measured spread of one kind of part against its stated tolerance. */
export interface ReportFitSpread {
  kind: PartKind;
  /** Parts the readings determine well enough to count. */
  counted: number;
  meanDeviation: number;
  /** Spread of the parts themselves (fit uncertainty taken out), relative. */
  partSpread: number;
  tolerance?: number;
  spreadToTolerance?: number;
  withinTolerance: number;
}

export interface ReportFit {
  message?: string;
  converged?: boolean;
  parameters: ReportFitParameter[];
  spread?: ReportFitSpread[];
}

export interface ReportInstrument {
  /** What it does on the bench: "analyzer", "switch". */
  role: string;
  /** The instrument's own answer to *IDN? (IEEE 488.2), or null when it gave none. */
  identity?: string | null;
  profile?: string;
  address?: string;
}

export interface ReportMeta {
  /** Board name as the log recorded it; the board's own name when absent. */
  board?: string;
  started?: string;
  ended?: string | null;
  /** How the scan ended: complete, interrupted, failed, running. */
  status?: string;
  instruments?: ReportInstrument[];
  software?: { name: string; version: string };
  plan?: { file?: string; sha256?: string };
  log?: string;
  /** Set when the readings came from the simulated bench: the faults it was given. */
  simulated?: { faults: string[]; seed?: number } | null;
}

export interface ReportInput {
  board: Board;
  readings: readonly Reading[];
  bands?: readonly ReportBand[];
  modes?: readonly ReportMode[];
  diagnosis?: Diagnosis;
  fit?: ReportFit;
  meta: ReportMeta;
}
