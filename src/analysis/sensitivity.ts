// Adjoint sensitivities of a reading to every part's admittance, from the columns of J⁻¹ that the reading
// itself needs (the adjoint network method, Tellegen's theorem; common practice in circuit theory).
//
// A reading drives 1 A into `hi` and out at `lo` and senses the voltage at `sense` against `lo`:
//   Z = aᵀ J⁻¹ b,   b = e_hi - e_lo (drive),   a = e_sense - e_lo (sense; a = b unless it is a transfer).
// J is complex symmetric, so with x = J⁻¹b and w = J⁻¹a and part k between nodes u and v adding
// y_k (e_u - e_v)(e_u - e_v)ᵀ to J:
//   ∂Z/∂y_k = -aᵀ J⁻¹ (∂J/∂y_k) J⁻¹ b = -(w_u - w_v)(x_u - x_v).
// Every part's sensitivity thus costs two subtractions and a product once x and w are known, instead of
// one more factorization per part as with finite differences.
import type { Complex } from '../circuit/admittance.js';
import type { ComplexVector } from '../numeric/types.js';

/** Rows of the grounded Laplacian a reading uses; -1 stands for ground. */
export interface Probe {
  hi: number;
  lo: number;
  sense: number;
}

/** Column `row` of J⁻¹ (the node voltages for 1 A into that node); never asked for ground. */
export type InverseColumn = (row: number) => ComplexVector;

/** The two end rows of every part, flat: ends[2k], ends[2k + 1] (-1 for ground). */
export type PartEnds = Int32Array;

/** The model's value of a reading: Z = (e_sense - e_lo)ᵀ J⁻¹ (e_hi - e_lo). */
export function probeImpedance(column: InverseColumn, probe: Probe): Complex {
  const drive = driveVector(column, probe);
  return { re: difference(drive.re, probe.sense, probe.lo), im: difference(drive.im, probe.sense, probe.lo) };
}

/**
 * Z and ∂Z/∂y_k for every part k, written into `out` (re and im arrays of the part count).
 * The columns are shared by all readings at one frequency, so callers should cache them.
 */
export function probeSensitivities(column: InverseColumn, probe: Probe, ends: PartEnds, out: ComplexVector): Complex {
  const x = driveVector(column, probe);
  const w = probe.sense === probe.hi ? x : senseVector(column, probe);
  const parts = ends.length / 2;
  for (let k = 0; k < parts; k++) {
    const u = ends[2 * k];
    const v = ends[2 * k + 1];
    const xr = difference(x.re, u, v);
    const xi = difference(x.im, u, v);
    const wr = w === x ? xr : difference(w.re, u, v);
    const wi = w === x ? xi : difference(w.im, u, v);
    out.re[k] = -(wr * xr - wi * xi);
    out.im[k] = -(wr * xi + wi * xr);
  }
  return { re: difference(x.re, probe.sense, probe.lo), im: difference(x.im, probe.sense, probe.lo) };
}

/** x = J⁻¹(e_hi - e_lo); a view of a cached column when lo is ground. */
function driveVector(column: InverseColumn, probe: Probe): ComplexVector {
  return columnDifference(column, probe.hi, probe.lo);
}

function senseVector(column: InverseColumn, probe: Probe): ComplexVector {
  return columnDifference(column, probe.sense, probe.lo);
}

function columnDifference(column: InverseColumn, plus: number, minus: number): ComplexVector {
  if (minus < 0) return column(plus);
  const a = column(plus);
  const b = column(minus);
  const re = new Float64Array(a.re.length);
  const im = new Float64Array(a.im.length);
  for (let i = 0; i < re.length; i++) {
    re[i] = a.re[i] - b.re[i];
    im[i] = a.im[i] - b.im[i];
  }
  return { re, im };
}

/** values[u] - values[v], with ground (-1) at zero volts. */
function difference(values: Float64Array, u: number, v: number): number {
  return (u >= 0 ? values[u] : 0) - (v >= 0 ? values[v] : 0);
}
