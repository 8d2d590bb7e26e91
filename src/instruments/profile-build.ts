// Turns the raw shape of a profile into a checked InstrumentProfile: quantities into SI numbers, templates
// parsed against the placeholders each command may use, and the checks that look at more than one field.
// Every problem goes to the log; nothing stops at the first.

import { joinPath, type ProblemLog } from '../board/errors.js';
import { parseQuantity, QuantityError, type UnitName } from '../units/quantity.js';
import { isTemplate, parseTemplate, type Template } from './profile-templates.js';
import type { RawAnalyzer, RawSwitch } from './profile-schema.js';
import type { AnalyzerProfile, ProfileBase, Range, SwitchProfile } from './profile-types.js';

const DEFAULTS = {
  commandTimeoutS: 2,
  connectTimeoutS: 3,
  // 9600 baud, 8 data bits, no parity, 1 stop bit: the usual factory setting of instrument serial ports
  // (common practice).
  serial: { baudRate: 9600, dataBits: 8, parity: 'none', stopBits: 1, flowControl: 'none' },
  errorQuery: 'SYSTem:ERRor?',
  drainLimit: 64,
} as const;

/** Reads fields one at a time into a log; each helper returns undefined after logging a problem. */
class FieldReader {
  constructor(readonly log: ProblemLog) {}

  quantity(raw: number | string | undefined, unit: UnitName, path: string, options: { allowZero?: boolean } = {}): number | undefined {
    if (raw === undefined) return undefined;
    try {
      return parseQuantity(raw, unit, options);
    } catch (error) {
      if (!(error instanceof QuantityError)) throw error;
      this.log.add(path, error.message);
      return undefined;
    }
  }

  /** A duration in milliseconds (the file gives seconds or a time with unit). */
  millis(raw: number | string | undefined, path: string, fallbackS: number): number {
    const seconds = raw === undefined ? fallbackS : this.quantity(raw, 's', path, { allowZero: true });
    return (seconds ?? fallbackS) * 1000;
  }

  range(raw: { min?: number | string; max: number | string }, unit: UnitName, path: string, fallbackMin?: number): Range | undefined {
    const min = raw.min === undefined ? fallbackMin : this.quantity(raw.min, unit, joinPath(path, 'min'));
    const max = this.quantity(raw.max, unit, joinPath(path, 'max'));
    if (min === undefined || max === undefined) return undefined;
    if (min > max) {
      this.log.add(path, `min (${raw.min}) is above max (${raw.max})`);
      return undefined;
    }
    return { min, max };
  }

  /** A command that is sent as it stands: printable ASCII, one line, no placeholder, no query. */
  command(raw: string, path: string, role: 'setting' | 'query'): string | undefined {
    if (!this.sendable(raw, path)) return undefined;
    if (/[{}]/.test(raw)) {
      this.log.add(path, 'takes no placeholders');
      return undefined;
    }
    return this.role(raw, path, role) ? raw : undefined;
  }

  template(raw: string, path: string, role: 'setting' | 'query', allowed: readonly string[], required: readonly string[]): Template | undefined {
    if (!this.sendable(raw, path) || !this.role(raw, path, role)) return undefined;
    const template = parseTemplate(raw, allowed);
    if (!isTemplate(template)) {
      this.log.add(path, template.problem);
      return undefined;
    }
    const missing = required.filter((name) => !template.names.includes(name));
    if (missing.length > 0) {
      this.log.add(path, `needs the placeholder ${missing.map((m) => `{${m}}`).join(' and ')}`);
      return undefined;
    }
    return template;
  }

  private sendable(raw: string, path: string): boolean {
    const bad = /[^\x20-\x7e]/.exec(raw);
    if (!bad) return true;
    this.log.add(path, `holds a character that cannot be sent (${JSON.stringify(bad[0])}); a command is one line of ASCII text`);
    return false;
  }

  // A setting that asks something would leave an answer nobody reads, and it would be taken for the answer
  // to the next query; a query without "?" would leave us waiting for an answer that never comes.
  private role(raw: string, path: string, role: 'setting' | 'query'): boolean {
    const asks = raw.includes('?');
    if (role === 'setting' && asks) this.log.add(path, `must not be a query (${JSON.stringify(raw)} asks for an answer nobody would read)`);
    else if (role === 'query' && !asks) this.log.add(path, `must be a query (with "?"); ${JSON.stringify(raw)} would never be answered`);
    else return true;
    return false;
  }
}

function buildBase(raw: RawAnalyzer | RawSwitch, file: string, stem: string, read: FieldReader): ProfileBase | undefined {
  const { log } = read;
  const before = log.count;
  let identity: RegExp | undefined;
  try {
    identity = new RegExp(raw.identity);
  } catch (error) {
    log.add('identity', `is not a valid regular expression: ${(error as Error).message.replace(/^Invalid regular expression: /, '')}`);
  }
  const setup = (raw.setup ?? []).map((c, i) => read.command(c, `setup[${i}]`, 'setting'));
  const errorQuery = raw.errors?.query !== undefined ? read.command(raw.errors.query, 'errors.query', 'query') : DEFAULTS.errorQuery;
  const base: ProfileBase = {
    name: raw.name ?? stem,
    file,
    description: raw.description,
    identity: identity ?? /$^/,
    terminators: { write: raw.terminators?.write ?? 'LF', read: raw.terminators?.read ?? 'LF' },
    timeouts: {
      commandMs: read.millis(raw.timeouts?.command, 'timeouts.command', DEFAULTS.commandTimeoutS),
      connectMs: read.millis(raw.timeouts?.connect, 'timeouts.connect', DEFAULTS.connectTimeoutS),
    },
    serial: {
      baudRate: raw.serial?.baud_rate ?? DEFAULTS.serial.baudRate,
      dataBits: raw.serial?.data_bits ?? DEFAULTS.serial.dataBits,
      parity: raw.serial?.parity ?? DEFAULTS.serial.parity,
      stopBits: raw.serial?.stop_bits ?? DEFAULTS.serial.stopBits,
      flowControl: raw.serial?.flow_control ?? DEFAULTS.serial.flowControl,
    },
    errors: {
      query: errorQuery ?? DEFAULTS.errorQuery,
      check: raw.errors?.check ?? 'every-command',
      drainLimit: raw.errors?.drain_limit ?? DEFAULTS.drainLimit,
    },
    setup: setup.filter((c): c is string => c !== undefined),
  };
  for (const [path, ms] of [['timeouts.command', base.timeouts.commandMs], ['timeouts.connect', base.timeouts.connectMs]] as const) {
    if (ms <= 0) log.add(path, 'must be longer than zero');
  }
  return log.count === before ? base : undefined;
}

export function buildAnalyzer(raw: RawAnalyzer, file: string, stem: string, log: ProblemLog): AnalyzerProfile | undefined {
  const read = new FieldReader(log);
  const before = log.count;
  const base = buildBase(raw, file, stem, read);
  const c = raw.commands;
  const setFrequency = read.template(c.set_frequency, 'commands.set_frequency', 'setting', ['hz'], ['hz']);
  const setLevel = read.template(c.set_level, 'commands.set_level', 'setting', ['volts'], ['volts']);
  const setAveraging =
    c.set_averaging !== undefined ? read.template(c.set_averaging, 'commands.set_averaging', 'setting', ['count'], ['count']) : undefined;
  const impedance = c.set_function.impedance !== undefined ? read.command(c.set_function.impedance, 'commands.set_function.impedance', 'setting') : undefined;
  const transfer = c.set_function.transfer !== undefined ? read.command(c.set_function.transfer, 'commands.set_function.transfer', 'setting') : undefined;
  if (c.set_function.impedance === undefined && c.set_function.transfer === undefined) {
    log.add('commands.set_function', 'needs impedance, transfer or both');
  }
  const send = (c.measure.send ?? []).map((s, i) => read.command(s, `commands.measure.send[${i}]`, 'setting'));
  const query = read.command(c.measure.query, 'commands.measure.query', 'query');

  const l = raw.limits;
  const frequencyHz = read.range(l.frequency, 'Hz', 'limits.frequency');
  const levelV = read.range(l.level, 'V', 'limits.level', 0);
  const currentA = read.quantity(l.current, 'A', 'limits.current');
  const sourceOhms = read.quantity(l.source_resistance, 'ohm', 'limits.source_resistance');
  if (l.current !== undefined && l.source_resistance === undefined) {
    log.add('limits.current', 'needs limits.source_resistance, the analyzer\'s source resistance: the largest current is level / source resistance, into a short');
  }
  let averaging: Range = { min: 1, max: 1 };
  if (l.averaging) {
    if (l.averaging.min < 1) log.add('limits.averaging.min', 'must be at least 1');
    else if (l.averaging.min > l.averaging.max) log.add('limits.averaging', `min (${l.averaging.min}) is above max (${l.averaging.max})`);
    else averaging = { min: l.averaging.min, max: l.averaging.max };
  } else if (c.set_averaging !== undefined) {
    log.add('limits.averaging', 'missing: commands.set_averaging needs the range of counts the analyzer takes');
  }
  const t = raw.timing ?? {};
  const timing = {
    afterFrequencyChangeMs: read.millis(t.after_frequency_change, 'timing.after_frequency_change', 0),
    measurementMs: read.millis(t.measurement, 'timing.measurement', 0),
    perAverageMs: read.millis(t.per_average, 'timing.per_average', 0),
  };
  if (log.count > before || !base || !setFrequency || !setLevel || !query || !frequencyHz || !levelV) return undefined;
  const setFunction: AnalyzerProfile['commands']['setFunction'] = {};
  if (impedance) setFunction.impedance = impedance;
  if (transfer) setFunction.transfer = transfer;
  return {
    ...base,
    kind: 'analyzer',
    commands: {
      setFrequency,
      setLevel,
      setFunction,
      setAveraging,
      measure: { send: send as string[], query, response: c.measure.response },
    },
    limits: { frequencyHz, levelV, currentA, sourceOhms, averaging },
    timing,
  };
}

export function buildSwitch(raw: RawSwitch, file: string, stem: string, log: ProblemLog): SwitchProfile | undefined {
  const read = new FieldReader(log);
  const before = log.count;
  const base = buildBase(raw, file, stem, read);
  const c = raw.commands;
  const close = read.template(c.close, 'commands.close', 'setting', ['channels'], ['channels']);
  const open = read.template(c.open, 'commands.open', 'setting', ['channels'], ['channels']);
  const openAll = read.command(c.open_all, 'commands.open_all', 'setting');
  const query = read.template(c.query_closed.query, 'commands.query_closed.query', 'query', ['channels'], ['channels']);

  const list = raw.channel_list ?? {};
  const form = read.template(list.form ?? '(@{list})', 'channel_list.form', 'setting', ['list'], ['list']);
  const channel = read.template(list.channel ?? '{n}', 'channel_list.channel', 'setting', ['n', 'slot', 'ch'], []);
  if (channel && channel.names.length === 0) log.add('channel_list.channel', 'needs {n}, or {slot} and {ch}');
  if (channel && (channel.names.includes('slot') || channel.names.includes('ch')) && list.slot_size === undefined) {
    log.add('channel_list.channel', '{slot} and {ch} need channel_list.slot_size (channel = slot * slot_size + ch)');
  }
  const separator = list.separator ?? ',';
  const range = list.range === false ? undefined : (list.range ?? ':');

  const channels = raw.limits.channels;
  if (channels.min < 1) log.add('limits.channels.min', 'must be at least 1');
  else if (channels.min > channels.max) log.add('limits.channels', `min (${channels.min}) is above max (${channels.max})`);
  const settleAfterRelayMs = read.millis(raw.timing?.settle_after_relay, 'timing.settle_after_relay', 0);

  if (log.count > before || !base || !close || !open || !openAll || !query || !form || !channel) return undefined;
  return {
    ...base,
    kind: 'switch',
    commands: { close, open, openAll, queryClosed: { query, response: c.query_closed.response } },
    channelList: { form, channel, slotSize: list.slot_size, separator, range },
    limits: { channels: { min: channels.min, max: channels.max } },
    timing: { settleAfterRelayMs },
  };
}
