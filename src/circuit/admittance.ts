// Complex admittance of one two-terminal part at angular frequency w (rad/s).
// C and L carry an optional series resistance (ESR / winding resistance); R is ideal.
import type { Part } from '../board/types.js';

export interface Complex {
  re: number;
  im: number;
}

/** Admittance Y = 1/Z of a part at angular frequency `omega` (> 0). */
export function partAdmittance(part: Pick<Part, 'kind' | 'value' | 'esr'>, omega: number): Complex {
  const r = part.esr ?? 0;
  switch (part.kind) {
    case 'R':
      return { re: 1 / part.value, im: 0 };
    case 'C': {
      // Z = r - j/(wC); without series resistance Y = jwC exactly (no 1/Z round trip).
      if (r === 0) return { re: 0, im: omega * part.value };
      return reciprocal(r, -1 / (omega * part.value));
    }
    case 'L': {
      // Z = r + jwL
      return reciprocal(r, omega * part.value);
    }
  }
}

/** 1/(a + jb) without overflow for large |a|, |b| (Smith's method). */
export function reciprocal(a: number, b: number): Complex {
  if (Math.abs(a) >= Math.abs(b)) {
    const t = b / a;
    const d = a + b * t;
    return { re: 1 / d, im: -t / d };
  }
  const t = a / b;
  const d = a * t + b;
  return { re: t / d, im: -1 / d };
}
