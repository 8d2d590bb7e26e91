// The fit's least-squares problem: residuals of every used reading at parameters θ, and their Jacobian
// from adjoint sensitivities (sensitivity.ts). Two residuals per reading, the real and imaginary parts of
//   log(Z_model / Z_measured) = (log|Z_model| - log|Z_measured|) + j(arg Z_model - arg Z_measured),
// so the phase difference comes out wrapped to (-π, π] by construction. Both are divided by the reading's
// noise σ = relative + floor/|Z|: complex noise of standard deviation s on re and im moves log|Z| and the
// phase by about s/|Z| each (first order, common practice). An all-parts fit appends one prior row per part.
// Given the common leads of the fixture (diagnose-leads.ts), the model reading is Z_s + Z / (1 + Z·Y_o)
// of the board's Z, so that the fixture is not fitted into the parts; dZ_read/dθ = (dZ/dθ) / (1 + Z·Y_o)².
import { throughLeads, throughLeadsGain, type CommonLeads } from './diagnose-leads.js';
import type { Part } from '../board/types.js';
import { ImpedanceSolver, SingularBoardError } from '../circuit/impedance.js';
import type { GroundedLaplacian } from '../circuit/laplacian.js';
import type { ComplexVector } from '../numeric/types.js';
import type { FitParameters, PartState } from './fit-parameters.js';
import type { PreparedReadings } from './fit-readings.js';
import type { LeastSquaresProblem } from './fit-levenberg-marquardt.js';
import { admittanceDerivatives } from './sensitivity-admittance.js';
import { probeImpedance, probeSensitivities, type InverseColumn } from './sensitivity.js';

export interface NoiseModel {
  /** Relative noise per reading: the standard deviation of re and im as a fraction of |Z|. */
  relative: number;
  /** Absolute noise floor, ohms. */
  floor: number;
}

export class FitModel implements LeastSquaresProblem {
  readonly parameterCount: number;
  readonly residualCount: number;
  /** Rows 0 .. 2·readings-1 are readings; the prior rows follow. */
  readonly readingRows: number;
  /** Why the last evaluation failed (a singular J), if it did. */
  lastFailure?: string;
  private readonly sigma: Float64Array;
  private readonly priors: { parameter: number; center: number; width: number }[];
  private readonly solver: ImpedanceSolver;
  private readonly ends: Int32Array;
  private readonly current = new Map<Part, Part>();

  constructor(
    private readonly laplacian: GroundedLaplacian,
    private readonly readings: PreparedReadings,
    private readonly parameters: FitParameters,
    noise: NoiseModel,
    private readonly leads?: CommonLeads,
  ) {
    this.parameterCount = parameters.count;
    this.priors = parameters.definitions.flatMap((d, m) =>
      d.priorWidth === undefined ? [] : [{ parameter: m, center: Math.log(d.nominal), width: d.priorWidth }],
    );
    this.readingRows = 2 * readings.used.length;
    this.residualCount = this.readingRows + this.priors.length;
    this.sigma = new Float64Array(readings.used.length);
    this.setNoise(noise);
    // One solver for the whole fit: the symbolic analysis is done once, and the part map reads the values
    // of the parameters being evaluated.
    this.solver = new ImpedanceSolver(laplacian, (part) => this.current.get(part) ?? part);
    const index = laplacian.index;
    this.ends = Int32Array.from(laplacian.board.parts.flatMap((p) => [index.row(p.nodes[0]), index.row(p.nodes[1])]));
  }

  setNoise(noise: NoiseModel): void {
    this.readings.used.forEach((r, i) => (this.sigma[i] = noise.relative + noise.floor / r.magnitude));
  }

  /** Noise σ of each used reading, in log units, in residual order. */
  get readingSigma(): Float64Array {
    return this.sigma;
  }

  residuals(theta: Float64Array): Float64Array {
    return this.evaluate(theta, false).residuals;
  }

  residualsAndJacobian(theta: Float64Array): { residuals: Float64Array; jacobian: Float64Array } {
    const { residuals, jacobian } = this.evaluate(theta, true);
    return { residuals, jacobian: jacobian! };
  }

  private evaluate(theta: Float64Array, withJacobian: boolean): { residuals: Float64Array; jacobian?: Float64Array } {
    const P = this.parameterCount;
    const residuals = new Float64Array(this.residualCount);
    const jacobian = withJacobian ? new Float64Array(this.residualCount * P) : undefined;
    const parts = this.laplacian.board.parts;
    const states = this.parameters.partStates(theta);
    parts.forEach((part, k) => this.current.set(part, { ...part, value: states[k].value, esr: states[k].esr }));
    this.lastFailure = undefined;

    const names = this.laplacian.index.names;
    const g: ComplexVector = { re: new Float64Array(parts.length), im: new Float64Array(parts.length) };
    const acc: ComplexVector = { re: new Float64Array(P), im: new Float64Array(P) };
    let row = 0;
    let reading = 0;
    for (const group of this.readings.groups) {
      let column: InverseColumn;
      try {
        const solved = this.solver.at(group.frequencyHz);
        column = (r) => solved.responseTo(names[r]);
      } catch (error) {
        if (!(error instanceof SingularBoardError)) throw error;
        this.lastFailure = error.message;
        residuals.fill(Number.NaN);
        return { residuals, jacobian };
      }
      const omega = 2 * Math.PI * group.frequencyHz;
      const admittance = withJacobian ? admittanceByParameter(parts, states, omega) : undefined;
      for (const r of group.readings) {
        const board = admittance ? probeSensitivities(column, r.probe, this.ends, g) : probeImpedance(column, r.probe);
        const leads = this.leads ? (r.reading.kind === 'transfer' ? this.leads.transfer : this.leads.twoTerminal) : undefined;
        const [zRe, zIm] = leads ? throughLeads(leads, omega, board.re, board.im) : [board.re, board.im];
        const z = { re: zRe, im: zIm };
        const s = this.sigma[reading++];
        const m2 = r.re * r.re + r.im * r.im;
        residuals[row] = (0.5 * Math.log((z.re * z.re + z.im * z.im) / m2)) / s;
        residuals[row + 1] = Math.atan2(z.im * r.re - z.re * r.im, z.re * r.re + z.im * r.im) / s;
        if (jacobian && admittance) {
          acc.re.fill(0);
          acc.im.fill(0);
          for (let k = 0; k < parts.length; k++) {
            const gr = g.re[k];
            const gi = g.im[k];
            for (let d = admittance.start[k]; d < admittance.start[k + 1]; d++) {
              const m = admittance.parameter[d];
              acc.re[m] += gr * admittance.re[d] - gi * admittance.im[d];
              acc.im[m] += gr * admittance.im[d] + gi * admittance.re[d];
            }
          }
          if (leads) {
            const [gRe, gIm] = throughLeadsGain(leads, omega, board.re, board.im);
            for (let m = 0; m < P; m++) {
              const re = acc.re[m] * gRe - acc.im[m] * gIm;
              acc.im[m] = acc.re[m] * gIm + acc.im[m] * gRe;
              acc.re[m] = re;
            }
          }
          // d log Z = dZ / Z: its real part moves log|Z|, its imaginary part the phase.
          const zz = z.re * z.re + z.im * z.im;
          for (let m = 0; m < P; m++) {
            jacobian[row * P + m] = (acc.re[m] * z.re + acc.im[m] * z.im) / zz / s;
            jacobian[(row + 1) * P + m] = (acc.im[m] * z.re - acc.re[m] * z.im) / zz / s;
          }
        }
        row += 2;
      }
    }
    for (const prior of this.priors) {
      residuals[row] = (theta[prior.parameter] - prior.center) / prior.width;
      if (jacobian) jacobian[row * P + prior.parameter] = 1 / prior.width;
      row++;
    }
    return { residuals, jacobian };
  }
}

/** dy_k/dθ_m of every part k at one frequency, flat: entries start[k] .. start[k+1]-1 belong to part k. */
interface AdmittanceByParameter {
  start: Int32Array;
  parameter: Int32Array;
  re: Float64Array;
  im: Float64Array;
}

function admittanceByParameter(parts: readonly Part[], states: readonly PartState[], omega: number): AdmittanceByParameter {
  const start = new Int32Array(parts.length + 1);
  const parameter: number[] = [];
  const re: number[] = [];
  const im: number[] = [];
  parts.forEach((part, k) => {
    const state = states[k];
    const terms = new Map<number, { re: number; im: number }>();
    if (state.valueDeps.length + state.esrDeps.length > 0) {
      const dy = admittanceDerivatives(part.kind, state.value, state.esr, omega);
      const add = (m: number, by: { re: number; im: number }, d: number) => {
        const t = terms.get(m) ?? { re: 0, im: 0 };
        t.re += by.re * d;
        t.im += by.im * d;
        terms.set(m, t);
      };
      for (const [m, d] of state.valueDeps) add(m, dy.byValue, d);
      for (const [m, d] of state.esrDeps) add(m, dy.byResistance, d);
    }
    for (const [m, t] of terms) {
      parameter.push(m);
      re.push(t.re);
      im.push(t.im);
    }
    start[k + 1] = parameter.length;
  });
  return { start, parameter: Int32Array.from(parameter), re: Float64Array.from(re), im: Float64Array.from(im) };
}
