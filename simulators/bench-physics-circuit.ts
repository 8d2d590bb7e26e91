// The circuit the analyzer sees for one relay state: the board as built plus the three analyzer buses
// as extra nodes. Each closed relay is its contact resistance between its bus and its board node (or
// ground), with the relay's stray capacitance from the board node to ground. Several nodes on one bus
// are thereby tied together through their contacts, as the real switch matrix does.
import { GROUND, type Board, type Part } from '../src/board/types.js';
import { BUSES, type Bus, type FixtureMap } from '../src/instruments/fixture-map.js';

/** Names of the bus nodes. Board node names never hold white space, so these cannot clash. */
export const BUS_NODE: Record<Bus, string> = { hi: 'bus HI', lo: 'bus LO', sense: 'bus SENSE' };

export interface MeasurementCircuit {
  /** The board as built with the bus nodes, relay contacts and strays added. */
  board: Board;
  /** Whether a closed relay joins the bus to anything; a bus that reaches nothing is not in `board`. */
  reaches: Record<Bus, boolean>;
  /** The wired channels that are closed, ascending (channels the fixture does not wire are ignored). */
  channels: number[];
}

export interface RelayParasitics {
  contactResistance: number;
  strayCapacitance: number;
}

/** The wired, closed channels, ascending: the key of a relay state. */
export function wiredClosedChannels(map: FixtureMap, closed: Iterable<number>): number[] {
  return [...new Set(closed)].filter((c) => map.terminal(c) !== undefined).sort((a, b) => a - b);
}

export function buildMeasurementCircuit(board: Board, map: FixtureMap, channels: readonly number[], relay: RelayParasitics): MeasurementCircuit {
  const reaches: Record<Bus, boolean> = { hi: false, lo: false, sense: false };
  const extra: Part[] = [];
  for (const channel of channels) {
    const terminal = map.terminal(channel);
    if (!terminal) continue;
    reaches[terminal.bus] = true;
    const origin = `switch channel ${channel} (${terminal.node} to ${terminal.bus.toUpperCase()} bus)`;
    extra.push({ ref: `relay ${channel}`, kind: 'R', nodes: [BUS_NODE[terminal.bus], terminal.node], value: relay.contactResistance, origin });
    if (relay.strayCapacitance > 0 && terminal.node !== GROUND) {
      extra.push({ ref: `stray ${channel}`, kind: 'C', nodes: [terminal.node, GROUND], value: relay.strayCapacitance, origin });
    }
  }
  const busNodes = BUSES.filter((bus) => reaches[bus]).map((bus) => ({ name: BUS_NODE[bus], position: [0, 0, 0] as [number, number, number] }));
  return {
    board: { name: `${board.name} on the fixture`, file: board.file, nodes: [...board.nodes, ...busNodes], parts: [...board.parts, ...extra] },
    reaches,
    channels: [...channels],
  };
}
