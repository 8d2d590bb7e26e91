// What the analysis stage works on: readings as a scan log holds them (one row per reading), already parsed.
// The log module turns CSV rows into these; analysis never touches files or instruments.

export type ReadingKind = 'to-ground' | 'two-point' | 'transfer';
export type ReadingFlag = 'ok' | 'deviation' | 'invalid';

export interface Reading {
  step: number;
  point: number;
  kind: ReadingKind;
  hi: string;
  /** "gnd" for node-to-ground readings. */
  lo: string;
  /** The sensed node of a transfer reading (current into hi, out at lo; voltage at sense against lo). */
  sense?: string;
  frequency_hz: number;
  re: number;
  im: number;
  pred_re: number;
  pred_im: number;
  flag: ReadingFlag;
}
