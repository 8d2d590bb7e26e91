// The raw shape of a profile file, checked with zod: fields, types and choices. Quantities ("10MHz",
// "2 ms") and templates are only checked to be text or numbers here; profile-build.ts reads them and
// checks what depends on more than one field. Every object is strict, so a misspelt field is an error.

import { z } from 'zod';
import { TERMINATORS } from './terminators.js';

const missingOr = (otherwise: (input: unknown) => string) => (issue: { input?: unknown }) =>
  issue.input === undefined ? 'missing' : otherwise(issue.input);

const choice = <const T extends readonly [string, ...string[]]>(values: T) =>
  z.enum(values, { error: missingOr((input) => `must be ${oneOf(values)}; got ${JSON.stringify(input)}`) });

function oneOf(values: readonly string[]): string {
  const quoted = values.map((v) => JSON.stringify(v));
  return quoted.length === 1 ? quoted[0] : `${quoted.slice(0, -1).join(', ')} or ${quoted[quoted.length - 1]}`;
}

/** A number in the SI base unit or text with prefix and unit: 10, "10MHz", "5 mV", "2ms". */
const Quantity = z.union([z.number(), z.string()], { error: missingOr(() => 'must be a number or text such as "10MHz" or "2 ms"') });

const Command = z.string({ error: missingOr(() => 'must be text (a command)') }).min(1, 'must not be empty');

const RangeShape = z.strictObject({ min: Quantity, max: Quantity });
const MaxRange = z.strictObject({ min: Quantity.optional(), max: Quantity });

const Terminator = choice(TERMINATORS as readonly ['LF', 'CRLF', 'CR']);

const common = {
  kind: z.string(),
  name: z.string().min(1, 'must not be empty').optional(),
  description: z.string().optional(),
  identity: z.string({ error: missingOr(() => 'must be text (a regular expression)') }).min(1, 'must not be empty'),
  terminators: z.strictObject({ write: Terminator.optional(), read: Terminator.optional() }).optional(),
  timeouts: z.strictObject({ command: Quantity.optional(), connect: Quantity.optional() }).optional(),
  serial: z
    .strictObject({
      baud_rate: z.number().int('must be a whole number').positive('must be greater than zero').optional(),
      data_bits: z.union([z.literal(5), z.literal(6), z.literal(7), z.literal(8)], { error: () => 'must be 5, 6, 7 or 8' }).optional(),
      parity: choice(['none', 'even', 'odd', 'mark', 'space']).optional(),
      stop_bits: z.union([z.literal(1), z.literal(1.5), z.literal(2)], { error: () => 'must be 1, 1.5 or 2' }).optional(),
      flow_control: choice(['none', 'rtscts', 'xonxoff']).optional(),
    })
    .optional(),
  errors: z
    .strictObject({
      query: Command.optional(),
      check: choice(['every-command', 'setup']).optional(),
      drain_limit: z.number().int('must be a whole number').min(1, 'must be at least 1').optional(),
    })
    .optional(),
  setup: z.array(Command).optional(),
};

export const AnalyzerShape = z.strictObject({
  ...common,
  commands: z.strictObject({
    set_frequency: Command,
    set_level: Command,
    set_function: z.strictObject({ impedance: Command.optional(), transfer: Command.optional() }),
    set_averaging: Command.optional(),
    measure: z.strictObject({
      send: z.array(Command).optional(),
      query: Command,
      response: choice(['rect', 'polar-deg', 'polar-rad']),
    }),
  }),
  limits: z.strictObject({
    frequency: RangeShape,
    level: MaxRange,
    current: Quantity.optional(),
    source_resistance: Quantity.optional(),
    averaging: z.strictObject({ min: z.number().int('must be a whole number'), max: z.number().int('must be a whole number') }).optional(),
  }),
  timing: z
    .strictObject({
      after_frequency_change: Quantity.optional(),
      measurement: Quantity.optional(),
      per_average: Quantity.optional(),
    })
    .optional(),
});
export type RawAnalyzer = z.infer<typeof AnalyzerShape>;

export const SwitchShape = z.strictObject({
  ...common,
  commands: z.strictObject({
    close: Command,
    open: Command,
    open_all: Command,
    query_closed: z.strictObject({ query: Command, response: choice(['flags']) }),
  }),
  channel_list: z
    .strictObject({
      form: Command.optional(),
      channel: Command.optional(),
      slot_size: z.number().int('must be a whole number').min(2, 'must be at least 2').optional(),
      separator: z.string().min(1, 'must not be empty').optional(),
      range: z.union([z.string().min(1, 'must not be empty'), z.literal(false)], { error: () => 'must be text (such as ":") or false' }).optional(),
    })
    .optional(),
  limits: z.strictObject({
    channels: z.strictObject({ min: z.number().int('must be a whole number'), max: z.number().int('must be a whole number') }),
  }),
  timing: z.strictObject({ settle_after_relay: Quantity.optional() }).optional(),
});
export type RawSwitch = z.infer<typeof SwitchShape>;
