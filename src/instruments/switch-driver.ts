// A switch matrix driven through its profile: channels are checked against the profile's range, written
// as a channel list in the profile's style, and every relay operation waits the profile's settling time.

import { readFlags } from './answers.js';
import { renderChannelList } from './channel-list.js';
import { requireWholeNumber, requireWithin } from './driver-limits.js';
import { askAndRead, realSleep, sendSetting, startInstrument, type DriverOptions } from './driver-support.js';
import type { Identity } from './identity.js';
import { renderTemplate, type Template } from './profile-templates.js';
import type { SwitchProfile } from './profile-types.js';
import type { ScpiSession } from './scpi-session.js';

export interface SwitchDriver {
  readonly profile: SwitchProfile;
  /** Checks the identity and sends the profile's setup. */
  start(): Promise<Identity>;
  close(channels: readonly number[]): Promise<void>;
  open(channels: readonly number[]): Promise<void>;
  openAll(): Promise<void>;
  /** Whether each listed channel is closed, in list order. */
  closedStates(channels: readonly number[]): Promise<boolean[]>;
}

export function switchDriver(profile: SwitchProfile, session: ScpiSession, options: DriverOptions = {}): SwitchDriver {
  return new ProfiledSwitch(profile, session, options.sleep ?? realSleep);
}

class ProfiledSwitch implements SwitchDriver {
  constructor(
    readonly profile: SwitchProfile,
    private readonly session: ScpiSession,
    private readonly sleep: (ms: number) => Promise<void>,
  ) {}

  start(): Promise<Identity> {
    return startInstrument(this.profile, this.session);
  }

  close(channels: readonly number[]): Promise<void> {
    return this.operate(this.profile.commands.close, channels);
  }

  open(channels: readonly number[]): Promise<void> {
    return this.operate(this.profile.commands.open, channels);
  }

  async openAll(): Promise<void> {
    await sendSetting(this.profile, this.session, this.profile.commands.openAll);
    await this.sleep(this.profile.timing.settleAfterRelayMs);
  }

  async closedStates(channels: readonly number[]): Promise<boolean[]> {
    if (channels.length === 0) return [];
    const command = this.render(this.profile.commands.queryClosed.query, channels);
    return askAndRead(this.session, command, this.profile.timeouts.commandMs, (answer) => readFlags(answer, command, channels.length));
  }

  private async operate(template: Template, channels: readonly number[]): Promise<void> {
    if (channels.length === 0) return;
    await sendSetting(this.profile, this.session, this.render(template, channels));
    await this.sleep(this.profile.timing.settleAfterRelayMs);
  }

  private render(template: Template, channels: readonly number[]): string {
    for (const channel of channels) {
      requireWholeNumber(this.profile, 'channel', channel);
      requireWithin(this.profile, 'channel', channel, this.profile.limits.channels, 'limits.channels');
    }
    return renderTemplate(template, { channels: renderChannelList(channels, this.profile.channelList) });
  }
}
