// An impedance analyzer driven through its profile: settings are checked against the profile's limits,
// written from its templates, and (when the profile says so) confirmed by an empty error queue; the
// measurement answer is read in the profile's format and returned as re/im in ohms.

import { readComplex, type Complex, type Invalid } from './answers.js';
import { requireWholeNumber, requireWithin } from './driver-limits.js';
import { askAndRead, realSleep, sendSetting, startInstrument, type DriverOptions } from './driver-support.js';
import { formatQuantity } from '../units/quantity.js';
import type { Identity } from './identity.js';
import { InstrumentSettingError, LimitError } from './instrument-errors.js';
import { renderTemplate } from './profile-templates.js';
import type { AnalyzerFunction, AnalyzerProfile } from './profile-types.js';
import type { ScpiSession } from './scpi-session.js';

export interface AnalyzerDriver {
  readonly profile: AnalyzerProfile;
  /** Checks the identity and sends the profile's setup. */
  start(): Promise<Identity>;
  setFrequency(hz: number): Promise<void>;
  setLevel(volts: number): Promise<void>;
  setFunction(f: AnalyzerFunction): Promise<void>;
  setAveraging(count: number): Promise<void>;
  /** One measurement: re/im in ohms (or volts per ampere for transfer), or 'invalid' on overload. */
  measure(): Promise<Complex | Invalid>;
}

export function analyzerDriver(profile: AnalyzerProfile, session: ScpiSession, options: DriverOptions = {}): AnalyzerDriver {
  return new ProfiledAnalyzer(profile, session, options.sleep ?? realSleep);
}

class ProfiledAnalyzer implements AnalyzerDriver {
  private averaging?: number;

  constructor(
    readonly profile: AnalyzerProfile,
    private readonly session: ScpiSession,
    private readonly sleep: (ms: number) => Promise<void>,
  ) {}

  start(): Promise<Identity> {
    return startInstrument(this.profile, this.session);
  }

  async setFrequency(hz: number): Promise<void> {
    requireWithin(this.profile, 'frequency', hz, this.profile.limits.frequencyHz, 'limits.frequency', 'Hz');
    await sendSetting(this.profile, this.session, renderTemplate(this.profile.commands.setFrequency, { hz }));
    await this.sleep(this.profile.timing.afterFrequencyChangeMs);
  }

  async setLevel(volts: number): Promise<void> {
    const { limits } = this.profile;
    requireWithin(this.profile, 'level', volts, limits.levelV, 'limits.level', 'V');
    if (limits.currentA !== undefined && limits.sourceOhms !== undefined && volts / limits.sourceOhms > limits.currentA) {
      throw new LimitError(
        `${this.profile.name}: level ${formatQuantity(volts, 'V')} can drive ${formatQuantity(volts / limits.sourceOhms, 'A')} into a short through the ${formatQuantity(limits.sourceOhms, 'ohm')} source, above limits.current = ${formatQuantity(limits.currentA, 'A')} of ${this.profile.file}; nothing was sent`,
        'limits.current',
      );
    }
    await sendSetting(this.profile, this.session, renderTemplate(this.profile.commands.setLevel, { volts }));
  }

  async setFunction(f: AnalyzerFunction): Promise<void> {
    const command = this.profile.commands.setFunction[f];
    if (command === undefined) {
      throw new InstrumentSettingError(`${this.profile.name}: the profile has no commands.set_function.${f} (${this.profile.file}); nothing was sent`);
    }
    await sendSetting(this.profile, this.session, command);
  }

  async setAveraging(count: number): Promise<void> {
    requireWholeNumber(this.profile, 'averaging count', count);
    requireWithin(this.profile, 'averaging count', count, this.profile.limits.averaging, 'limits.averaging');
    const template = this.profile.commands.setAveraging;
    if (template) await sendSetting(this.profile, this.session, renderTemplate(template, { count }));
    this.averaging = count;
  }

  async measure(): Promise<Complex | Invalid> {
    const { measure } = this.profile.commands;
    for (const command of measure.send) await this.session.write(command);
    return askAndRead(this.session, measure.query, this.measureTimeoutMs(), (answer) => readComplex(answer, measure.query, measure.response));
  }

  /**
   * The command timeout plus twice the stated measurement time (a stated time is typical, not a bound).
   * Until averaging is set, the largest count is assumed, so a long average is never cut short.
   */
  private measureTimeoutMs(): number {
    const { timing, limits, timeouts } = this.profile;
    const count = this.averaging ?? limits.averaging.max;
    return timeouts.commandMs + 2 * (timing.measurementMs + count * timing.perAverageMs);
  }
}
