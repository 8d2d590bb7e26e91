// Paths through the Brillouin zone in reduced phases (theta per axis, radians per cell step) and their
// length in reciprocal space for the horizontal axis of a band plot.

export interface PathPoint {
  label: string;
  theta: number[];
}

export interface PathSample {
  theta: number[];
  /** Path length from the start, in radians per unit of the lattice vectors' length (see pathMetric). */
  distance: number;
  /** Set on the samples that are path vertices. */
  label?: string;
}

const { PI } = Math;

/**
 * The customary high-symmetry path for the hypercubic family in reduced phases (common practice):
 * 1D Γ(0)–X(π) (time reversal makes the bands even in theta, so half the zone shows everything);
 * 2D Γ–X(π,0)–M(π,π)–Γ; 3D Γ–X(π,0,0)–M(π,π,0)–Γ–R(π,π,π). For other lattices pass your own path.
 */
export function defaultBlochPath(dimensions: number): PathPoint[] {
  const G = (d: number) => new Array<number>(d).fill(0);
  switch (dimensions) {
    case 1:
      return [
        { label: 'Γ', theta: [0] },
        { label: 'X', theta: [PI] },
      ];
    case 2:
      return [
        { label: 'Γ', theta: G(2) },
        { label: 'X', theta: [PI, 0] },
        { label: 'M', theta: [PI, PI] },
        { label: 'Γ', theta: G(2) },
      ];
    case 3:
      return [
        { label: 'Γ', theta: G(3) },
        { label: 'X', theta: [PI, 0, 0] },
        { label: 'M', theta: [PI, PI, 0] },
        { label: 'Γ', theta: G(3) },
        { label: 'R', theta: [PI, PI, PI] },
      ];
    default:
      throw new RangeError(`no default path for a ${dimensions}-dimensional lattice`);
  }
}

/**
 * The metric that turns a phase step into a reciprocal-space length: with G the Gram matrix of the
 * lattice vectors (G_ij = a_i . a_j), the wavevector of theta has |k|^2 = theta^T G^-1 theta, since
 * k . a_i = theta_i. Falls back to the plain Euclidean length of theta when the vectors are degenerate.
 */
export function pathMetric(vectors: readonly (readonly number[])[], dimensions: number): Float64Array {
  const G = new Float64Array(dimensions * dimensions);
  for (let i = 0; i < dimensions; i++)
    for (let j = 0; j < dimensions; j++) {
      const a = vectors[i] ?? [];
      const b = vectors[j] ?? [];
      let dot = 0;
      for (let c = 0; c < Math.max(a.length, b.length); c++) dot += (a[c] ?? 0) * (b[c] ?? 0);
      G[i * dimensions + j] = dot;
    }
  return invertSmall(dimensions, G) ?? identity(dimensions);
}

/** Samples along the path: pointsPerSegment per segment (start included), then the final vertex. */
export function samplePath(path: readonly PathPoint[], pointsPerSegment: number, metric: Float64Array): PathSample[] {
  if (path.length === 0) throw new RangeError('a band path needs at least one point');
  if (!Number.isInteger(pointsPerSegment) || pointsPerSegment < 1) {
    throw new RangeError(`points per segment must be a positive integer, got ${pointsPerSegment}`);
  }
  const d = path[0].theta.length;
  for (const p of path) {
    if (p.theta.length !== d) throw new RangeError(`path point ${p.label} has ${p.theta.length} phases, expected ${d}`);
  }
  const out: PathSample[] = [];
  let distance = 0;
  let previous: number[] | undefined;
  const push = (theta: number[], label?: string) => {
    if (previous) distance += metricLength(metric, theta.map((t, i) => t - previous![i]));
    previous = theta;
    out.push(label === undefined ? { theta, distance } : { theta, distance, label });
  };
  for (let seg = 0; seg + 1 < path.length; seg++) {
    const a = path[seg].theta;
    const b = path[seg + 1].theta;
    for (let j = 0; j < pointsPerSegment; j++) {
      const t = j / pointsPerSegment;
      push(a.map((ai, i) => ai + t * (b[i] - ai)), j === 0 ? path[seg].label : undefined);
    }
  }
  const last = path[path.length - 1];
  push([...last.theta], last.label);
  return out;
}

function metricLength(metric: Float64Array, step: number[]): number {
  const d = step.length;
  let s = 0;
  for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) s += step[i] * metric[i * d + j] * step[j];
  return Math.sqrt(Math.max(s, 0));
}

/** Gauss-Jordan inverse with partial pivoting for the tiny Gram matrix; undefined when singular. */
function invertSmall(d: number, A: Float64Array): Float64Array | undefined {
  const a = A.slice();
  const inv = identity(d);
  const scale = Math.max(...Array.from(a, Math.abs), 0);
  if (scale === 0) return undefined;
  for (let col = 0; col < d; col++) {
    let piv = col;
    for (let r = col + 1; r < d; r++) if (Math.abs(a[r * d + col]) > Math.abs(a[piv * d + col])) piv = r;
    if (Math.abs(a[piv * d + col]) <= 1e-12 * scale) return undefined;
    for (const m of [a, inv])
      for (let c = 0; c < d; c++) [m[col * d + c], m[piv * d + c]] = [m[piv * d + c], m[col * d + c]];
    const p = a[col * d + col];
    for (let c = 0; c < d; c++) {
      a[col * d + c] /= p;
      inv[col * d + c] /= p;
    }
    for (let r = 0; r < d; r++) {
      if (r === col) continue;
      const f = a[r * d + col];
      if (f === 0) continue;
      for (let c = 0; c < d; c++) {
        a[r * d + c] -= f * a[col * d + c];
        inv[r * d + c] -= f * inv[col * d + c];
      }
    }
  }
  return inv;
}

function identity(d: number): Float64Array {
  const m = new Float64Array(d * d);
  for (let i = 0; i < d; i++) m[i * d + i] = 1;
  return m;
}
