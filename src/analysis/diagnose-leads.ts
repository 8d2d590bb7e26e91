// The fixture every two-terminal reading shares: relay contacts and leads in series with the board
// (R + jωL), and the pads and wiring of the closed relays as a stray capacitance from the node to ground.
// A real bench always has some; a diagnosis that leaves it out blames the whole board for a few tenths of
// an ohm, and no part then explains the rest. So it is fitted once, globally, as three nuisance
// parameters, and every prediction is seen through it (MisfitMeter.withLeads):
//   Z_read = Z_s + Z / (1 + Z·Y_o),  Z_s = R + jωL,  Y_o = jωC,
// the open/short fixture model of impedance-analyzer practice (handbook: Z_dut = (Z_m − Z_s) / (1 −
// (Z_m − Z_s)·Y_o), solved here for Z_m; common practice). Per-node trouble stays with the fixture-path
// candidates (diagnose-fixture.ts): these are the same for every node.
// Transfer readings get a set of their own: only the LO contact carries their current (the sense input
// draws none), and the strays hang on both the driven and the sensed node, so the same form with its own
// R and C fits them (to first order in the strays).
import type { MisfitMeter } from './diagnose-misfit.js';
import { scanAndRefine } from './diagnose-search.js';

export interface LeadSet {
  /** Series resistance of contacts and leads, ohms. */
  ohms: number;
  /** Series inductance of the leads, henries. */
  henries: number;
  /** Stray capacitance from the probed node to ground, farads. */
  farads: number;
}

export interface CommonLeads {
  /** Seen by to-ground and two-point readings. */
  twoTerminal: LeadSet;
  /** Seen by transfer readings. */
  transfer: LeadSet;
}

/** A board impedance Z = re + j·im as read through `leads`: Z_s + Z / (1 + Z·Y_o), Z_s = R + jωL, Y_o = jωC. */
export function throughLeads(leads: LeadSet, omega: number, re: number, im: number): [number, number] {
  const [dRe, dIm] = shuntDenominator(leads, omega, re, im);
  const d2 = dRe * dRe + dIm * dIm;
  const qRe = (re * dRe + im * dIm) / d2;
  const qIm = (im * dRe - re * dIm) / d2;
  return [qRe + leads.ohms, qIm + omega * leads.henries];
}

/** dZ_read / dZ = 1 / (1 + Z·Y_o)² = conj(d)² / |d|⁴, for the chain rule of the fit's Jacobian. */
export function throughLeadsGain(leads: LeadSet, omega: number, re: number, im: number): [number, number] {
  const [dRe, dIm] = shuntDenominator(leads, omega, re, im);
  const d4 = (dRe * dRe + dIm * dIm) ** 2;
  return [(dRe * dRe - dIm * dIm) / d4, (-2 * dRe * dIm) / d4];
}

/** d = 1 + Z·jωC = (1 − ωC·im) + j(ωC·re). */
function shuntDenominator(leads: LeadSet, omega: number, re: number, im: number): [number, number] {
  const b = omega * leads.farads;
  return [1 - b * im, b * re];
}

/** log10 ranges searched; the lower end of each stands for none at all (a shorted node reads milliohms). */
const RANGES = {
  ohms: [-4, 1.5],
  henries: [-10, -5],
  farads: [-14, -9],
} as const;
const STEPS_PER_DECADE = 4;
const ROUNDS = 3;

/**
 * The common leads that make `predicted` (re and im interleaved) meet the readings best, by coordinate
 * descent over the three parameters on a log scale (each 1-D search as in the part fits). The robust
 * misfit keeps readings that a faulty part has moved from pulling the leads.
 */
export function fitCommonLeads(meter: MisfitMeter, predicted: Float64Array): CommonLeads {
  const names = ['ohms', 'henries', 'farads'] as const;
  const keys = (['twoTerminal', 'transfer'] as const).flatMap((set) => names.map((name) => ({ set, name, key: `${set}.${name}` })));
  const x: Record<string, number> = Object.fromEntries(keys.map((k) => [k.key, RANGES[k.name][0]]));
  const valueOf = (v: Record<string, number>, set: string, name: (typeof names)[number]) => {
    const x = v[`${set}.${name}`];
    return x <= RANGES[name][0] ? 0 : 10 ** x;
  };
  const setOf = (v: Record<string, number>, set: string): LeadSet => ({ ohms: valueOf(v, set, 'ohms'), henries: valueOf(v, set, 'henries'), farads: valueOf(v, set, 'farads') });
  const leadsOf = (v: Record<string, number>): CommonLeads => ({ twoTerminal: setOf(v, 'twoTerminal'), transfer: setOf(v, 'transfer') });
  let best = meter.withLeads(leadsOf(x)).of(predicted);
  for (let round = 0; round < ROUNDS; round++) {
    const before = best;
    for (const { name, key } of keys) {
      const [lo, hi] = RANGES[name];
      const found = scanAndRefine((value) => meter.withLeads(leadsOf({ ...x, [key]: value })).of(predicted), lo, hi, Math.round((hi - lo) * STEPS_PER_DECADE), 2, 1e-3);
      if (found.value < best) {
        best = found.value;
        x[key] = found.x;
      }
    }
    if (before - best <= 1e-9 * Math.max(best, 1)) break;
  }
  return leadsOf(x);
}
