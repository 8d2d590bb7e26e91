// The runner's hands on the bench: every instrument action a scan takes, each with the checks that make it
// safe. Relays move only with the excitation at its minimum, break before make, and each move is confirmed
// by asking the matrix; analyzer settings are sent only when they change. No physics here.
import { AnswerError, InstrumentError, type Complex, type Invalid } from '../instruments/index.js';
import { formatErrorEntries } from '../instruments/error-queue.js';
import type { PlanStep } from '../plan/types.js';
import type { AnalyzerLink, InstrumentLink, SwitchLink } from './bench/instrument-link.js';
import type { ProbeGuide } from './probe-guide.js';
import { warning, type RunWarning } from './run-events.js';
import { backoffMs, errorMessage, type RetryPolicy } from './recovery.js';
import type { StopSignal } from './stop-signal.js';

/**
 * The instrument on a line answers *IDN? differently after a reconnect than when the run started (it
 * rebooted into other firmware, or another instrument was plugged in): its readings would not be the same
 * instrument's, and its settings are gone. The run stops safe rather than mix the two. Exit 3.
 */
export class IdentityChangedError extends InstrumentError {
  constructor(role: string, endpoint: string, was: string, now: string) {
    super(`${endpoint}: ${role} identity changed after reconnect: was ${JSON.stringify(was)}, now ${JSON.stringify(now)}; stopped`);
    this.name = 'IdentityChangedError';
  }
}

/** A relay that did not do what it was told: the bench is not safe to go on with. Exit 3. */
export class RelayStateError extends InstrumentError {
  constructor(message: string) {
    super(message);
    this.name = 'RelayStateError';
  }
}

export interface Waits {
  /** Waits `ms` unless a stop comes first; a bench with instant timing waits for nothing. */
  (ms: number, stop: StopSignal): Promise<void>;
}

export const realWaits: Waits = (ms, stop) =>
  ms <= 0 || stop.requested
    ? Promise.resolve()
    : new Promise((resolve) => {
        const sub = stop.requested$.subscribe(() => finish());
        const timer = setTimeout(() => finish(), ms);
        function finish() {
          clearTimeout(timer);
          sub.unsubscribe();
          resolve();
        }
      });

export const noWaits: Waits = () => Promise.resolve();

export interface BenchControlOptions {
  analyzer: AnalyzerLink;
  /** Absent in operator-probed mode. */
  switchMatrix?: SwitchLink;
  probes?: ProbeGuide;
  /** Every channel the plan and its fixture know: what "all open" is confirmed over. */
  channels: readonly number[];
  /** The plan's settle after a frequency change, in seconds (the driver already waits the profile's). */
  settleAfterFrequencyS: number;
  waits: Waits;
  stop: StopSignal;
  retry: RetryPolicy;
  warn(w: RunWarning): void;
}

type Unknown = undefined;

export class BenchControl {
  /** Channels known closed; undefined when unknown (at the start, after a reconnect). */
  private closed: readonly number[] | Unknown;
  private level?: number;
  private frequency?: number;
  private averages?: number;
  private func?: 'impedance' | 'transfer';
  private readonly minimumLevel: number;

  constructor(private readonly o: BenchControlOptions) {
    this.minimumLevel = o.analyzer.profile.limits.levelV.min;
  }

  get links(): InstrumentLink<unknown>[] {
    return this.o.switchMatrix ? [this.o.analyzer, this.o.switchMatrix] : [this.o.analyzer];
  }

  /** Nothing is known after a reconnect: the next step sets everything again. */
  forget(): void {
    this.closed = undefined;
    this.level = this.frequency = this.averages = this.func = undefined;
  }

  /** Gets the bench ready for `step`: probes or relays where it needs them, the analyzer set, settled. */
  async enterStep(step: PlanStep): Promise<void> {
    // The plan's settle follows a change of contacts; the switch driver has already waited its profile's
    // relay settling after each operation, so only the rest of the plan's time is waited here. Nothing
    // moves when a step closes what the last one did: then the excitation may stay where it is.
    let settleMs = 0;
    if (this.o.switchMatrix) {
      if (!this.alreadyClosed(step.channels)) {
        await this.excitationToMinimum();
        await this.switchTo(this.o.switchMatrix, step.channels);
        settleMs = step.settle_s * 1000 - this.o.switchMatrix.profile.timing.settleAfterRelayMs;
      }
    } else {
      await this.excitationToMinimum();
      await this.o.probes!.place(step, this.o.stop);
      settleMs = step.settle_s * 1000;
    }
    if (this.o.stop.requested) return;
    await this.ensureFunction(step.kind === 'transfer' ? 'transfer' : 'impedance');
    await this.ensureAveraging(step.averages);
    await this.ensureLevel(step.level_v);
    await this.o.waits(settleMs, this.o.stop);
  }

  /**
   * One reading at `frequency`. An answer that cannot be read is asked for once more (it may have been a
   * passing hiccup); unreadable twice, it is an invalid reading with the reason.
   */
  async measureAt(frequency: number): Promise<{ value: Complex | Invalid; note?: string }> {
    await this.ensureFrequency(frequency);
    for (let attempt = 1; ; attempt++) {
      try {
        const value = await this.o.analyzer.driver.measure();
        return value === 'invalid' ? { value, note: 'overload' } : { value };
      } catch (error) {
        if (!(error instanceof AnswerError)) throw error;
        this.o.warn(warning('analyzer', `unreadable reading at ${frequency} Hz${attempt === 1 ? ', asking again' : ''}: ${error.message}`));
        if (attempt >= 2) return { value: 'invalid', note: `unreadable: ${error.message}` };
      }
    }
  }

  /** After each step: whatever the instruments' error queues hold becomes a warning. */
  async drainAfterStep(step: PlanStep): Promise<void> {
    for (const link of this.links) {
      const entries = await link.session.drainErrors();
      if (entries.length > 0) {
        this.o.warn(warning(link.role, `after step ${step.step} the error queue held ${formatErrorEntries(entries)}`));
      }
    }
  }

  /**
   * Reconnects every link whose line is down, with growing pauses; throws the last failure past the limit.
   * The instrument must answer *IDN? as it did before: one that comes back as another (a reboot into other
   * firmware, a swapped unit) stops the run with IdentityChangedError, even if its profile would take it.
   */
  async reconnect(cause: unknown): Promise<void> {
    const down = this.links.filter((l) => !l.session.transport.isOpen);
    const targets = down.length > 0 ? down : this.links;
    this.forget();
    for (const link of targets) {
      const before = link.identity?.raw;
      for (let attempt = 1; ; attempt++) {
        if (this.o.stop.requested) return;
        try {
          // The matrix's setup may move relays: never with a live source, if the analyzer can be told.
          if (link.role === 'switch') await this.excitationToMinimum().catch(() => undefined);
          await link.restart();
          this.o.warn(warning(link.role, `reconnected to ${link.session.endpoint} (attempt ${attempt}) after: ${errorMessage(cause)}`));
          break;
        } catch (error) {
          if (attempt >= this.o.retry.reconnects) throw error;
          const pause = backoffMs(this.o.retry, attempt);
          this.o.warn(warning(link.role, `reconnecting to ${link.session.endpoint} failed (${errorMessage(error)}); trying again in ${pause} ms`));
          await realWaits(pause, this.o.stop);
        }
      }
      const after = link.identity?.raw;
      if (before !== undefined && after !== undefined && after !== before) throw new IdentityChangedError(link.role, link.session.endpoint, before, after);
    }
  }

  /** The excitation to its lowest level: before any relay or probe moves, and at the end. */
  async excitationToMinimum(): Promise<void> {
    await this.ensureLevel(this.minimumLevel);
  }

  /** Every relay open, confirmed by asking the matrix over every channel the plan knows. */
  async openEverything(matrix: SwitchLink): Promise<void> {
    await matrix.driver.openAll();
    this.closed = undefined;
    await this.confirm(matrix, this.o.channels, false, matrix.profile.commands.openAll);
    this.closed = [];
  }

  private alreadyClosed(channels: readonly number[]): boolean {
    const closed = this.closed;
    return closed !== undefined && closed.length === channels.length && channels.every((c) => closed.includes(c));
  }

  /** Break before make: open what the last step closed and this one does not use, confirm, then close and confirm. */
  private async switchTo(matrix: SwitchLink, next: readonly number[]): Promise<void> {
    if (this.closed === undefined) await this.openEverything(matrix);
    const was = this.closed ?? [];
    const toOpen = was.filter((c) => !next.includes(c));
    const toClose = next.filter((c) => !was.includes(c));
    if (toOpen.length > 0) {
      this.closed = undefined;
      await matrix.driver.open(toOpen);
      await this.confirm(matrix, toOpen, false, 'open');
      this.closed = was.filter((c) => next.includes(c));
    }
    if (toClose.length > 0) {
      this.closed = undefined;
      await matrix.driver.close(toClose);
      await this.confirm(matrix, next, true, 'close');
      this.closed = [...next];
    }
  }

  private async confirm(matrix: SwitchLink, channels: readonly number[], closed: boolean, what: string): Promise<void> {
    if (channels.length === 0) return;
    const states = await matrix.driver.closedStates(channels);
    const wrong = channels.filter((_, i) => states[i] !== closed);
    if (wrong.length > 0) {
      throw new RelayStateError(
        `${matrix.session.endpoint}: after ${what} the matrix reports channel${wrong.length > 1 ? 's' : ''} ${wrong.join(', ')} still ${closed ? 'open' : 'closed'}; stopping before anything else is switched`,
      );
    }
  }

  private async ensureLevel(volts: number): Promise<void> {
    if (this.level === volts) return;
    this.level = undefined;
    await this.o.analyzer.driver.setLevel(volts);
    this.level = volts;
  }

  private async ensureFrequency(hz: number): Promise<void> {
    if (this.frequency === hz) return;
    this.frequency = undefined;
    await this.o.analyzer.driver.setFrequency(hz);
    this.frequency = hz;
    const extraMs = this.o.settleAfterFrequencyS * 1000 - this.o.analyzer.profile.timing.afterFrequencyChangeMs;
    await this.o.waits(extraMs, this.o.stop);
  }

  private async ensureAveraging(count: number): Promise<void> {
    if (this.averages === count) return;
    this.averages = undefined;
    await this.o.analyzer.driver.setAveraging(count);
    this.averages = count;
  }

  private async ensureFunction(f: 'impedance' | 'transfer'): Promise<void> {
    if (this.func === f) return;
    this.func = undefined;
    await this.o.analyzer.driver.setFunction(f);
    this.func = f;
  }
}
