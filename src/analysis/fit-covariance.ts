// Parameter uncertainties from the Jacobian at the solution: cov(θ) = (JᵀJ)⁻¹ · s², with s² the residual
// variance |r|² / (rows - parameters) (the usual linearized estimate; common practice in least squares).
// The inverse goes through the eigen-decomposition of JᵀJ scaled to unit diagonal, so that a direction the
// readings do not fix (an eigenvalue below RANK_TOLERANCE of the largest) is reported as such, with an
// infinite uncertainty on every parameter that takes part in it, instead of a huge meaningless number.
import { symmetricEigen } from '../numeric/dense-symmetric-eigen.js';
import { normalMatrix } from './fit-levenberg-marquardt.js';

export const RANK_TOLERANCE = 1e-12;
/** A parameter whose squared share of an unfixed direction exceeds this is called not identifiable. */
const SHARE_IN_NULL = 1e-2;

export interface Covariance {
  /** Row-major P×P covariance of θ (the log values); unidentifiable rows and columns are NaN. */
  matrix: Float64Array;
  /** Standard deviation of each θ_m; Infinity where the readings do not fix it. */
  sigma: Float64Array;
  identifiable: boolean[];
}

export function covarianceFromJacobian(jacobian: Float64Array, rows: number, P: number, residualVariance: number): Covariance {
  const normal = normalMatrix(jacobian, rows, P);
  if (!normal.every(Number.isFinite)) {
    // Nothing can be said; better an honest "unknown" than an exception after a long fit.
    return { matrix: new Float64Array(P * P).fill(Number.NaN), sigma: new Float64Array(P).fill(Infinity), identifiable: new Array<boolean>(P).fill(false) };
  }
  const d = Float64Array.from({ length: P }, (_, m) => Math.sqrt(normal[m * P + m]));
  const scaled = new Float64Array(P * P);
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) scaled[i * P + j] = d[i] > 0 && d[j] > 0 ? normal[i * P + j] / (d[i] * d[j]) : i === j ? 1 : 0;
  }
  const { values, vectors } = symmetricEigen(P, scaled);
  const largest = values.length > 0 ? values[values.length - 1] : 0;
  const identifiable = Array.from({ length: P }, (_, m) => d[m] > 0);
  const inverse = new Float64Array(P * P);
  for (let k = 0; k < P; k++) {
    if (values[k] > RANK_TOLERANCE * largest) {
      for (let i = 0; i < P; i++) {
        const vi = vectors[i * P + k] / values[k];
        for (let j = 0; j < P; j++) inverse[i * P + j] += vi * vectors[j * P + k];
      }
    } else {
      for (let i = 0; i < P; i++) if (vectors[i * P + k] ** 2 > SHARE_IN_NULL) identifiable[i] = false;
    }
  }
  const matrix = new Float64Array(P * P);
  const sigma = new Float64Array(P);
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) {
      matrix[i * P + j] = identifiable[i] && identifiable[j] ? (inverse[i * P + j] * residualVariance) / (d[i] * d[j]) : Number.NaN;
    }
    sigma[i] = identifiable[i] ? Math.sqrt(matrix[i * P + i]) : Infinity;
  }
  return { matrix, sigma, identifiable };
}
