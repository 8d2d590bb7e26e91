// The raw shape of a fixture map file, checked with zod. Channel numbers are whole numbers 1..9999,
// the range our switch matrix answers to (SCPI channel lists, out of range is -222 there).
import { z } from 'zod';
import { describeInput } from '../board/shape-check.js';
import { CHANNEL_MAX, CHANNEL_MIN } from './fixture-map-model.js';

const channelMessage = (input: unknown) => `must be a whole number from ${CHANNEL_MIN} to ${CHANNEL_MAX}, got ${describeInput(input)}`;

export const ChannelInput = z
  .number({ error: (issue) => (issue.input === undefined ? 'missing' : channelMessage(issue.input)) })
  .refine((n) => Number.isInteger(n) && n >= CHANNEL_MIN && n <= CHANNEL_MAX, {
    error: (issue) => channelMessage(issue.input),
  });

export const NodeChannelsShape = z.strictObject(
  {
    hi: ChannelInput.optional(),
    lo: ChannelInput.optional(),
    sense: ChannelInput.optional(),
  },
  { error: (issue) => `must be a mapping of hi, lo and sense channels, got ${describeInput(issue.input)}` },
);

/** Top level; the node entries are checked one by one so that one bad entry hides no other problem. */
export const FixtureMapShape = z.strictObject({
  description: z.string().optional(),
  nodes: z.record(z.string(), z.unknown(), {
    error: (issue) => (issue.input === undefined ? 'missing' : `must be a mapping from node names to channels, got ${describeInput(issue.input)}`),
  }),
  gnd: z.unknown().optional(),
});
