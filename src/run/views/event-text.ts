// Short human lines for the events a person should see while a scan runs: deviations, invalid readings,
// warnings, and the closing summary.
import { formatQuantity } from '../../units/format.js';
import type { DeviationFound, ReadingTaken, RunWarning, ScanDone } from '../run-events.js';

const hz = (f: number) => formatQuantity(f, 'Hz');
const ohm = (z: number) => formatQuantity(z, 'ohm');

/** "n3 to gnd", or for a transfer reading "n1 driven, n5 sensed". */
const terminals = (r: { hi: string; lo: string; sense?: string }) => (r.sense !== undefined ? `${r.hi} driven, ${r.sense} sensed` : `${r.hi} to ${r.lo}`);

export function deviationText(d: DeviationFound): string {
  const parts: string[] = [];
  if (d.outside.includes('magnitude')) parts.push(`|Z| ${ohm(d.magnitude_ohm)} outside ${ohm(d.band.mag_lo_ohm)} .. ${ohm(d.band.mag_hi_ohm)}`);
  if (d.outside.includes('phase')) parts.push(`phase ${d.phase_deg.toFixed(1)}° outside ${d.band.phase_lo_deg.toFixed(1)}° .. ${d.band.phase_hi_deg.toFixed(1)}°`);
  return `deviation: step ${d.step} point ${d.point} (${terminals(d)}, ${hz(d.frequency_hz)}): ${parts.join('; ')}`;
}

export function invalidText(r: ReadingTaken): string {
  return `invalid reading: step ${r.step} point ${r.point} (${terminals(r)}, ${hz(r.frequency_hz)}): ${r.note ?? 'no value'}`;
}

export function warningText(w: RunWarning): string {
  return `warning (${w.source}): ${w.message}`;
}

export function summaryText(d: ScanDone, log: string): string {
  const head =
    d.status === 'complete'
      ? 'scan complete'
      : d.status === 'interrupted'
        ? `scan interrupted (${d.reason ?? 'stopped'})`
        : `scan failed: ${d.reason ?? 'unknown failure'}`;
  const safety = d.safe ? 'relays open, excitation at minimum' : 'the safe state could NOT be confirmed, check the bench';
  return `${head}: ${d.readings} readings, ${d.deviations} deviations, ${d.invalid} invalid; ${safety}; log ${log}`;
}
