// An instrument profile once read and checked: everything the drivers need to speak to one model of
// analyzer or switch matrix, in SI units (times in milliseconds), with templates already parsed.

import type { ComplexForm } from './answers.js';
import type { ChannelListStyle } from './channel-list.js';
import type { Template } from './profile-templates.js';
import type { Terminator } from './terminators.js';
import type { DataBits, FlowControl, Parity, StopBits } from './transports/serial-transport.js';

export interface Range {
  min: number;
  max: number;
}

export interface SerialDefaults {
  baudRate: number;
  dataBits: DataBits;
  parity: Parity;
  stopBits: StopBits;
  flowControl: FlowControl;
}

/** "every-command": the error queue is read after each setting; "setup": only after the setup list. */
export type ErrorCheck = 'every-command' | 'setup';

export interface ProfileBase {
  name: string;
  /** Where the profile came from, for messages. */
  file: string;
  description?: string;
  /** Matched against the whole *IDN? answer. */
  identity: RegExp;
  terminators: { write: Terminator; read: Terminator };
  timeouts: { commandMs: number; connectMs: number };
  serial: SerialDefaults;
  errors: { query: string; check: ErrorCheck; drainLimit: number };
  /** Sent once after connecting, before anything else; the error queue is drained after it. */
  setup: string[];
}

export type AnalyzerFunction = 'impedance' | 'transfer';

export interface AnalyzerProfile extends ProfileBase {
  kind: 'analyzer';
  commands: {
    setFrequency: Template;
    setLevel: Template;
    setFunction: Partial<Record<AnalyzerFunction, string>>;
    setAveraging?: Template;
    measure: { send: string[]; query: string; response: ComplexForm };
  };
  limits: {
    frequencyHz: Range;
    levelV: Range;
    /** Largest excitation current; checked as level / sourceOhms, the current into a short. */
    currentA?: number;
    sourceOhms?: number;
    averaging: Range;
  };
  timing: {
    afterFrequencyChangeMs: number;
    measurementMs: number;
    perAverageMs: number;
  };
}

export interface SwitchProfile extends ProfileBase {
  kind: 'switch';
  commands: {
    close: Template;
    open: Template;
    openAll: string;
    queryClosed: { query: Template; response: 'flags' };
  };
  channelList: ChannelListStyle;
  limits: { channels: Range };
  timing: { settleAfterRelayMs: number };
}

export type InstrumentProfile = AnalyzerProfile | SwitchProfile;
