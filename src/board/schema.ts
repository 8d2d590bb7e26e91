// The raw shape of a board file, checked with zod: which fields exist, their types and counts. Values
// that need a unit ("10n") are only checked to be text or numbers here; reading them needs the part's
// kind and happens in part-values.ts. Every object is strict so that a misspelt field is an error.

import { z } from 'zod';

const KINDS = ['C', 'L', 'R'] as const;

const missingOr = (otherwise: (input: unknown) => string) => (issue: { input?: unknown }) =>
  issue.input === undefined ? 'missing' : otherwise(issue.input);

export const KindInput = z.enum(KINDS, {
  error: missingOr((input) => `unknown kind ${JSON.stringify(input)}; expected C, L or R`),
});

/** A value with optional prefix and unit ("10n", "10 nF", 2k2) or a plain number in the SI base unit. */
export const ValueInput = z.union([z.number(), z.string()], {
  error: missingOr(() => 'must be a number or text such as "10n" or "4.7 uH"'),
});

export const PercentInput = z.union([z.number(), z.string()], {
  error: missingOr(() => 'must be a percentage such as "5%"'),
});

/** Node names are text; whole numbers are taken as text too (a node called 7). */
export const NodeInput = z.union([z.string(), z.number().int()], {
  error: missingOr(() => 'a node name must be text'),
});

const Identifier = z
  .string()
  .regex(/^[A-Za-z][A-Za-z0-9]*$/, 'must start with a letter and hold only letters and digits');

/** The fields that give a part its value, shared by components, lattice bonds, grounds and changes. */
const partValueFields = {
  value: ValueInput,
  tolerance: PercentInput.optional(),
  esr: ValueInput.optional(),
  q: z.number({ error: missingOr(() => 'must be a number (the quality factor, e.g. 50)') }).positive('must be greater than zero').optional(),
  q_at: ValueInput.optional(),
};

/** A part's voltage rating ("50V"); read beside the value fields (components read it before their shape check). */
export const RatingInput = ValueInput;
const ratingField = { rating: RatingInput.optional() };

export const ComponentShape = z.strictObject({
  ref: z.string().min(1, 'must not be empty'),
  kind: KindInput,
  nodes: z.array(NodeInput).length(2, 'needs exactly two node names'),
  ...partValueFields,
});
export type RawComponent = z.infer<typeof ComponentShape>;

export const BoardShape = z.strictObject({
  name: z.string().min(1, 'must not be empty').optional(),
  description: z.string().optional(),
  components: z.array(z.unknown()).optional(),
  lattice: z.unknown().optional(),
});

const Coordinates = z
  .array(z.number(), { error: missingOr(() => 'must be a list of one to three numbers') })
  .min(1, 'needs one to three numbers')
  .max(3, 'needs one to three numbers');

const SiteName = z
  .string()
  .regex(/^[A-Za-z][A-Za-z0-9]*$/, 'a site name must start with a letter and hold only letters and digits');

const Boundary = z.enum(['open', 'periodic'], {
  error: missingOr((input) => `unknown boundary ${JSON.stringify(input)}; expected open or periodic`),
});

const Offset = z.array(z.number().int('must be whole numbers'), {
  error: missingOr(() => 'must be a list of whole numbers, one per lattice axis'),
});

export const LatticeShape = z.strictObject({
  repeats: z.union([z.number(), z.array(z.number())], {
    error: missingOr(() => 'must be a whole number or a list of one to three whole numbers'),
  }),
  boundary: z.union([Boundary, z.array(Boundary)]).optional(),
  vectors: z.array(Coordinates).optional(),
  sites: z.union([z.array(SiteName), z.record(SiteName, Coordinates.nullable())], {
    error: missingOr(() => 'must be a list of site names or a mapping from site name to position'),
  }),
  bonds: z.array(z.unknown()).optional(),
  grounds: z.array(z.unknown()).optional(),
  changes: z.array(z.unknown()).optional(),
  terminate: z.boolean({ error: missingOr(() => 'must be true or false') }).optional(),
  names: z.string().min(1, 'must not be empty').optional(),
});
export type RawLattice = z.infer<typeof LatticeShape>;

export const BondShape = z.strictObject({
  id: Identifier.optional(),
  from: SiteName,
  to: z.string({ error: missingOr(() => 'must be a site name') }),
  offset: Offset.optional(),
  kind: KindInput,
  ...partValueFields,
  ...ratingField,
});
export type RawBond = z.infer<typeof BondShape>;

export const GroundShape = z.strictObject({
  id: Identifier.optional(),
  site: SiteName,
  kind: KindInput,
  ...partValueFields,
  ...ratingField,
});
export type RawGround = z.infer<typeof GroundShape>;

/** A cell selector: one entry per axis, each a whole number, a range "2..5" or "all". */
export const CellInput = z.union([z.number().int(), z.string(), z.array(z.union([z.number().int(), z.string()]))], {
  error: missingOr(() => 'must list one index per axis, each a whole number, a range like "2..5" or "all"'),
});

export const ChangeShape = z.strictObject({
  ref: z.string().min(1, 'must not be empty').optional(),
  cell: CellInput.optional(),
  part: Identifier.optional(),
  value: ValueInput.optional(),
  tolerance: PercentInput.optional(),
  esr: ValueInput.optional(),
  q: partValueFields.q,
  q_at: ValueInput.optional(),
  rating: RatingInput.optional(),
  remove: z.literal(true, { error: () => 'must be true (leave it out to keep the part)' }).optional(),
  add: z
    .strictObject({
      id: Identifier.optional(),
      from: SiteName,
      to: z.string({ error: missingOr(() => 'must be a site name or gnd') }),
      offset: Offset.optional(),
      kind: KindInput,
      ...partValueFields,
      ...ratingField,
    })
    .optional(),
});
export type RawChange = z.infer<typeof ChangeShape>;
