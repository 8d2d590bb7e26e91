// One-dimensional minimization for the fitted value of a candidate: a coarse scan over the whole range
// (the misfit of a wrong-decade part has several dips, and a local search from the nominal value would
// stop in the nearest one), then Brent's method (golden section with parabolic steps; R. P. Brent,
// Algorithms for Minimization without Derivatives, 1973, ch. 5) inside the brackets of the best dips.

export interface Minimum {
  x: number;
  value: number;
}

/** Scans `steps` + 1 evenly spaced points of [lo, hi], then refines the `keep` best local dips. */
export function scanAndRefine(f: (x: number) => number, lo: number, hi: number, steps: number, keep = 3, tolerance = 1e-6): Minimum {
  const xs: number[] = [];
  const fs: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const x = lo + ((hi - lo) * i) / steps;
    xs.push(x);
    fs.push(orInfinity(f(x)));
  }
  const dips: number[] = [];
  for (let i = 0; i <= steps; i++) {
    const left = i === 0 ? Infinity : fs[i - 1];
    const right = i === steps ? Infinity : fs[i + 1];
    if (fs[i] <= left && fs[i] <= right) dips.push(i);
  }
  dips.sort((a, b) => fs[a] - fs[b]);
  let best: Minimum = { x: xs[dips[0] ?? 0], value: fs[dips[0] ?? 0] };
  for (const i of dips.slice(0, keep)) {
    const found = brentMinimize(f, xs[Math.max(i - 1, 0)], xs[Math.min(i + 1, steps)], tolerance);
    if (found.value < best.value) best = found;
  }
  return best;
}

const GOLDEN = (3 - Math.sqrt(5)) / 2;
const SQRT_EPSILON = Math.sqrt(Number.EPSILON);

/** Minimum of f on [a, b] to within about `tolerance` in x. */
export function brentMinimize(f: (x: number) => number, a: number, b: number, tolerance = 1e-6, maxIterations = 100): Minimum {
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = orInfinity(f(x));
  let fw = fx;
  let fv = fx;
  let d = 0;
  let e = 0;
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    const middle = 0.5 * (a + b);
    const tol1 = SQRT_EPSILON * Math.abs(x) + tolerance / 3;
    const tol2 = 2 * tol1;
    if (Math.abs(x - middle) <= tol2 - 0.5 * (b - a)) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      // Parabola through (v, fv), (w, fw), (x, fx); its vertex is x + p / q.
      let r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      r = e;
      e = d;
      if (Math.abs(p) < Math.abs(0.5 * q * r) && p > q * (a - x) && p < q * (b - x)) {
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = x < middle ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = (x < middle ? b : a) - x;
      d = GOLDEN * e;
    }
    const u = x + (Math.abs(d) >= tol1 ? d : d > 0 ? tol1 : -tol1);
    const fu = orInfinity(f(u));
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, value: fx };
}

/** A circuit with no solution (NaN) counts as the worst fit, never as a minimum. */
function orInfinity(value: number): number {
  return Number.isNaN(value) ? Infinity : value;
}
