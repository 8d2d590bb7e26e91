// The Bloch matrices of a lattice's bulk unit cell: the capacitance and inverse-inductance Laplacians of
// the infinite lattice restricted to waves x(site, cell R) = u(site) e^{i theta . R}.
//
// Phase convention: theta holds one phase per lattice axis, in radians per cell step (reduced
// coordinates, theta_axis = k . a_axis), so every band is 2 pi periodic in each component and the first
// Brillouin zone is theta in [-pi, pi] per axis, whatever the lattice vectors are. The phase of a bond
// depends only on the cell offset it crosses, not on where the sites sit inside the cell.
//
// A part of conductance-like value g (C in farads, or 1/L for an inductor) from site s in cell 0 to site
// t in cell d adds g to (s,s) and (t,t), -g e^{i theta.d} to (s,t) and -g e^{-i theta.d} to (t,s); a part
// to ground adds g to (s,s). Resistors and series resistances are dropped: these are the lossless bands,
// matching the lossless modes of a finite board.
import { GROUND, type CellPart, type LatticeSummary } from '../board/types.js';
import type { ComplexDense } from '../numeric/hermitian-embedding.js';

export interface BlochMatrices {
  /** Number of sites in the unit cell, the size of both matrices. */
  n: number;
  /** Site names in matrix order (the lattice's site order). */
  sites: string[];
  /** C(theta), Hermitian, farads, row-major. */
  capacitance: ComplexDense;
  /** K(theta), Hermitian, 1/henries, row-major. */
  inverseInductance: ComplexDense;
}

export function blochMatrices(lattice: LatticeSummary, theta: readonly number[]): BlochMatrices {
  if (theta.length !== lattice.dimensions) {
    throw new RangeError(`a ${lattice.dimensions}-dimensional lattice needs ${lattice.dimensions} phases, got ${theta.length}`);
  }
  const sites = lattice.sites.map((s) => s.name);
  const n = sites.length;
  const row = new Map(sites.map((name, i) => [name, i] as const));
  const capacitance = { re: new Float64Array(n * n), im: new Float64Array(n * n) };
  const inverseInductance = { re: new Float64Array(n * n), im: new Float64Array(n * n) };
  const siteRow = (name: string, part: CellPart): number => {
    const r = row.get(name);
    if (r === undefined) throw new Error(`cell part ${describe(part)} names "${name}", which is not a site of the unit cell`);
    return r;
  };

  for (const part of lattice.cellParts) {
    if (part.kind === 'R') continue;
    const m = part.kind === 'C' ? capacitance : inverseInductance;
    const g = part.kind === 'C' ? part.value : 1 / part.value;
    const s = siteRow(part.from, part);
    m.re[s * n + s] += g;
    if (part.to === GROUND) continue;
    const t = siteRow(part.to, part);
    const phase = bondPhase(theta, part.offset);
    if (s === t && part.offset.every((o) => o === 0)) {
      throw new Error(`cell part ${describe(part)} joins a site to itself in the same cell`);
    }
    const cos = Math.cos(phase);
    const sin = Math.sin(phase);
    m.re[t * n + t] += g;
    m.re[s * n + t] -= g * cos;
    m.im[s * n + t] -= g * sin;
    m.re[t * n + s] -= g * cos;
    m.im[t * n + s] += g * sin;
  }
  return { n, sites, capacitance, inverseInductance };
}

/** theta . d, with missing offset components taken as 0. */
function bondPhase(theta: readonly number[], offset: readonly number[]): number {
  if (offset.length > theta.length) throw new RangeError(`cell offset [${offset.join(', ')}] has more axes than the lattice`);
  let phase = 0;
  offset.forEach((d, axis) => (phase += theta[axis] * d));
  return phase;
}

function describe(part: CellPart): string {
  return `${part.kind} ${part.from}-${part.to} [${part.offset.join(', ')}]`;
}
