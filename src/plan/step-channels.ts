// The switch-matrix channels each reading closes, from the fixture map, HI first:
//   to-ground  [hi of the node, lo of gnd]
//   two-point  [hi of `hi`, lo of `lo`]
//   transfer   [hi of the driven node, lo of gnd, sense of the sensed node]
// A channel the map lacks, or one outside the switch's channel range, is a problem of the map named
// with its field (every one is collected before the plan is refused).
import { joinPath, ProblemLog } from '../board/errors.js';
import { GROUND } from '../board/types.js';
import { FixtureMapError, type Bus, type FixtureMap } from '../instruments/fixture-map.js';
import type { SwitchProfile } from '../instruments/profile-types.js';
import type { Reading } from '../predict/tolerance-readings.js';

export function terminalsOf(reading: Reading): [node: string, bus: Bus][] {
  switch (reading.kind) {
    case 'to-ground':
      return [[reading.hi, 'hi'], [GROUND, 'lo']];
    case 'two-point':
      return [[reading.hi, 'hi'], [reading.lo, 'lo']];
    case 'transfer':
      return [[reading.hi, 'hi'], [GROUND, 'lo'], [reading.sense as string, 'sense']];
  }
}

export function stepChannels(readings: readonly Reading[], map: FixtureMap, switchProfile: SwitchProfile): number[][] {
  const log = new ProblemLog(map.source);
  const reported = new Set<string>();
  const range = switchProfile.limits.channels;
  const out = readings.map((reading) =>
    terminalsOf(reading).map(([node, bus]) => {
      const channel = map.channel(node, bus);
      const field = node === GROUND ? joinPath('gnd', bus) : joinPath('nodes', node, bus);
      if (channel === undefined) {
        if (!reported.has(field)) log.add(field, `missing; the plan reads ${describe(reading)} and needs the channel joining ${node === GROUND ? 'gnd' : `node ${node}`} to the ${bus.toUpperCase()} bus`);
        reported.add(field);
        return 0;
      }
      if (channel < range.min || channel > range.max) {
        if (!reported.has(field)) log.add(field, `channel ${channel} is outside the switch's limits.channels = ${range.min}..${range.max} of ${switchProfile.file}`);
        reported.add(field);
      }
      return channel;
    }),
  );
  if (log.count > 0) throw new FixtureMapError(log.problems);
  return out;
}

function describe(reading: Reading): string {
  if (reading.kind === 'transfer') return `the transfer from ${reading.hi} to ${reading.sense}`;
  if (reading.kind === 'two-point') return `${reading.hi} against ${reading.lo}`;
  return `${reading.hi} to ground`;
}
