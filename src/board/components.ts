// The explicit `components` list: each entry one two-terminal part between two named nodes.

import { type DraftPart, type RefUse } from './draft.js';
import { joinPath, type ProblemLog } from './errors.js';
import { readNodeName } from './node-names.js';
import { readPartValues, seriesResistance } from './part-values.js';
import { ComponentShape, RatingInput } from './schema.js';
import { readShape } from './shape-check.js';

export interface ComponentsResult {
  parts: DraftPart[];
  /** False if any entry was unusable, so board-wide checks would see a partial board. */
  complete: boolean;
  /** The refs of all entries that have one, usable or not, so duplicates are found in one run. */
  refs: RefUse[];
  /** Node names in order of first appearance, with the path where each first appeared. */
  nodesSeen: Map<string, string>;
}

export function readComponents(raw: readonly unknown[], log: ProblemLog): ComponentsResult {
  const result: ComponentsResult = { parts: [], complete: true, refs: [], nodesSeen: new Map() };
  raw.forEach((entry, index) => {
    const ref = (entry as { ref?: unknown } | null)?.ref;
    if (typeof ref === 'string' && ref !== '') result.refs.push({ ref, refPath: `components[${index}].ref` });
    const part = readComponent(entry, `components[${index}]`, log, result.nodesSeen);
    if (part) result.parts.push(part);
    else result.complete = false;
  });
  return result;
}

function readComponent(entry: unknown, path: string, log: ProblemLog, nodesSeen: Map<string, string>): DraftPart | undefined {
  // The optional voltage rating is taken off before the shape check, which then speaks of the fields
  // that make up the part's value and ends only.
  const { entry: rest, rating } = takeRating(entry, path, log);
  const found = readShape(ComponentShape, rest, path, log);
  if (!found) return undefined;
  const shape = rating === undefined ? found : { ...found, rating };
  let usable = true;
  const nodes = shape.nodes.map((rawName, end) => {
    const read = readNodeName(rawName);
    if ('problem' in read) {
      log.add(joinPath(path, 'nodes', end), read.problem);
      usable = false;
      return '';
    }
    return read.name;
  }) as [string, string];
  if (usable && nodes[0] === nodes[1]) {
    log.add(joinPath(path, 'nodes'), `both ends are on node ${JSON.stringify(nodes[0])}; a part needs two different nodes`);
    usable = false;
  }
  const values = readPartValues(shape, shape.kind, path, log);
  if (!usable || !values || values.value === undefined) return undefined;
  for (const node of nodes) if (!nodesSeen.has(node)) nodesSeen.set(node, joinPath(path, 'nodes'));
  const part: DraftPart = {
    ref: shape.ref,
    kind: shape.kind,
    nodes,
    value: values.value,
    origin: path,
    refPath: joinPath(path, 'ref'),
  };
  if (values.tolerance !== undefined) part.tolerance = values.tolerance;
  if (values.rating !== undefined) part.rating_v = values.rating;
  if (values.loss) {
    part.loss = values.loss;
    part.esr = seriesResistance(shape.kind, values.value, values.loss);
  }
  return part;
}

function takeRating(entry: unknown, path: string, log: ProblemLog): { entry: unknown; rating?: number | string } {
  if (entry === null || typeof entry !== 'object' || Array.isArray(entry) || !('rating' in entry)) return { entry };
  const { rating, ...rest } = entry as Record<string, unknown>;
  const parsed = RatingInput.safeParse(rating);
  if (!parsed.success) log.add(joinPath(path, 'rating'), 'must be a voltage such as "50V" or 50');
  return { entry: rest, rating: parsed.success ? parsed.data : undefined };
}
