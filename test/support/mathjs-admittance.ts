// J(ω) stamped independently with mathjs complex arithmetic (the outside reference library): each part's
// admittance 1/(R_esr + Z) added at its two nodes and subtracted between them, ground left out (nodal
// analysis, common practice).
import * as math from 'mathjs';
import type { Part } from '../../src/board/types.js';

/** The grounded admittance matrix of `parts` over the nodes `names` (in that order) at angular frequency omega. */
export function mathjsAdmittanceMatrix(parts: readonly Part[], names: readonly string[], omega: number): math.Matrix {
  const n = names.length;
  const J = math.zeros(n, n) as math.Matrix;
  const j = math.complex(0, 1);
  for (const p of parts) {
    const r = p.esr ?? 0;
    const z =
      p.kind === 'R'
        ? math.complex(p.value, 0)
        : p.kind === 'C'
          ? math.add(r, math.divide(1, math.multiply(j, omega * p.value)))
          : math.add(r, math.multiply(j, omega * p.value));
    const y = math.divide(1, z) as math.Complex;
    const a = names.indexOf(p.nodes[0]);
    const b = names.indexOf(p.nodes[1]);
    const add = (r0: number, c0: number, v: math.Complex) => J.set([r0, c0], math.add(J.get([r0, c0]), v));
    if (a >= 0) add(a, a, y);
    if (b >= 0) add(b, b, y);
    if (a >= 0 && b >= 0) {
      add(a, b, math.unaryMinus(y) as math.Complex);
      add(b, a, math.unaryMinus(y) as math.Complex);
    }
  }
  return J;
}
