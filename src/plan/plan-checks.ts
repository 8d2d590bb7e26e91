// The checks of a plan file that span fields, after its shape is known to be right: the board hash
// against the snapshot, step numbering, each step's kind against its terminals and purpose, terminals
// that are nodes of the board, channels against the fixture map, and bands that are intervals.
import { joinPath, type ProblemLog } from '../board/errors.js';
import { GROUND } from '../board/types.js';
import { BUSES, type Bus, type FixtureMapData } from '../instruments/fixture-map.js';
import { boardHash } from './board-hash.js';
import { terminalsOf } from './step-channels.js';
import type { PlanStep, ScanPlan } from './types.js';

const PURPOSES: Record<PlanStep['kind'], readonly PlanStep['purpose'][]> = {
  'to-ground': ['profile', 'sweep', 'reference'],
  'two-point': ['neighbour'],
  transfer: ['transfer'],
};

export function checkPlan(plan: ScanPlan, log: ProblemLog): void {
  const hash = boardHash(plan.board.snapshot);
  if (hash !== plan.board.hash) log.add('board.hash', `does not match the board snapshot in the plan (which hashes to ${hash.slice(0, 12)}…); the plan was edited or damaged`);
  const nodes = new Set(plan.board.snapshot.nodes.map((n) => n.name));
  const channelOwner = checkFixture(plan.fixture, nodes, log);
  const switched = plan.instruments.switch !== null;
  plan.steps.forEach((step, i) => checkStep(step, `steps[${i}]`, i, { nodes, channelOwner, fixture: plan.fixture, switched }, log));
  if (plan.bands.method === 'monte-carlo' && plan.bands.samples === undefined) log.add('bands.samples', 'missing; a Monte Carlo band records its sample count');
}

interface StepContext {
  nodes: ReadonlySet<string>;
  channelOwner: ReadonlyMap<number, string>;
  fixture: FixtureMapData;
  switched: boolean;
}

function checkStep(step: PlanStep, path: string, index: number, ctx: StepContext, log: ProblemLog): void {
  if (step.step !== index + 1) log.add(joinPath(path, 'step'), `is ${step.step}, expected ${index + 1}: steps are numbered 1, 2, 3, ... in the order they run`);
  if (!PURPOSES[step.kind].includes(step.purpose)) log.add(joinPath(path, 'purpose'), `a ${step.kind} step cannot serve as ${JSON.stringify(step.purpose)}; expected ${PURPOSES[step.kind].map((p) => JSON.stringify(p)).join(' or ')}`);
  let terminalsKnown = true;
  const node = (field: 'hi' | 'lo' | 'sense', name: string, groundAllowed: boolean) => {
    if (name === GROUND ? !groundAllowed : !ctx.nodes.has(name)) {
      terminalsKnown = false;
      log.add(joinPath(path, field), name === GROUND ? `is gnd; a ${step.kind} step needs a board node here` : `no node "${name}" on the plan's board`);
    }
  };
  node('hi', step.hi, false);
  if (step.kind === 'two-point') {
    node('lo', step.lo, false);
    if (step.lo === step.hi) log.add(joinPath(path, 'lo'), 'is the same node as hi');
  } else if (step.lo !== GROUND) {
    terminalsKnown = false;
    log.add(joinPath(path, 'lo'), `must be "gnd" for a ${step.kind} step, got ${JSON.stringify(step.lo)}`);
  }
  if (step.kind === 'transfer') {
    if (step.sense === undefined) {
      terminalsKnown = false;
      log.add(joinPath(path, 'sense'), 'missing; a transfer step names the node it senses');
    } else node('sense', step.sense, false);
  } else if (step.sense !== undefined) log.add(joinPath(path, 'sense'), `only transfer steps sense a node; this is a ${step.kind} step`);

  checkChannels(step, path, terminalsKnown, ctx, log);
  step.points.forEach((p, k) => {
    if (p.band.mag_hi_ohm < p.band.mag_lo_ohm) log.add(joinPath(path, 'points', k, 'band'), `mag_hi_ohm ${p.band.mag_hi_ohm} is below mag_lo_ohm ${p.band.mag_lo_ohm}`);
  });
}

function checkChannels(step: PlanStep, path: string, terminalsKnown: boolean, ctx: StepContext, log: ProblemLog): void {
  const at = joinPath(path, 'channels');
  if (!ctx.switched) {
    if (step.channels.length > 0) log.add(at, 'lists channels, but the plan has no switch matrix (instruments.switch is null)');
    return;
  }
  const seen = new Set<number>();
  let allWired = true;
  step.channels.forEach((c, k) => {
    if (seen.has(c)) log.add(joinPath(at, k), `channel ${c} is listed twice`);
    seen.add(c);
    if (!ctx.channelOwner.has(c)) {
      allWired = false;
      log.add(joinPath(at, k), `channel ${c} is not in the plan's fixture map`);
    }
  });
  if (!terminalsKnown || !allWired) return;
  const expected = terminalsOf({ kind: step.kind, hi: step.hi, lo: step.lo, sense: step.sense }).map(([node, bus]) => channelOf(ctx.fixture, node, bus));
  if (expected.some((c) => c === undefined)) {
    log.add(at, `the plan's fixture map has no channel for every terminal of this step (${describeTerminals(step)})`);
  } else if (expected.length !== step.channels.length || expected.some((c, k) => c !== step.channels[k])) {
    log.add(at, `[${step.channels.join(', ')}] does not join ${describeTerminals(step)}; the plan's fixture map gives [${expected.join(', ')}]`);
  }
}

/** Fixture nodes must be board nodes and no channel may be wired twice; returns channel -> field. */
function checkFixture(fixture: FixtureMapData, nodes: ReadonlySet<string>, log: ProblemLog): Map<number, string> {
  const owner = new Map<number, string>();
  const entries: [string, Partial<Record<Bus, number>>][] = [...Object.entries(fixture.nodes).map(([n, c]) => [joinPath('fixture.nodes', n), c] as [string, Partial<Record<Bus, number>>]), ['fixture.gnd', fixture.gnd]];
  for (const name of Object.keys(fixture.nodes)) {
    if (!nodes.has(name)) log.add(joinPath('fixture.nodes', name), `no node "${name}" on the plan's board`);
  }
  for (const [path, channels] of entries) {
    for (const bus of BUSES) {
      const c = channels[bus];
      if (c === undefined) continue;
      const earlier = owner.get(c);
      if (earlier) log.add(joinPath(path, bus), `channel ${c} is already used by ${earlier}`);
      else owner.set(c, joinPath(path, bus));
    }
  }
  return owner;
}

function channelOf(fixture: FixtureMapData, node: string, bus: Bus): number | undefined {
  return node === GROUND ? fixture.gnd[bus] : fixture.nodes[node]?.[bus];
}

function describeTerminals(step: PlanStep): string {
  if (step.kind === 'transfer') return `HI ${step.hi}, LO gnd and SENSE ${step.sense}`;
  return `HI ${step.hi} and LO ${step.lo}`;
}
