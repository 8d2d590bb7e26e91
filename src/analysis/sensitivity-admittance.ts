// A part's admittance y and its derivatives with respect to the part's value and its series resistance
// r, analytic, for the adjoint sensitivities of the fit. With Z the part's series impedance, y = 1/Z and
// dy = -y² dZ (common practice):
//   C:  Z = r - j/(ωC)   dZ/dC = j/(ωC²)   dZ/dr = 1
//   L:  Z = r + jωL      dZ/dL = jω        dZ/dr = 1
//   R:  y = 1/R          dy/dR = -1/R²     (a resistor has no separate series resistance)
import type { PartKind } from '../board/types.js';
import { partAdmittance, type Complex } from '../circuit/admittance.js';

export interface AdmittanceDerivatives {
  y: Complex;
  /** dy / d(value), in siemens per farad, henry or ohm. */
  byValue: Complex;
  /** dy / d(series resistance), siemens per ohm; zero for a resistor. */
  byResistance: Complex;
}

export function admittanceDerivatives(kind: PartKind, value: number, esr: number, omega: number): AdmittanceDerivatives {
  const y = partAdmittance({ kind, value, esr }, omega);
  if (kind === 'R') return { y, byValue: { re: -1 / (value * value), im: 0 }, byResistance: { re: 0, im: 0 } };
  // -y², the derivative with respect to anything that adds to Z one to one.
  const minusY2 = { re: -(y.re * y.re - y.im * y.im), im: -2 * y.re * y.im };
  // dZ/dvalue is purely imaginary in both cases: j·b.
  const b = kind === 'C' ? 1 / (omega * value * value) : omega;
  return { y, byValue: { re: -minusY2.im * b, im: minusY2.re * b }, byResistance: minusY2 };
}
