// The k eigenpairs of K x = λ C x nearest a shift σ (λ = ω², K and C real symmetric positive semidefinite
// on one sparse pattern), for boards too large for the dense solver.
//
// Method: the shift-invert spectral transformation (Ericsson & Ruhe, Math. Comp. 35, 1251, 1980) with one
// LU of K − σC, band Lanczos in the C-inner product with full reorthogonalization and thick restart
// (lanczos-band.ts), a block of seeded random start vectors.
//
// Acceptance rests on the TRUE residual of each purified pair, ‖Kx − λCx‖ / ((‖K‖ + |λ|‖C‖)‖x‖) ≤ tol.
// Completeness rests on counting: Sylvester's law of inertia on K − sC tells how many eigenvalues lie
// within a radius of σ (lanczos-completeness.ts); if some are missing (copies of a degenerate eigenvalue
// the start block did not reach), fresh start vectors join the window and the iteration goes on.
import type { CscPattern } from './types.js';
import { analyzeLu } from './lu-symbolic.js';
import { ModesNotConvergedError } from './lanczos-errors.js';
import { seededUniform } from './lanczos-basis.js';
import { BandLanczos } from './lanczos-band.js';
import type { RitzPairs } from './lanczos-ritz.js';
import { purifiedPair, type PurifiedPair } from './lanczos-purify.js';
import { judgeCompleteness } from './lanczos-completeness.js';
import { factorShifted, shiftInvertOperator } from './shift-invert-operator.js';
import { eigenvaluesBelow } from './shift-invert-inertia.js';
import { nullSpaceCleaner } from './shift-invert-capacitance-null.js';
import { expandToAllNodes, withoutInertNodes } from './shift-invert-reduce.js';
import { realMatVec, realNorm1 } from './shift-invert-real-csc.js';

export interface ShiftInvertOptions {
  /** How many eigenpairs (k). */
  count: number;
  /** The target σ = ω² (rad²/s²): the k eigenvalues nearest to it are wanted. */
  shift: number;
  /** True relative residual every returned pair must meet. Default 1e-9. */
  tolerance?: number;
  /**
   * Basis size before a restart. Default max(2k + 20, k + 2·blockSize + 2), at most the problem size; it
   * grows by itself when tied or missing modes widen the search.
   */
  subspace?: number;
  /** Start vectors, i.e. the block width of band Lanczos. Default 3. */
  blockSize?: number;
  /** Thick restarts allowed before ModesNotConvergedError. Default 100. */
  maxRestarts?: number;
  /** Seed of the random start vectors. Default 1. */
  seed?: number;
}

/** How it was made sure that no eigenvalue nearer σ than the k-th returned one was skipped. */
export type Completeness =
  /** Eigenvalues within a radius just beyond the k-th distance: counted by inertia, found by Lanczos. */
  | { method: 'inertia'; counted: number; found: number }
  /** The count was not available (see shift-invert-inertia.ts): a fresh start block changed nothing. */
  | { method: 'fresh-start' }
  /** The basis came to span every direction of finite λ, so nothing can be missing (or nothing was asked). */
  | { method: 'whole-space' };

export interface ShiftInvertModes {
  /** λ = ω² (rad²/s²), nearest the requested σ first; fewer than k only when there are fewer finite λ. */
  values: Float64Array;
  /** Mode shapes on all n nodes, unit 2-norm, largest entry positive, aligned with `values`. */
  vectors: Float64Array[];
  /** True relative residual of each pair. */
  residuals: Float64Array;
  /** σ requested and σ factored; they differ (and `note` says why) when σ sat on an eigenvalue. */
  shift: { requested: number; used: number; note?: string };
  completeness: Completeness;
  restarts: number;
  /** Random start vectors used: the first block, plus any added when the count showed modes missing. */
  startVectors: number;
  /** Applications of (K − σC)⁻¹. */
  solves: number;
  /** Sparse LU factorizations, inertia counts included. */
  factorizations: number;
}

const DEFAULT_TOLERANCE = 1e-9;
const DEFAULT_BLOCK = 3;
const DEFAULT_MAX_RESTARTS = 100;
/** Restarts given to fresh start vectors before the count is taken again. */
const FRESH_PATIENCE = 2;
/** Without a count, answers agreeing to this (relative to |σ| + distance) count as unchanged. */
const UNCHANGED = 1e-10;

export function shiftInvertModes(pattern: CscPattern, K: Float64Array, C: Float64Array, options: ShiftInvertOptions): ShiftInvertModes {
  const nnz = pattern.colPtr[pattern.n];
  if (K.length !== nnz || C.length !== nnz) throw new RangeError(`K and C need ${nnz} values, one per pattern entry`);
  if (!Number.isInteger(options.count) || options.count < 0) throw new RangeError('count must be a whole number ≥ 0');
  if (!Number.isFinite(options.shift)) throw new RangeError('shift must be finite');
  const tol = options.tolerance ?? DEFAULT_TOLERANCE;
  const maxRestarts = options.maxRestarts ?? DEFAULT_MAX_RESTARTS;

  const reduced = withoutInertNodes(pattern, K, C);
  const { pattern: P, K: kv, C: cv } = reduced;
  const n = P.n;
  const want = Math.min(options.count, n);
  const kNorm = realNorm1(P, kv);
  const cNorm = realNorm1(P, cv);
  const sym = analyzeLu(P);
  const shifted = factorShifted(sym, P, kv, cv, options.shift, kNorm > 0 && cNorm > 0 ? kNorm / cNorm : 1);
  const sigma = shifted.sigma;
  const op = shiftInvertOperator(shifted, P, cv);
  const block = Math.max(1, Math.min(options.blockSize ?? DEFAULT_BLOCK, n));
  const lanczos = new BandLanczos({
    n,
    op,
    applyC: (x, out) => realMatVec(P, cv, x, out),
    clean: nullSpaceCleaner(P, kv, cv),
    capacity: Math.max(options.subspace ?? 2 * want + 20, want + 2 * block + 2),
    rand: seededUniform(options.seed ?? 1),
  });

  let restarts = 0;
  let factorizations = shifted.attempts;
  let purifications = 0;
  const purify = (r: RitzPairs, t: number): PurifiedPair => {
    purifications++;
    return purifiedPair(lanczos.ritzVector(r, t), op, P, kv, cv, kNorm, cNorm);
  };
  const nearest = (pairs: PurifiedPair[]) =>
    [...pairs].sort((a, b) => Math.abs(a.lambda - options.shift) - Math.abs(b.lambda - options.shift)).slice(0, want);
  const finish = (all: PurifiedPair[], completeness: Completeness): ShiftInvertModes => {
    const pairs = nearest(all);
    return {
      values: Float64Array.from(pairs, (pr) => pr.lambda),
      vectors: pairs.map((pr) => normalizedShape(expandToAllNodes(reduced, pr.x))),
      residuals: Float64Array.from(pairs, (pr) => pr.residual),
      shift: { requested: options.shift, used: sigma, note: shifted.note },
      completeness,
      restarts,
      startVectors: lanczos.startVectors,
      solves: lanczos.solves + purifications,
      factorizations,
    };
  };
  if (want === 0) return finish([], { method: 'whole-space' });

  /** Eigenvalues with |λ − σ| < radius, from two inertia counts; null if either is refused. */
  const countInside = (radius: number): number | null => {
    factorizations += sigma - radius > 0 ? 2 : 1;
    const above = eigenvaluesBelow(sym, P, kv, cv, sigma + radius);
    const below = eigenvaluesBelow(sym, P, kv, cv, sigma - radius);
    return above === null || below === null ? null : above - below;
  };

  let wantNow = want; // grows when pairs tied with the k-th, or missing ones, must converge too
  let pending = block; // start vectors to add before the next expansions
  let ritzTol = tol;
  let cheapConverged = 0;
  let judgeAfter = 0; // after adding start vectors, the restart before which no new count is taken
  let freshRound: { values: number[]; restarts: number } | null = null;
  let ritz: RitzPairs | null = null;

  /** Thick restart keeping the wanted pairs and half the spare room, with at least two expansions per window vector. */
  const restartWithRoom = (r: RitzPairs, extra: number) => {
    if (restarts >= maxRestarts) throw new ModesNotConvergedError(cheapConverged, want, restarts, tol);
    const window = lanczos.window + extra;
    lanczos.grow(wantNow + 5 * window + 4);
    const room = lanczos.capacity - window;
    lanczos.restart(r, Math.max(0, Math.min(lanczos.expanded, room - 1, wantNow + Math.max(0, Math.floor((room - wantNow) / 2)))));
    restarts++;
  };

  /** Every wanted pair converged: finished, or what next ('fresh': start vectors asked via `pending`). */
  const decide = (pairs: PurifiedPair[], r: RitzPairs): ShiftInvertModes | 'fresh' | 'iterate' => {
    if (pairs.length < want) {
      pending = 1; // the Krylov space closed before holding k modes: look for a direction not yet in it
      return 'fresh';
    }
    if (restarts < judgeAfter) return 'iterate';
    const verdict = judgeCompleteness(
      pairs.map((pr) => Math.abs(pr.lambda - sigma)),
      r.order.map((t) => Math.abs(1 / r.theta[t])),
      want,
      sigma,
      countInside,
    );
    switch (verdict.kind) {
      case 'complete':
        return finish(pairs, { method: 'inertia', counted: verdict.counted, found: verdict.found });
      case 'missing':
        wantNow = Math.max(wantNow, verdict.want);
        pending = verdict.fresh;
        judgeAfter = restarts + FRESH_PATIENCE;
        return 'fresh';
      case 'converge-more':
        wantNow = Math.max(wantNow, verdict.want);
        return 'iterate';
      case 'no-count': {
        // Let a fresh block run a while; accept once it leaves the answer unchanged.
        const values = nearest(pairs).map((pr) => pr.lambda).sort((a, b) => a - b);
        const scale = Math.abs(sigma) + Math.max(...values.map((v) => Math.abs(v - sigma)));
        const before = freshRound;
        if (before && restarts - before.restarts < FRESH_PATIENCE) return 'iterate';
        if (before && values.every((v, i) => Math.abs(v - before.values[i]) <= UNCHANGED * scale)) {
          return finish(pairs, { method: 'fresh-start' });
        }
        freshRound = { values, restarts };
        pending = block;
        return 'fresh';
      }
    }
  };

  for (;;) {
    if (pending > 0) {
      if (ritz && lanczos.size + pending >= lanczos.capacity) restartWithRoom(ritz, pending);
      lanczos.grow(lanczos.size + pending + 1);
      let added = 0;
      while (added < pending && lanczos.addStartVector()) added++;
      pending = 0;
      if (added === 0 && lanczos.window === 0) {
        // Nothing new can enter and nothing is left to expand: the basis holds every finite mode.
        const r = lanczos.ritz();
        const pairs = r.order.slice(0, Math.min(wantNow, r.size)).map((t) => purify(r, t));
        const good = pairs.filter((pr) => pr.residual <= tol).length;
        if (good < pairs.length) throw new ModesNotConvergedError(Math.min(good, want), want, restarts, tol);
        return finish(pairs, { method: 'whole-space' });
      }
    }
    lanczos.expandAll();

    const r = (ritz = lanczos.ritz());
    const wanted = r.order.slice(0, Math.min(wantNow, r.size));
    const meets = (t: number) => r.residual[t] <= ritzTol * Math.abs(r.theta[t]);
    cheapConverged = wanted.slice(0, want).filter(meets).length;
    const windowEmpty = lanczos.window === 0;

    if (wanted.every(meets) || windowEmpty) {
      const pairs = wanted.map((t) => purify(r, t));
      if (pairs.every((pr) => pr.residual <= tol)) {
        const next = decide(pairs, r);
        if (next === 'fresh') continue;
        if (next !== 'iterate') return next;
      } else {
        // The Ritz estimate was optimistic for these vectors: ask more of it from now on.
        ritzTol = Math.max(ritzTol * 1e-2, 1e-15);
      }
    }
    if (windowEmpty) pending = Math.max(pending, 1);
    else restartWithRoom(r, 0);
  }
}

/** Unit 2-norm, sign so that the largest-magnitude entry is positive (as the dense solver returns them). */
function normalizedShape(x: Float64Array): Float64Array {
  let big = 0;
  let sum = 0;
  for (let i = 0; i < x.length; i++) {
    sum += x[i] * x[i];
    if (Math.abs(x[i]) > Math.abs(x[big])) big = i;
  }
  const scale = (x[big] < 0 ? -1 : 1) / Math.sqrt(sum);
  return x.map((v) => v * scale);
}
