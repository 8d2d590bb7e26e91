// The validated, expanded board: plain two-terminal parts between named nodes. Lattice descriptions are
// expanded into this form by the board module; everything downstream sees only this.

export type PartKind = 'C' | 'L' | 'R';

/** The one ground node name used after parsing (gnd, GND, Gnd in files all map to it). */
export const GROUND = 'gnd';

export interface Part {
  /** Reference designator, unique on the board (stable for lattice expansions). */
  ref: string;
  kind: PartKind;
  /** Two node names; GROUND for ground. Never the same node twice. */
  nodes: [string, string];
  /** Nominal value in SI base units: farads, henries or ohms. Always > 0 and finite. */
  value: number;
  /** Relative tolerance as a fraction (5% -> 0.05), if stated. */
  tolerance?: number;
  /** Series resistance in ohms for C and L (an inductor's Q at a frequency is converted to this). */
  esr?: number;
  /** Largest voltage the part may see, in volts (board field `rating`), if stated. */
  rating_v?: number;
  /** Where in the file the part came from, e.g. "components[3]" or "lattice.bonds[1] cell (2,0)". */
  origin: string;
}

export interface BoardNode {
  name: string;
  /** Coordinates for plotting, always three numbers (unused axes are 0). */
  position: [number, number, number];
  /** For lattice nodes: the integer cell index and the site name within the unit cell. */
  cell?: number[];
  site?: string;
}

/** A part of the unit cell, kept after expansion so that Bloch bands can be computed from the cell. */
export interface CellPart {
  kind: PartKind;
  /** Site names; `to` is GROUND for a part from a site to ground. */
  from: string;
  to: string;
  /** Integer cell offset of `to` relative to `from` (all zeros inside one cell or to ground). */
  offset: number[];
  value: number;
  tolerance?: number;
  esr?: number;
}

export interface LatticeSummary {
  dimensions: number;
  repeats: number[];
  boundary: ('open' | 'periodic')[];
  /** Lattice vectors used for positions, one per dimension, each of three numbers. */
  vectors: [number, number, number][];
  sites: { name: string; position: [number, number, number] }[];
  /** The bulk unit cell (before overrides and boundary terminations). */
  cellParts: CellPart[];
}

export interface Board {
  name: string;
  /** Path of the file it was read from ("<inline>" for text parsed without a file). */
  file: string;
  /** Every non-ground node, in a stable order (file order for explicit parts, cell-major for lattices). */
  nodes: BoardNode[];
  parts: Part[];
  lattice?: LatticeSummary;
}
