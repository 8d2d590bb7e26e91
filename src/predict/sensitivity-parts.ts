// How a part's admittance moves with its value: p · dy/dp, the derivative with respect to ln p.
// The series resistance r is held fixed (as the tolerance samples do). With Z_part = r + X(p):
//   capacitor  X = 1/(jωC):  C dy/dC = y² · (1/(jωC))      (dX/dC = −X/C, dy = −y² dZ)
//   inductor   X = jωL:      L dy/dL = −y² · jωL
//   resistor   y = 1/R:      R dy/dR = −1/R
import type { Part } from '../board/types.js';
import { partAdmittance, type Complex } from '../circuit/admittance.js';

export function admittanceLogDerivative(part: Pick<Part, 'kind' | 'value' | 'esr'>, omega: number): Complex {
  if (part.kind === 'R') return { re: -1 / part.value, im: 0 };
  const y = partAdmittance(part, omega);
  const y2 = { re: y.re * y.re - y.im * y.im, im: 2 * y.re * y.im };
  // m = −p·dX/dp: −j/(ωC) for a capacitor, −jωL for an inductor; then p·dy/dp = y²·m.
  const m = part.kind === 'C' ? -1 / (omega * part.value) : -omega * part.value;
  return { re: -y2.im * m, im: y2.re * m };
}
