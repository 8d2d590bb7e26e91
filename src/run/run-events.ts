// What a run says as it goes: one typed event per thing that happened, in the order it happened. The log,
// the progress bar and `--json` all read this one stream; none of them looks inside the runner.
import type { ReadingBand, StepKind, StepPurpose } from '../plan/types.js';

/** How one reading compares with its band. */
export type ReadingFlag = 'ok' | 'deviation' | 'invalid';

/** How a run ended. `running` is only ever on disk: a log whose process died before it could say. */
export type RunStatus = 'complete' | 'interrupted' | 'failed';

export type RunMode = 'switched' | 'operator';

export interface ScanStarted {
  event: 'started';
  time: string;
  plan: string;
  board: string;
  mode: RunMode;
  steps: number;
  /** Readings in the plan, and how many of them an earlier run already logged (resume). */
  readings_total: number;
  readings_done: number;
}

export interface StepStarted {
  event: 'step-started';
  time: string;
  step: number;
  kind: StepKind;
  purpose: StepPurpose;
  hi: string;
  lo: string;
  sense?: string;
  channels: number[];
  /** Points of this step still to read (fewer than the plan's when resuming inside a step). */
  points: number;
}

export interface ReadingTaken {
  event: 'reading';
  time: string;
  step: number;
  /** 1-based position of the point within its step; with `step` it names the reading. */
  point: number;
  kind: StepKind;
  hi: string;
  lo: string;
  sense?: string;
  frequency_hz: number;
  /** Measured value; null when the reading is invalid. */
  re: number | null;
  im: number | null;
  pred_re: number;
  pred_im: number;
  flag: ReadingFlag;
  /** Why an invalid reading is invalid ("overload", or the unreadable answer). */
  note?: string;
}

/** Emitted right after the `reading` it explains, for readings outside their band. */
export interface DeviationFound {
  event: 'deviation';
  time: string;
  step: number;
  point: number;
  hi: string;
  lo: string;
  /** Transfer readings: the sensed node. */
  sense?: string;
  frequency_hz: number;
  magnitude_ohm: number;
  phase_deg: number;
  band: ReadingBand;
  outside: ('magnitude' | 'phase')[];
}

export type WarningSource = 'analyzer' | 'switch' | 'runner';

export interface RunWarning {
  event: 'warning';
  time: string;
  source: WarningSource;
  message: string;
}

export interface ScanDone {
  event: 'done';
  time: string;
  status: RunStatus;
  /** Readings in the log, this run's and earlier runs' together. */
  readings: number;
  deviations: number;
  invalid: number;
  /** The one-line reason of a failure or interruption. */
  reason?: string;
  /** Whether every relay was confirmed open and the excitation set to its minimum at the end. */
  safe: boolean;
}

export type RunEvent = ScanStarted | StepStarted | ReadingTaken | DeviationFound | RunWarning | ScanDone;

export const now = (): string => new Date().toISOString();

export function warning(source: WarningSource, message: string): RunWarning {
  return { event: 'warning', time: now(), source, message };
}
