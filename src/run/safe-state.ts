// The state the bench is left in, whatever ended the run: excitation at the analyzer's lowest level, every
// relay open and confirmed open by asking the matrix. A line that went down is reconnected for it. Each
// step that cannot be done is reported, never skipped silently.
import type { AnalyzerLink, InstrumentLink, SwitchLink } from './bench/instrument-link.js';
import type { ProbeGuide } from './probe-guide.js';
import { errorMessage } from './recovery.js';
import { warning, type RunWarning } from './run-events.js';

export interface SafeStateResult {
  safe: boolean;
  warnings: RunWarning[];
}

export interface SafeStateTargets {
  analyzer: AnalyzerLink;
  switchMatrix?: SwitchLink;
  probes?: ProbeGuide;
  /** Every channel the plan and its fixture know; all must read open. */
  channels: readonly number[];
}

/**
 * Each action gets this many tries, reconnecting a dropped line in between after a growing pause: a line
 * that has just dropped (a USB adapter re-enumerating, a link being re-plugged) takes a moment to come back,
 * and the safe state is the one thing that must not give up at the first refusal. At most about 1.75 s.
 */
const TRIES = 4;
const FIRST_PAUSE_MS = 250;

export async function bringToSafeState(t: SafeStateTargets): Promise<SafeStateResult> {
  const warnings: RunWarning[] = [];
  let safe = true;
  const attempt = async (link: InstrumentLink<unknown>, what: string, action: () => Promise<void>) => {
    for (let i = 1; i <= TRIES; i++) {
      try {
        if (!link.session.transport.isOpen) await link.restart();
        await action();
        return;
      } catch (error) {
        if (i === TRIES) {
          safe = false;
          warnings.push(warning(link.role, `could not ${what} on ${link.session.endpoint}: ${errorMessage(error)}; check the bench by hand`));
        } else if (!link.session.transport.isOpen || isLineError(error)) {
          await new Promise((r) => setTimeout(r, FIRST_PAUSE_MS * 2 ** (i - 1)));
          await link.restart().catch(() => undefined);
        }
      }
    }
  };
  const minimum = t.analyzer.profile.limits.levelV.min;
  await attempt(t.analyzer, `set the excitation to its minimum (${minimum} V)`, () => t.analyzer.driver.setLevel(minimum));
  if (t.switchMatrix) {
    const matrix = t.switchMatrix;
    await attempt(matrix, 'open every relay', async () => {
      await matrix.driver.openAll();
      const states = await matrix.driver.closedStates(t.channels);
      const closed = t.channels.filter((_, i) => states[i]);
      if (closed.length > 0) throw new Error(`channel${closed.length > 1 ? 's' : ''} ${closed.join(', ')} still read closed`);
    });
  } else if (t.probes) {
    await t.probes.release();
  }
  return { safe, warnings };
}

function isLineError(error: unknown): boolean {
  return (error as { failure?: string }).failure !== undefined;
}
