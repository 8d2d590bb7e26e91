// Pseudo-candidates outside the board: the fixture path that joins one node to the analyzer's HI or LO
// terminal. A worn relay contact or a cracked joint at the pad puts an impedance in series with every
// two-terminal reading through that path (and only those), which no part of the board can imitate: a
// part changes the readings of its neighbours too. The series impedance is fitted as a resistance, or as
// an open contact bridged only by the capacitance across its gap.
// Transfer readings drive a current and sense a voltage on separate paths, so a series impedance in
// either path leaves them unchanged; they take no part here.
import type { MisfitMeter } from './diagnose-misfit.js';
import type { PreparedScan } from './diagnose-scan.js';
import { scanAndRefine } from './diagnose-search.js';
import type { FixtureFinding, FixturePath } from './diagnose-types.js';

export interface FixtureFit {
  node: string;
  path: FixturePath;
  change: FixtureFinding;
  misfit: number;
  /** Readings through this path. */
  readings: number;
}

/** log10 of the searched series resistance (ohms) and gap capacitance (farads). */
const RESISTANCE_RANGE = [-3, 6] as const;
const GAP_CAPACITANCE_RANGE = [-15, -9] as const;
const STEPS_PER_DECADE = 10;

/** Every fixture path the readings use, with its best fit; best first. */
export function fitFixturePaths(scan: PreparedScan, nominal: Float64Array, meter: MisfitMeter): FixtureFit[] {
  const n = scan.readings.length;
  const nominalLoss = new Float64Array(n);
  let nominalTotal = 0;
  for (let i = 0; i < n; i++) {
    nominalLoss[i] = meter.lossAt(i, nominal[2 * i], nominal[2 * i + 1]);
    nominalTotal += nominalLoss[i];
  }
  const fits: FixtureFit[] = [];
  for (const [key, members] of fixturePaths(scan)) {
    const [path, node] = splitKey(key);
    const without = members.reduce((sum, i) => sum + nominalLoss[i], 0);
    // Only the readings through the path change; the others keep their nominal loss.
    const misfitWith = (series: (omega: number) => { re: number; im: number }) => {
      let total = nominalTotal - without;
      for (const i of members) {
        const z = series(scan.groups[scan.readings[i].group].omega);
        total += meter.lossAt(i, nominal[2 * i] + z.re, nominal[2 * i + 1] + z.im);
      }
      return total / n;
    };
    const resistance = scanAndRefine(
      (x) => misfitWith(() => ({ re: 10 ** x, im: 0 })),
      RESISTANCE_RANGE[0],
      RESISTANCE_RANGE[1],
      (RESISTANCE_RANGE[1] - RESISTANCE_RANGE[0]) * STEPS_PER_DECADE,
    );
    const gap = scanAndRefine(
      (x) => misfitWith((omega) => ({ re: 0, im: -1 / (omega * 10 ** x) })),
      GAP_CAPACITANCE_RANGE[0],
      GAP_CAPACITANCE_RANGE[1],
      (GAP_CAPACITANCE_RANGE[1] - GAP_CAPACITANCE_RANGE[0]) * STEPS_PER_DECADE,
    );
    const change: FixtureFinding =
      resistance.value <= gap.value ? { kind: 'series-resistance', ohms: 10 ** resistance.x } : { kind: 'open-contact', farads: 10 ** gap.x };
    fits.push({ node, path, change, misfit: Math.min(resistance.value, gap.value), readings: members.length });
  }
  return fits.sort((a, b) => a.misfit - b.misfit);
}

/** Reading indices by fixture path, keyed "hi node" or "lo node". */
function fixturePaths(scan: PreparedScan): Map<string, number[]> {
  const paths = new Map<string, number[]>();
  const add = (key: string, i: number) => {
    const list = paths.get(key);
    if (list) list.push(i);
    else paths.set(key, [i]);
  };
  scan.readings.forEach((r, i) => {
    if (r.source.kind === 'transfer') return;
    add(`hi ${r.source.hi}`, i);
    add(`lo ${r.source.lo}`, i);
  });
  return paths;
}

function splitKey(key: string): [FixturePath, string] {
  const at = key.indexOf(' ');
  return [key.slice(0, at) as FixturePath, key.slice(at + 1)];
}
