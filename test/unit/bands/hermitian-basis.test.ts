// Picking complex vectors out of the doubled real eigenvectors of the embedding. Checked with mathjs complex
// arithmetic: the result must be C-orthonormal and span the same complex space as the inputs.
import { describe, expect, it } from 'vitest';
import * as math from 'mathjs';
import { complexBasisFromEmbedded } from '../../../src/numeric/hermitian-basis.js';
import { seededRandom } from '../../support/make-board.js';

describe('complexBasisFromEmbedded', () => {
  it('skips the partner copy [-b; a] of a chosen vector [a; b], even when it comes right after it', () => {
    const rand = seededRandom(5);
    const n = 4;
    // Two complex directions u, w; inputs in the order u, iu, w, iw (realified), the worst order for plain Gram-Schmidt.
    const u = Array.from({ length: n }, () => math.complex(rand() - 0.5, rand() - 0.5));
    const w = Array.from({ length: n }, () => math.complex(rand() - 0.5, rand() - 0.5));
    const realify = (z: math.Complex[]) => Float64Array.from([...z.map((c) => c.re), ...z.map((c) => c.im)]);
    const times = (z: math.Complex[], s: math.Complex) => z.map((c) => math.multiply(c, s) as math.Complex);
    const inputs = [realify(u), realify(times(u, math.complex(0, 1))), realify(w), realify(times(w, math.complex(0, 1)))];
    // C Hermitian positive definite: B^H B + I.
    const Bm = math.matrix(Array.from({ length: n }, () => Array.from({ length: n }, () => math.complex(rand() - 0.5, rand() - 0.5))));
    const Cm = math.add(math.multiply(math.ctranspose(Bm), Bm), math.identity(n)) as math.Matrix;
    const C = { re: new Float64Array(n * n), im: new Float64Array(n * n) };
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) {
        const z = math.complex(Cm.get([i, j]));
        C.re[i * n + j] = z.re;
        C.im[i * n + j] = z.im;
      }

    const basis = complexBasisFromEmbedded(n, C, inputs, 2);
    const Q = math.matrix(Array.from({ length: n }, (_, i) => basis.map((q) => math.complex(q.re[i], q.im[i]))));
    const gram = math.multiply(math.multiply(math.ctranspose(Q), Cm), Q);
    expect(math.norm(math.subtract(gram, math.identity(2)) as math.Matrix, 'fro') as number).toBeLessThan(1e-12);
    // Same span: u and w are reproduced by their C-projections on the basis.
    for (const z of [u, w]) {
      const zc = math.matrix(z.map((c) => [c]));
      const coeff = math.multiply(math.multiply(math.ctranspose(Q), Cm), zc);
      const miss = math.subtract(zc, math.multiply(Q, coeff)) as math.Matrix;
      expect((math.norm(miss, 'fro') as number) / (math.norm(zc, 'fro') as number)).toBeLessThan(1e-12);
    }
  });
});
