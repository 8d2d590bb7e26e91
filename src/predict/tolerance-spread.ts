// The spread of one predicted reading under part tolerances: the nominal value and the extremes of its
// magnitude and of its phase measured from the nominal phase. Phases are compared as arg(z · conj(z₀)),
// which is already wrapped to (−π, π], so a spread around ±180° needs no special case.
import type { Complex } from '../circuit/admittance.js';

export interface PointSpread {
  nominal: Complex;
  mag_min_ohm: number;
  mag_max_ohm: number;
  /** Smallest and largest phase deviation from the nominal phase, radians, within [−π, π]. */
  phase_dev_min_rad: number;
  phase_dev_max_rad: number;
}

/** Collects sample values of one reading; the nominal is always inside what it reports. */
export class SpreadAccumulator {
  private magMin: number;
  private magMax: number;
  private devMin = 0;
  private devMax = 0;

  constructor(readonly nominal: Complex) {
    this.magMin = this.magMax = Math.hypot(nominal.re, nominal.im);
  }

  add(z: Complex): void {
    const mag = Math.hypot(z.re, z.im);
    if (mag < this.magMin) this.magMin = mag;
    if (mag > this.magMax) this.magMax = mag;
    const { re: a, im: b } = this.nominal;
    // z · conj(z₀)
    const dev = Math.atan2(z.im * a - z.re * b, z.re * a + z.im * b);
    if (dev < this.devMin) this.devMin = dev;
    if (dev > this.devMax) this.devMax = dev;
  }

  result(): PointSpread {
    return { nominal: this.nominal, mag_min_ohm: this.magMin, mag_max_ohm: this.magMax, phase_dev_min_rad: this.devMin, phase_dev_max_rad: this.devMax };
  }
}
