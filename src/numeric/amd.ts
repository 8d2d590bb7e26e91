// Approximate minimum degree ordering (Amestoy, Davis & Duff, 1996) on the graph of A + Aᵀ.
//
// The elimination is simulated on a quotient graph: an eliminated pivot becomes an "element" that stands
// for the clique it would have created, so storage never grows beyond the original graph plus one new
// list per pivot. Degrees are not recomputed exactly (that is what makes minimum degree slow) but bounded
// from above with the |Le \ Lp| trick of the paper. Elements swallowed by a newer one are absorbed, and
// variables with identical adjacency are merged into supervariables, which then move as one.
import type { CscPattern } from './types.js';
import { symmetricAdjacency } from './csc.js';

export interface MinimumDegreeOptions {
  /**
   * Nodes with more than max(16, denseFactor·√n) neighbours are taken out of the graph and ordered last;
   * left in, they would be touched at every step. Default 10 (common practice).
   */
  denseFactor?: number;
  /** If given, filled with counts of what the elimination did (for diagnostics and tests). */
  stats?: MinimumDegreeStats;
}

export interface MinimumDegreeStats {
  denseNodes: number;
  /** Variables folded into an indistinguishable one. */
  supervariableMerges: number;
  /** Variables eliminated along with a pivot because the pivot's element was all they touched. */
  massEliminations: number;
  /** Elements found inside a newer one while updating degrees, and absorbed early. */
  aggressiveAbsorptions: number;
  /** Times the shared workspace was compacted to make room. */
  compactions: number;
}

// Node states in the quotient graph.
const VARIABLE = 0; // not yet eliminated, principal
const ELEMENT = 1; // eliminated pivot whose clique is still in use
const ABSORBED = 2; // eliminated pivot whose clique was swallowed by a later element
const MERGED = 3; // variable folded into a supervariable or eliminated together with a pivot
const DENSE = 4; // set aside, ordered last

/**
 * Fill-reducing symmetric ordering of the pattern of A + Aᵀ (the diagonal and the values are ignored).
 * Returns perm with perm[k] = original index placed k-th.
 */
export function approximateMinimumDegree(p: CscPattern, options: MinimumDegreeOptions = {}): Int32Array {
  const n = p.n;
  const perm = new Int32Array(n);
  if (n === 0) return perm;
  const graph = symmetricAdjacency(p);
  const denseLimit = Math.max(16, (options.denseFactor ?? 10) * Math.sqrt(n));

  const stats: MinimumDegreeStats = {
    denseNodes: 0,
    supervariableMerges: 0,
    massEliminations: 0,
    aggressiveAbsorptions: 0,
    compactions: 0,
  };
  const state = new Int8Array(n);
  let denseCount = 0;
  for (let i = 0; i < n; i++) {
    if (graph.colPtr[i + 1] - graph.colPtr[i] > denseLimit) {
      state[i] = DENSE;
      denseCount++;
    }
  }

  // One shared workspace holds every adjacency list: for a variable, its elements first (elen of them),
  // then its variables; for an element, its variables.
  let capacity = Math.ceil(1.25 * graph.colPtr[n]) + 4 * n + 16;
  let iw = new Int32Array(capacity);
  const start = new Int32Array(n);
  const len = new Int32Array(n);
  const elen = new Int32Array(n);
  const weight = new Int32Array(n); // size of the supervariable a principal variable stands for
  const degree = new Int32Array(n); // approximate external degree of a variable
  const elementWeight = new Int32Array(n); // weighted |Le| of an element
  const representative = new Int32Array(n).fill(-1);
  let free = 0;
  for (let i = 0; i < n; i++) {
    start[i] = free;
    if (state[i] === DENSE) continue;
    for (let q = graph.colPtr[i]; q < graph.colPtr[i + 1]; q++) {
      const j = graph.rowIdx[q];
      if (state[j] !== DENSE) iw[free++] = j;
    }
    len[i] = free - start[i];
    degree[i] = len[i];
    weight[i] = 1;
  }

  // Degree buckets: doubly linked lists, newest first.
  const bucketHead = new Int32Array(n).fill(-1);
  const bucketNext = new Int32Array(n).fill(-1);
  const bucketPrev = new Int32Array(n).fill(-1);
  const insertBucket = (i: number, d: number): void => {
    const h = bucketHead[d];
    bucketNext[i] = h;
    bucketPrev[i] = -1;
    if (h !== -1) bucketPrev[h] = i;
    bucketHead[d] = i;
  };
  const removeBucket = (i: number): void => {
    const nx = bucketNext[i];
    const pv = bucketPrev[i];
    if (nx !== -1) bucketPrev[nx] = pv;
    if (pv !== -1) bucketNext[pv] = nx;
    else bucketHead[degree[i]] = nx;
  };
  for (let i = n - 1; i >= 0; i--) if (state[i] === VARIABLE) insertBucket(i, degree[i]);

  // Stamps avoid clearing marker arrays between pivots.
  const inPivotClique = new Int32Array(n);
  const outsideStamp = new Int32Array(n);
  const outsideWeight = new Int32Array(n); // weighted |Le \ Lp| for the current pivot
  const seen = new Int32Array(n);
  let seenStamp = 0;
  const hashHead = new Int32Array(n).fill(-1);
  const hashNext = new Int32Array(n);
  const hashOf = new Int32Array(n);
  const firstEntry = new Int32Array(n);

  // Move every live list to the front of the workspace, in place. A live list is tagged by replacing its
  // first entry with -(owner + 1); everything else in the used region is a node index (>= 0).
  const compact = (): void => {
    stats.compactions++;
    for (let o = 0; o < n; o++) {
      const live = state[o] === VARIABLE || state[o] === ELEMENT;
      if (live && len[o] > 0) {
        firstEntry[o] = iw[start[o]];
        iw[start[o]] = -(o + 1);
      }
    }
    let write = 0;
    for (let read = 0; read < free; read++) {
      if (iw[read] >= 0) continue;
      const o = -iw[read] - 1;
      start[o] = write;
      iw[write++] = firstEntry[o];
      for (let t = 1; t < len[o]; t++) iw[write++] = iw[read + t];
      read += len[o] - 1;
    }
    free = write;
  };
  const reserve = (need: number): void => {
    if (free + need <= capacity) return;
    compact();
    if (free + need <= capacity) return;
    capacity = Math.max(2 * capacity, free + need + n);
    const grown = new Int32Array(capacity);
    grown.set(iw.subarray(0, free));
    iw = grown;
  };

  const liveCount = n - denseCount;
  const pivots = new Int32Array(liveCount);
  let pivotCount = 0;
  let eliminated = 0; // weighted number of eliminated variables
  let minDegree = 0;
  let stamp = 0;

  while (eliminated < liveCount) {
    while (minDegree < n && bucketHead[minDegree] === -1) minDegree++;
    if (minDegree >= n) throw new Error('approximateMinimumDegree: degree lists ran empty');
    const pivot = bucketHead[minDegree];
    removeBucket(pivot);
    eliminated += weight[pivot];
    stamp++;
    inPivotClique[pivot] = stamp;

    // --- The new element Lp: the pivot's variables plus the variables of the elements it touches. ---
    let bound = len[pivot] - elen[pivot];
    for (let t = 0; t < elen[pivot]; t++) {
      const e = iw[start[pivot] + t];
      if (state[e] === ELEMENT) bound += len[e];
    }
    reserve(bound);
    const lpStart = free;
    let cliqueWeight = 0;
    const addToClique = (j: number): void => {
      if (state[j] !== VARIABLE || inPivotClique[j] === stamp) return;
      inPivotClique[j] = stamp;
      iw[free++] = j;
      cliqueWeight += weight[j];
      removeBucket(j);
    };
    const ps = start[pivot];
    for (let t = 0; t < elen[pivot]; t++) {
      const e = iw[ps + t];
      if (state[e] !== ELEMENT) continue;
      for (let q = start[e]; q < start[e] + len[e]; q++) addToClique(iw[q]);
      state[e] = ABSORBED; // its clique is contained in Lp now
      representative[e] = pivot;
    }
    for (let t = elen[pivot]; t < len[pivot]; t++) addToClique(iw[ps + t]);
    const lpEnd = free;
    state[pivot] = ELEMENT;
    pivots[pivotCount++] = pivot;

    // --- |Le \ Lp| for every element adjacent to Lp, by subtracting the part inside Lp. ---
    for (let q = lpStart; q < lpEnd; q++) {
      const i = iw[q];
      const w = weight[i];
      for (let t = start[i]; t < start[i] + elen[i]; t++) {
        const e = iw[t];
        if (state[e] !== ELEMENT) continue;
        if (outsideStamp[e] !== stamp) {
          outsideStamp[e] = stamp;
          outsideWeight[e] = elementWeight[e];
        }
        outsideWeight[e] -= w;
      }
    }

    // --- Prune each list of Lp, bound its degree, spot mass elimination, hash for supervariables. ---
    const hashed: number[] = [];
    for (let q = lpStart; q < lpEnd; q++) {
      const i = iw[q];
      const s = start[i];
      const oldLen = len[i];
      let write = s;
      let external = 0;
      let hash = 0;
      for (let t = s; t < s + elen[i]; t++) {
        const e = iw[t];
        if (state[e] !== ELEMENT) continue;
        const outside = outsideWeight[e];
        if (outside === 0) {
          state[e] = ABSORBED; // aggressive absorption: Le is inside Lp
          representative[e] = pivot;
          stats.aggressiveAbsorptions++;
          continue;
        }
        external += outside;
        hash += e;
        iw[write++] = e;
      }
      const elementCount = write - s;
      for (let t = s + elen[i]; t < s + oldLen; t++) {
        const j = iw[t];
        // Variables in Lp are now reached through the element, and the pivot itself is gone.
        if (state[j] !== VARIABLE || inPivotClique[j] === stamp) continue;
        external += weight[j];
        hash += j;
        iw[write++] = j;
      }
      // Put the pivot's element first. Some entry was always dropped (the pivot, or an element absorbed
      // into it), so the list does not grow.
      const count = write - s;
      if (count + 1 > oldLen) throw new Error('approximateMinimumDegree: adjacency list overflow');
      if (elementCount < count) iw[s + count] = iw[s + elementCount];
      if (elementCount > 0) iw[s + elementCount] = iw[s];
      iw[s] = pivot;
      elen[i] = elementCount + 1;
      len[i] = count + 1;

      if (external === 0) {
        // Only adjacent to the pivot's element: eliminating i now creates no fill.
        state[i] = MERGED;
        representative[i] = pivot;
        eliminated += weight[i];
        cliqueWeight -= weight[i];
        weight[pivot] += weight[i];
        weight[i] = 0;
        stats.massEliminations++;
        continue;
      }
      if (external < degree[i]) degree[i] = external;
      const h = (hash + pivot) % n;
      hashOf[i] = h;
      hashNext[i] = hashHead[h];
      hashHead[h] = i;
      hashed.push(i);
    }

    // --- Supervariables: variables of Lp with identical lists become one. ---
    for (const i of hashed) {
      const h = hashOf[i];
      const first = hashHead[h];
      if (first === -1) continue; // bucket already done
      hashHead[h] = -1;
      for (let a = first; a !== -1; a = hashNext[a]) {
        if (state[a] !== VARIABLE) continue;
        seenStamp++;
        const as = start[a];
        for (let t = as; t < as + len[a]; t++) seen[iw[t]] = seenStamp;
        for (let b = hashNext[a]; b !== -1; b = hashNext[b]) {
          if (state[b] !== VARIABLE || len[b] !== len[a] || elen[b] !== elen[a]) continue;
          const bs = start[b];
          let same = true;
          for (let t = bs; t < bs + len[b] && same; t++) same = seen[iw[t]] === seenStamp;
          if (!same) continue;
          weight[a] += weight[b];
          weight[b] = 0;
          state[b] = MERGED;
          representative[b] = a;
          stats.supervariableMerges++;
        }
      }
    }

    // --- Final degrees; compact Lp to its surviving principal variables. ---
    const remaining = liveCount - eliminated;
    let write = lpStart;
    for (let q = lpStart; q < lpEnd; q++) {
      const i = iw[q];
      if (state[i] !== VARIABLE) continue;
      iw[write++] = i;
      const w = weight[i];
      const d = Math.max(0, Math.min(degree[i] + cliqueWeight - w, remaining - w));
      degree[i] = d;
      insertBucket(i, d);
      if (d < minDegree) minDegree = d;
    }
    start[pivot] = lpStart;
    len[pivot] = write - lpStart;
    elementWeight[pivot] = cliqueWeight;
    free = write; // Lp is the newest list, so its dropped tail is reclaimed at once
    if (len[pivot] === 0) state[pivot] = ABSORBED;
  }

  stats.denseNodes = denseCount;
  if (options.stats) Object.assign(options.stats, stats);
  return orderFromPivots(n, state, representative, pivots.subarray(0, pivotCount), perm);
}

/** Pivots in elimination order, each followed by the variables that were eliminated along with it. */
function orderFromPivots(
  n: number,
  state: Int8Array,
  representative: Int32Array,
  pivots: Int32Array,
  perm: Int32Array,
): Int32Array {
  const rank = new Int32Array(n).fill(-1);
  for (let k = 0; k < pivots.length; k++) rank[pivots[k]] = k;
  const owner = new Int32Array(n).fill(-1);
  const groupSize = new Int32Array(pivots.length + 1);
  for (let v = 0; v < n; v++) {
    if (state[v] === DENSE) continue;
    let r = v;
    while (state[r] === MERGED) r = representative[r];
    owner[v] = r;
    groupSize[rank[r] + 1]++;
  }
  for (let k = 0; k < pivots.length; k++) groupSize[k + 1] += groupSize[k];
  const next = groupSize.slice(0, pivots.length);
  for (let k = 0; k < pivots.length; k++) perm[next[k]++] = pivots[k];
  for (let v = 0; v < n; v++) {
    const r = owner[v];
    if (r >= 0 && r !== v) perm[next[rank[r]]++] = v;
  }
  let tail = groupSize[pivots.length];
  for (let v = 0; v < n; v++) if (state[v] === DENSE) perm[tail++] = v;
  return perm;
}
