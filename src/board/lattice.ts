// The `lattice` section from raw data to nodes, parts and the summary kept for band calculations.

import type { DraftPart } from './draft.js';
import type { ProblemLog } from './errors.js';
import { applyLatticeChanges } from './lattice-changes.js';
import { expandLattice } from './lattice-expand.js';
import { readLatticeSpec, type CellPartSpec, type LatticeSpec } from './lattice-spec.js';
import { seriesResistance } from './part-values.js';
import type { BoardNode, CellPart, LatticeSummary } from './types.js';

export interface LatticeResult {
  nodes: BoardNode[];
  parts: DraftPart[];
  summary: LatticeSummary;
  nodeDeclared: Map<string, string>;
}

/** The expanded lattice, or undefined if the section has problems (all logged). */
export function readLattice(raw: unknown, log: ProblemLog): LatticeResult | undefined {
  const spec = readLatticeSpec(raw, log);
  if (!spec) return undefined;
  const expansion = expandLattice(spec, log);
  if (!expansion) return undefined;
  if (!applyLatticeChanges(spec, expansion, log)) return undefined;
  return { nodes: expansion.nodes, parts: expansion.parts, summary: summarise(spec), nodeDeclared: expansion.nodeDeclared };
}

function summarise(spec: LatticeSpec): LatticeSummary {
  return {
    dimensions: spec.dimensions,
    repeats: [...spec.repeats],
    boundary: [...spec.boundary],
    vectors: spec.vectors.map((v) => [...v] as [number, number, number]),
    sites: spec.sites.map((s) => ({ name: s.name, position: [...s.position] as [number, number, number] })),
    cellParts: [...spec.bonds, ...spec.grounds].map(toCellPart),
  };
}

function toCellPart(spec: CellPartSpec): CellPart {
  const part: CellPart = { kind: spec.kind, from: spec.from, to: spec.to, offset: [...spec.offset], value: spec.value };
  if (spec.tolerance !== undefined) part.tolerance = spec.tolerance;
  const esr = seriesResistance(spec.kind, spec.value, spec.loss);
  if (esr !== undefined) part.esr = esr;
  return part;
}
