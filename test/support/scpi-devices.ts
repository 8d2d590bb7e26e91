// Simulated instruments as the SCPI tests drive them: an analyzer that reads a fixed impedance at once, and
// the error queue read out with SYSTem:ERRor? (SCPI-99 vol. 2, 21.8 (from memory)).
import { SimulatedAnalyzer } from '../../simulators/analyzer.js';
import type { SimulatedDevice } from '../../simulators/device.js';

export function testAnalyzer(options: Partial<ConstructorParameters<typeof SimulatedAnalyzer>[0]> = {}): SimulatedAnalyzer {
  return new SimulatedAnalyzer({ source: { measure: () => ({ re: 50, im: -20 }) }, timeScale: 0, ...options });
}

/** Every queued error, oldest first, read until the queue says 0,"No error". Throws if it never does. */
export async function queuedErrors(device: SimulatedDevice): Promise<string[]> {
  const out: string[] = [];
  for (let i = 0; i < 100; i++) {
    const e = (await device.receive('SYST:ERR?')) ?? 'no answer';
    if (e.startsWith('0,')) return out;
    out.push(e);
  }
  throw new Error('the error queue never emptied');
}
