// The shape of a plan file, checked with zod: every field, its type and range. Objects are strict, so a
// misspelt field is named. What needs more than one field (step numbering, terminals against channels,
// the board hash) is checked afterwards in plan-checks.ts.
import { z } from 'zod';
import { CHANNEL_MAX, CHANNEL_MIN } from '../instruments/fixture-map.js';
import { PLAN_FORMAT } from './types.js';

const finite = () => z.number();
const positive = () => z.number().positive('must be greater than zero');
const notNegative = () => z.number().nonnegative('must be zero or more');
const count = () => z.number().int('must be a whole number').nonnegative('must be zero or more');
const name = () => z.string().min(1, 'must not be empty');
const phase = () => z.number().min(-180, 'must be from -180 to 180 degrees').max(180, 'must be from -180 to 180 degrees');
const channel = () =>
  z
    .number()
    .int('must be a whole channel number')
    .min(CHANNEL_MIN, `must be a channel from ${CHANNEL_MIN} to ${CHANNEL_MAX}`)
    .max(CHANNEL_MAX, `must be a channel from ${CHANNEL_MIN} to ${CHANNEL_MAX}`);
const range = () => z.strictObject({ min: finite(), max: finite() });

export const BandShape = z.strictObject({
  mag_lo_ohm: notNegative(),
  mag_hi_ohm: notNegative(),
  phase_lo_deg: phase(),
  phase_hi_deg: phase(),
});

export const PointShape = z.strictObject({
  frequency_hz: positive(),
  pred_re: finite(),
  pred_im: finite(),
  band: BandShape,
});

export const StepShape = z.strictObject({
  step: z.number().int('must be a whole number').min(1, 'must be at least 1'),
  kind: z.enum(['to-ground', 'two-point', 'transfer']),
  purpose: z.enum(['profile', 'sweep', 'reference', 'neighbour', 'transfer']),
  hi: name(),
  lo: name(),
  sense: name().optional(),
  channels: z.array(channel()),
  level_v: positive(),
  rated: z.strictObject({ part: z.string().min(1), volts_per_volt: notNegative() }).optional(),
  averages: z.number().int('must be a whole number').min(1, 'must be at least 1'),
  settle_s: notNegative(),
  points: z.array(PointShape).min(1, 'needs at least one point'),
});

const NodeChannelsShape = z.strictObject({ hi: channel().optional(), lo: channel().optional(), sense: channel().optional() });

const PartShape = z.strictObject({
  ref: name(),
  kind: z.enum(['C', 'L', 'R']),
  nodes: z.tuple([name(), name()]),
  value: positive(),
  tolerance: notNegative().optional(),
  esr: notNegative().optional(),
  rating_v: positive().optional(),
  origin: z.string(),
});

const NodeShape = z.strictObject({
  name: name(),
  position: z.tuple([finite(), finite(), finite()]),
  cell: z.array(z.number().int()).optional(),
  site: z.string().optional(),
});

export const PlanShape = z.strictObject({
  format: z.literal(PLAN_FORMAT, { error: (issue) => (issue.input === undefined ? 'missing' : `must be "${PLAN_FORMAT}", the plan format this topoprobe reads, got ${JSON.stringify(issue.input)}`) }),
  created: z.string(),
  software: z.string(),
  board: z.strictObject({
    name: name(),
    hash: z.string().regex(/^[0-9a-f]{64}$/, 'must be 64 lower-case hexadecimal digits (a sha256)'),
    snapshot: z.strictObject({
      name: name(),
      file: z.string(),
      nodes: z.array(NodeShape).min(1, 'needs at least one node'),
      parts: z.array(PartShape).min(1, 'needs at least one part'),
      // The lattice summary is kept for the record; nothing in a run depends on it.
      lattice: z.unknown().optional(),
    }),
  }),
  instruments: z.strictObject({ analyzer: name(), switch: name().nullable() }),
  fixture: z.strictObject({ nodes: z.record(z.string(), NodeChannelsShape), gnd: NodeChannelsShape }),
  modes: z.array(z.strictObject({ frequency_hz: positive(), localization: notNegative(), profile: z.record(z.string(), finite()) })),
  bands: z.strictObject({
    method: z.enum(['monte-carlo', 'first-order']),
    samples: z.number().int('must be a whole number').min(1, 'must be at least 1').optional(),
    seed: z.number().int('must be a whole number').optional(),
    coverage: z.number().min(0, 'must be from 0 to 1').max(1, 'must be from 0 to 1'),
    distribution: z.string().optional(),
    combine: z.enum(['quadrature', 'worst-case']).optional(),
    floor: z.strictObject({ relative: notNegative(), absolute_ohm: notNegative(), phase_deg: notNegative() }).optional(),
  }),
  timing: z.strictObject({
    settle_after_relay_s: notNegative(),
    settle_after_frequency_s: notNegative(),
    measurement_s: notNegative(),
    per_average_s: notNegative(),
    probe_move_s: notNegative().optional(),
  }),
  estimate: z.strictObject({
    duration_s: notNegative(),
    readings: count(),
    relay_operations: count(),
    frequency_changes: count(),
    probe_moves: count().optional(),
  }),
  limits: z
    .strictObject({
      level_v: range(),
      frequency_hz: range(),
      current_a: positive().optional(),
      highest_current_a: notNegative(),
      highest_part_voltage_v: notNegative(),
      highest_part: z.string(),
    })
    .optional(),
  steps: z.array(StepShape).min(1, 'needs at least one step'),
});
