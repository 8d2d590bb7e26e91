// Keeping Lanczos vectors free of the null space of C.
//
// OP = (K − σC)⁻¹ C maps everything into its range R = {v : Nᵀ K v = 0}, N a basis of null(C) (because
// Nᵀ(K − σC) = Nᵀ K). Rounding in the recurrence still leaves each new vector a small part in null(C),
// which the C-inner product cannot see, and the recurrence multiplies it step after step (Nour-Omid,
// Parlett, Ericsson & Jensen, Math. Comp. 48, 663, 1987) until the C-norms drown in cancellation. The
// projection onto R along null(C),
//     Π v = v − N (Nᵀ K N)⁻¹ Nᵀ K v,
// removes it without changing C v, so applying Π to each new vector keeps the part at rounding level.
//
// For a capacitance Laplacian N is known exactly from the circuit: xᵀCx = Σ c_ij (x_i − x_j)² + Σ g_i x_i²
// vanishes only for x constant on each group of nodes joined by capacitors that has no capacitance to
// ground (a node with no capacitor at all is a group of one). N is then the groups' indicator vectors and
// Nᵀ K N their summed inductive couplings, nonsingular whenever K − σC is.
import type { CscPattern } from './types.js';
import { complexFromTriplets } from './csc.js';
import { analyzeLu } from './lu-symbolic.js';
import { factorLu } from './lu-numeric.js';
import { realDiagonal, realMatVec } from './shift-invert-real-csc.js';
import { isRealFactorization, solveRealLu } from './shift-invert-real-solve.js';

/** Capacitance to ground below this share of a node's total counts as none (rounding in C_ii − Σ c_ij). */
const GROUNDED_SHARE = 1e-12;

/** Π applied in place; null when C has no null space (nothing to do). */
export type NullSpaceCleaner = ((v: Float64Array) => void) | null;

/**
 * Groups of nodes spanning null(C): group[i] is the group of node i, or −1 when i is tied to ground
 * through capacitors. Null (not a list) when C is not Laplacian-shaped (a positive off-diagonal entry),
 * where the circuit argument above does not hold.
 */
export function floatingCapacitorGroups(p: CscPattern, C: Float64Array): { group: Int32Array; count: number } | null {
  const n = p.n;
  const parent = Int32Array.from({ length: n }, (_, i) => i);
  const find = (i: number): number => {
    while (parent[i] !== i) i = parent[i] = parent[parent[i]];
    return i;
  };
  const rowSum = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      const i = p.rowIdx[q];
      rowSum[i] += C[q];
      if (i === j || C[q] === 0) continue;
      if (C[q] > 0) return null;
      const a = find(i);
      const b = find(j);
      if (a !== b) parent[a] = b;
    }
  }
  const diag = realDiagonal(p, C);
  const grounded = new Uint8Array(n);
  for (let i = 0; i < n; i++) if (rowSum[i] > GROUNDED_SHARE * diag[i]) grounded[find(i)] = 1;
  const group = new Int32Array(n).fill(-1);
  const number = new Int32Array(n).fill(-1);
  let count = 0;
  for (let i = 0; i < n; i++) {
    const root = find(i);
    if (grounded[root]) continue;
    if (number[root] < 0) number[root] = count++;
    group[i] = number[root];
  }
  return { group, count };
}

/** The projection Π for K and C on pattern p; null when C is nonsingular or not Laplacian-shaped. */
export function nullSpaceCleaner(p: CscPattern, K: Float64Array, C: Float64Array): NullSpaceCleaner {
  const groups = floatingCapacitorGroups(p, C);
  if (!groups || groups.count === 0) return null;
  const { group, count } = groups;
  // Nᵀ K N: entry (a, b) sums K over node pairs in groups a and b.
  const rows: number[] = [];
  const cols: number[] = [];
  const vals: number[] = [];
  for (let j = 0; j < p.n; j++) {
    if (group[j] < 0) continue;
    for (let q = p.colPtr[j]; q < p.colPtr[j + 1]; q++) {
      const gi = group[p.rowIdx[q]];
      if (gi < 0 || K[q] === 0) continue;
      rows.push(gi);
      cols.push(group[j]);
      vals.push(K[q]);
    }
  }
  for (let a = 0; a < count; a++) rows.push(a), cols.push(a), vals.push(0); // keep every diagonal in the pattern
  const G = complexFromTriplets(count, rows, cols, vals, new Float64Array(vals.length));
  const factors = factorLu(analyzeLu(G), G);
  if (!isRealFactorization(factors)) throw new Error('internal: the LU of a real matrix came out complex');
  const kv = new Float64Array(p.n);
  const r = new Float64Array(count);
  const work = new Float64Array(count);
  return (v) => {
    realMatVec(p, K, v, kv);
    r.fill(0);
    for (let i = 0; i < p.n; i++) if (group[i] >= 0) r[group[i]] += kv[i];
    solveRealLu(factors, r, r, work);
    for (let i = 0; i < p.n; i++) if (group[i] >= 0) v[i] -= r[group[i]];
  };
}
