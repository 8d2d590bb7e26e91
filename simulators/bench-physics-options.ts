// The knobs of the simulated bench: relay contacts, fixture strays, leads, noise and the analyzer's
// range. The defaults are small but not zero, like a real fixture; every parasitic can be set to zero
// for exact comparisons (the contact resistance only to a tiny value: a closed relay is a resistor).

export interface BenchPhysicsOptions {
  /** Ohms across each closed relay contact. Must be > 0; about 1e-6 Ω is "ideal" (far smaller ones lose
   *  digits, as the contact's admittance then swamps the board's in J). Default 0.15 Ω. */
  contactResistance?: number;
  /** Farads from the board node to ground per closed relay (its pads and wiring). Default 15 pF. */
  strayCapacitance?: number;
  /** Series resistance of each of the HI and LO leads to the analyzer, ohms. Default 20 mΩ. */
  leadResistance?: number;
  /** Series inductance of each of the HI and LO leads, henries. Default 50 nH. */
  leadInductance?: number;
  /** Gaussian noise on re and im: standard deviation relative·|Z| + floor (ohms), per single reading. */
  noise?: { relative?: number; floor?: number; seed?: number };
  /** The analyzer reads |Z| between these bounds (ohms); outside them it reports an overload. */
  range?: { minOhms?: number; maxOhms?: number };
  /** How many relay states keep their circuit and symbolic analysis (least recently used go first). */
  cacheSize?: number;
}

export interface ResolvedBenchOptions {
  contactResistance: number;
  strayCapacitance: number;
  leadResistance: number;
  leadInductance: number;
  noise: { relative: number; floor: number; seed: number };
  range: { minOhms: number; maxOhms: number };
  cacheSize: number;
}

export const DEFAULT_BENCH: ResolvedBenchOptions = {
  contactResistance: 0.15,
  strayCapacitance: 15e-12,
  leadResistance: 0.02,
  leadInductance: 50e-9,
  noise: { relative: 1e-4, floor: 1e-4, seed: 1 },
  range: { minOhms: 1e-3, maxOhms: 1e8 },
  cacheSize: 16,
};

/** Options with every parasitic and the noise off, for exact comparisons with the engine. */
export const NO_PARASITICS: BenchPhysicsOptions = {
  strayCapacitance: 0,
  leadResistance: 0,
  leadInductance: 0,
  noise: { relative: 0, floor: 0 },
};

/** A bench option that makes no physical sense; one line naming the option. Exit code 2. */
export class BenchOptionError extends Error {
  readonly exitCode = 2;
  constructor(message: string) {
    super(message);
    this.name = 'BenchOptionError';
  }
}

export function resolveBenchOptions(options: BenchPhysicsOptions = {}): ResolvedBenchOptions {
  const d = DEFAULT_BENCH;
  const resolved: ResolvedBenchOptions = {
    contactResistance: options.contactResistance ?? d.contactResistance,
    strayCapacitance: options.strayCapacitance ?? d.strayCapacitance,
    leadResistance: options.leadResistance ?? d.leadResistance,
    leadInductance: options.leadInductance ?? d.leadInductance,
    noise: { ...d.noise, ...options.noise },
    range: { ...d.range, ...options.range },
    cacheSize: options.cacheSize ?? d.cacheSize,
  };
  positive('contact resistance', resolved.contactResistance, 'a closed relay is modelled as a resistor; use a tiny value such as 1e-6 Ω (far smaller values cost accuracy: the contact then swamps the board in J)');
  notNegative('stray capacitance', resolved.strayCapacitance);
  notNegative('lead resistance', resolved.leadResistance);
  notNegative('lead inductance', resolved.leadInductance);
  notNegative('relative noise', resolved.noise.relative);
  notNegative('noise floor', resolved.noise.floor);
  if (!Number.isInteger(resolved.noise.seed)) throw new BenchOptionError(`noise seed must be a whole number, got ${resolved.noise.seed}`);
  notNegative('range minimum', resolved.range.minOhms);
  positive('range maximum', resolved.range.maxOhms);
  if (!(resolved.range.maxOhms > resolved.range.minOhms)) {
    throw new BenchOptionError(`range maximum (${resolved.range.maxOhms} Ω) must be above the minimum (${resolved.range.minOhms} Ω)`);
  }
  if (!Number.isInteger(resolved.cacheSize) || resolved.cacheSize < 1) {
    throw new BenchOptionError(`relay state cache size must be a whole number of at least 1, got ${resolved.cacheSize}`);
  }
  return resolved;
}

function positive(name: string, value: number, why = ''): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new BenchOptionError(`${name} must be greater than zero and finite, got ${value}${why ? `; ${why}` : ''}`);
}

function notNegative(name: string, value: number): void {
  if (!(value >= 0) || !Number.isFinite(value)) throw new BenchOptionError(`${name} must be zero or more and finite, got ${value}`);
}
