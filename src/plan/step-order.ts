// The order of the steps: relay operations are the slow and wearing part of a scan, frequency changes
// the cheap one, so steps are grouped by the set of contacts they close (switch channels, or probe
// positions for an operator) and the groups are chained greedily, each next group the one that needs the
// fewest contacts to change (ties: the order the readings were derived in). Inside a group the steps run
// by frequency, ordered and directed to need the fewest frequency changes from where the previous group
// ended, so consecutive groups at the same frequencies (a profile) need no change between them.
export interface OrderableStep {
  /** What must be closed (or where the probes must sit) for this step; order does not matter. */
  contacts: readonly string[];
  points: readonly { frequency_hz: number }[];
}

export interface OperationCount {
  readings: number;
  /** Contacts that change state: closing a channel is one operation, opening it another, opening everything at the end included. */
  relay_operations: number;
  frequency_changes: number;
  /** How often the set of contacts changes (first placement included): probe moves for an operator. */
  contact_changes: number;
}

export function orderSteps<S extends OrderableStep>(steps: readonly S[]): S[] {
  const groups = new Map<string, S[]>();
  for (const step of steps) {
    const key = contactKey(step.contacts);
    const group = groups.get(key);
    if (group) group.push(step);
    else groups.set(key, [step]);
  }
  const pending = [...groups.values()];
  // How many steps read at each frequency: the frequencies worth ending a group on.
  const shared = new Map<number, number>();
  for (const step of steps) for (const f of new Set(step.points.map((p) => p.frequency_hz))) shared.set(f, (shared.get(f) ?? 0) + 1);
  const out: S[] = [];
  let closed = new Set<string>();
  let cursor: number | undefined;
  while (pending.length > 0) {
    let best = 0;
    let bestCost = Infinity;
    pending.forEach((group, i) => {
      const cost = changes(closed, new Set(group[0].contacts));
      if (cost < bestCost) {
        best = i;
        bestCost = cost;
      }
    });
    const [group] = pending.splice(best, 1);
    const ordered = byFrequency(group, cursor, shared);
    out.push(...ordered);
    closed = new Set(group[0].contacts);
    const last = ordered[ordered.length - 1].points;
    if (last.length > 0) cursor = last[last.length - 1].frequency_hz;
  }
  return out;
}

export function countOperations(steps: readonly OrderableStep[]): OperationCount {
  let closed = new Set<string>();
  let relay = 0;
  let contactChanges = 0;
  let frequencyChanges = 0;
  let readings = 0;
  let frequency: number | undefined;
  for (const step of steps) {
    const next = new Set(step.contacts);
    const cost = changes(closed, next);
    relay += cost;
    if (cost > 0) contactChanges++;
    closed = next;
    for (const p of step.points) {
      readings++;
      if (p.frequency_hz !== frequency) frequencyChanges++;
      frequency = p.frequency_hz;
    }
  }
  relay += closed.size;
  return { readings, relay_operations: relay, frequency_changes: frequencyChanges, contact_changes: contactChanges };
}

/** Up to this many steps in one contact set, every order and direction is tried; beyond, they run ascending. */
const EXHAUSTIVE_GROUP = 4;

/**
 * Steps of one contact set by frequency: the order of the steps and the direction of each (ascending or
 * descending) with the fewest frequency changes, counting a change from `cursor` at the start; among
 * equals the one that ends on the frequency most other steps share (a profile frequency), so the next
 * group can start there without a change.
 */
function byFrequency<S extends OrderableStep>(group: readonly S[], cursor: number | undefined, shared: ReadonlyMap<number, number>): S[] {
  const ascending = group
    .map((step) => ({ ...step, points: [...step.points].sort((a, b) => a.frequency_hz - b.frequency_hz) }))
    .sort((a, b) => lowest(a) - lowest(b));
  if (ascending.length > EXHAUSTIVE_GROUP) return ascending as S[];
  let best: S[] = ascending as S[];
  let bestCost = Infinity;
  let bestShare = -1;
  for (const order of permutations(ascending)) {
    for (let mask = 0; mask < 1 << order.length; mask++) {
      const candidate = order.map((step, i) => (mask & (1 << i) ? { ...step, points: [...step.points].reverse() } : step)) as S[];
      const { cost, end } = frequencyChanges(candidate, cursor);
      const share = end === undefined ? 0 : (shared.get(end) ?? 0);
      if (cost < bestCost || (cost === bestCost && share > bestShare)) {
        best = candidate;
        bestCost = cost;
        bestShare = share;
      }
    }
  }
  return best;
}

function frequencyChanges(steps: readonly OrderableStep[], cursor: number | undefined): { cost: number; end: number | undefined } {
  let cost = 0;
  let f = cursor;
  for (const step of steps) {
    for (const p of step.points) {
      if (p.frequency_hz !== f) cost++;
      f = p.frequency_hz;
    }
  }
  return { cost, end: f };
}

function* permutations<T>(items: readonly T[]): Generator<T[]> {
  if (items.length <= 1) {
    yield [...items];
    return;
  }
  for (let i = 0; i < items.length; i++) {
    const rest = [...items.slice(0, i), ...items.slice(i + 1)];
    for (const tail of permutations(rest)) yield [items[i], ...tail];
  }
}

function lowest(step: OrderableStep): number {
  return step.points.length > 0 ? step.points[0].frequency_hz : Infinity;
}

function changes(from: ReadonlySet<string>, to: ReadonlySet<string>): number {
  let n = 0;
  for (const c of from) if (!to.has(c)) n++;
  for (const c of to) if (!from.has(c)) n++;
  return n;
}

function contactKey(contacts: readonly string[]): string {
  return [...contacts].sort().join('\u0000');
}
