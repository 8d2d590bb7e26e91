// First-order sensitivities of a reading to every part value, by the adjoint method: two responses of
// the factored J give the derivative for every part at once (Tellegen's theorem; common practice in
// circuit theory). For a reading Z = uᵀ J⁻¹ w and a part k of admittance y_k between nodes a and b,
//   dZ/dy_k = −(x̃_a − x̃_b)(x_a − x_b),   x = J⁻¹w (drive), x̃ = J⁻¹u (adjoint),
// with ground's entries 0 (J is symmetric, so uᵀJ⁻¹ = (J⁻¹u)ᵀ). Times p·dy_k/dp it is dZ/d(ln p_k).
import type { Part } from '../board/types.js';
import type { Complex } from '../circuit/admittance.js';
import type { SolvedFrequency } from '../circuit/impedance.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import type { ComplexVector } from '../numeric/types.js';
import { admittanceLogDerivative } from './sensitivity-parts.js';
import { readingResponses, readingValue, type Reading } from './tolerance-readings.js';

export interface PartSensitivity {
  part: Part;
  /** dZ/d(ln p): the change of the reading per relative change of the part's value. */
  dz: Complex;
}

export interface ReadingSensitivity {
  z: Complex;
  parts: PartSensitivity[];
}

export function readingSensitivities(laplacian: GroundedLaplacian, solved: SolvedFrequency, reading: Reading): ReadingSensitivity {
  const z = readingValue(solved, reading);
  const { drive, adjoint } = readingResponses(solved, reading);
  const omega = 2 * Math.PI * solved.frequencyHz;
  const parts = laplacian.board.parts.map((part): PartSensitivity => {
    const a = laplacian.index.row(part.nodes[0]);
    const b = laplacian.index.row(part.nodes[1]);
    const dx = across(drive, a, b);
    const dxa = across(adjoint, a, b);
    // dZ/dy = −dxa·dx
    const dzdy = { re: -(dxa.re * dx.re - dxa.im * dx.im), im: -(dxa.re * dx.im + dxa.im * dx.re) };
    const dy = admittanceLogDerivative(part, omega);
    return { part, dz: { re: dzdy.re * dy.re - dzdy.im * dy.im, im: dzdy.re * dy.im + dzdy.im * dy.re } };
  });
  return { z, parts };
}

/** v_a − v_b, ground (row −1) reading 0. */
function across(v: ComplexVector, a: number, b: number): Complex {
  const re = (a >= 0 ? v.re[a] : 0) - (b >= 0 ? v.re[b] : 0);
  const im = (a >= 0 ? v.im[a] : 0) - (b >= 0 ? v.im[b] : 0);
  return { re, im };
}
