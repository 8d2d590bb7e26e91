// How badly a set of predicted readings misses the measured ones. Each reading is compared as the
// complex logarithm of measured / predicted: its real part is the error in ln|Z| and its imaginary part
// the phase error, so small and large impedances weigh alike and a reading relative error ε costs the
// same anywhere on the board. In units of the reading's noise, a Huber loss (quadratic up to a knee,
// linear beyond; P. J. Huber, Ann. Math. Stat. 35, 73 (1964)) keeps a few wild readings from deciding
// the ranking alone, while noise-sized errors count as in least squares.
import { throughLeads, type CommonLeads } from './diagnose-leads.js';
import type { PreparedScan } from './diagnose-scan.js';

/** Errors beyond this many noise widths count linearly. */
const HUBER_KNEE = 3;
/** Impedances below this (ohms) are compared as this: a log needs a floor. */
const FLOOR_OHMS = 1e-9;
const FLOOR_SQUARED = FLOOR_OHMS * FLOOR_OHMS;

export class MisfitMeter {
  private readonly measuredRe: Float64Array;
  private readonly measuredIm: Float64Array;
  private readonly lnMeasured2: Float64Array;
  /** ω of each reading, and whether it is a transfer reading (it sees the transfer set of the leads). */
  private readonly omega: Float64Array;
  private readonly isTransfer: Uint8Array;
  private readonly inverseNoise2: number;
  private readonly floor2: number;
  /** The common fixture every two-terminal prediction is seen through (diagnose-leads.ts); none by default. */
  private leads: CommonLeads | undefined;

  /**
   * `floorOhms`: the fixture's absolute floor (contact and lead resistance, pickup). Magnitudes are compared
   * as sqrt(|Z|^2 + floor^2), and the phase error is weighted by |Z| / (|Z| + floor): a reading the size of
   * the floor says nothing about either, so a node the fault has cut off (predicted ~0, read as the contact
   * resistance) agrees with its prediction instead of dominating the misfit.
   */
  constructor(
    scan: PreparedScan,
    readonly noise: number,
    readonly floorOhms = 0,
  ) {
    const n = scan.readings.length;
    this.floor2 = Math.max(floorOhms * floorOhms, FLOOR_SQUARED);
    this.measuredRe = new Float64Array(n);
    this.measuredIm = new Float64Array(n);
    this.lnMeasured2 = new Float64Array(n);
    this.omega = new Float64Array(n);
    this.isTransfer = new Uint8Array(n);
    scan.readings.forEach((r, i) => {
      this.omega[i] = scan.groups[r.group].omega;
      this.isTransfer[i] = r.source.kind === 'transfer' ? 1 : 0;
      this.measuredRe[i] = r.measured.re;
      this.measuredIm[i] = r.measured.im;
      this.lnMeasured2[i] = Math.log(this.magnitude2(r.measured.re ** 2 + r.measured.im ** 2));
    });
    this.inverseNoise2 = 1 / (noise * noise);
  }

  /** The same meter, with every prediction seen through `leads`. */
  withLeads(leads: CommonLeads): MisfitMeter {
    const copy = Object.create(MisfitMeter.prototype) as MisfitMeter;
    Object.assign(copy, this);
    copy.leads = leads;
    return copy;
  }

  get count(): number {
    return this.measuredRe.length;
  }

  private magnitude2(z2: number): number {
    return this.floorOhms > 0 ? z2 + this.floor2 : Math.max(z2, FLOOR_SQUARED);
  }

  /** Mean loss per reading of `predicted` (re and im interleaved, one pair per reading). */
  of(predicted: Float64Array): number {
    let total = 0;
    for (let i = 0; i < this.measuredRe.length; i++) total += this.lossAt(i, predicted[2 * i], predicted[2 * i + 1]);
    return total / this.measuredRe.length;
  }

  /** Loss of one reading against a predicted value. */
  lossAt(i: number, re: number, im: number): number {
    if (this.leads) [re, im] = throughLeads(this.isTransfer[i] ? this.leads.transfer : this.leads.twoTerminal, this.omega[i], re, im);
    const z2 = re * re + im * im;
    if (!Number.isFinite(z2)) return huberOfSquare(1e12);
    const mRe = this.measuredRe[i];
    const mIm = this.measuredIm[i];
    // measured * conj(predicted): its angle is the phase error, and ln|.|^2 follows from the two norms.
    let phase = Math.atan2(mIm * re - mRe * im, mRe * re + mIm * im);
    if (this.floorOhms > 0) {
      const smaller = Math.sqrt(Math.min(z2, mRe * mRe + mIm * mIm));
      phase *= smaller / (smaller + this.floorOhms);
    }
    const lnMagnitude = 0.5 * (this.lnMeasured2[i] - Math.log(this.magnitude2(z2)));
    return huberOfSquare((lnMagnitude * lnMagnitude + phase * phase) * this.inverseNoise2);
  }
}

/** Huber loss of t, given t² (the square root is only needed beyond the knee). */
function huberOfSquare(t2: number): number {
  return t2 <= HUBER_KNEE * HUBER_KNEE ? t2 : HUBER_KNEE * (2 * Math.sqrt(t2) - HUBER_KNEE);
}
