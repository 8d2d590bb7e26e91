// Which switch-matrix channel joins which board node to which analyzer bus, and back. Closing the `hi`
// channel of node X joins X to the analyzer's HI bus, `lo` to the LO bus, `sense` to the SENSE bus;
// ground has its own three channels under `gnd`.
import { GROUND } from '../board/types.js';

export type Bus = 'hi' | 'lo' | 'sense';
export const BUSES: readonly Bus[] = ['hi', 'lo', 'sense'];

/** The channels of one node (or of ground); any of them may be absent. */
export type NodeChannels = Partial<Record<Bus, number>>;

/** The plain data of a map, as read from or written to a file. */
export interface FixtureMapData {
  nodes: Record<string, NodeChannels>;
  gnd: NodeChannels;
}

/** What closing one channel does: joins `node` (GROUND for ground) to `bus`. */
export interface Terminal {
  node: string;
  bus: Bus;
}

/** The lowest and highest channel number a switch matrix of ours answers to. */
export const CHANNEL_MIN = 1;
export const CHANNEL_MAX = 9999;

export class FixtureMap {
  private readonly byChannel = new Map<number, Terminal>();
  private readonly data: FixtureMapData;

  /** `source` says where the map came from in messages: a file path or "default map for board X". */
  constructor(data: FixtureMapData, readonly source: string) {
    this.data = { nodes: {}, gnd: { ...data.gnd } };
    for (const [node, channels] of Object.entries(data.nodes)) this.data.nodes[node] = { ...channels };
    for (const [node, channels] of [...Object.entries(this.data.nodes), [GROUND, this.data.gnd] as const]) {
      for (const bus of BUSES) {
        const channel = channels[bus];
        if (channel === undefined) continue;
        const other = this.byChannel.get(channel);
        // The file reader reports this as a problem of the file; reaching it here is a caller's bug.
        if (other) throw new RangeError(`${source}: channel ${channel} is used by ${other.node}.${other.bus} and ${node}.${bus}`);
        this.byChannel.set(channel, { node, bus });
      }
    }
  }

  /** The channel joining `node` (GROUND for ground) to `bus`, if the fixture has one. */
  channel(node: string, bus: Bus): number | undefined {
    return node === GROUND ? this.data.gnd[bus] : this.data.nodes[node]?.[bus];
  }

  /** What a channel joins, or undefined for a channel the fixture does not wire. */
  terminal(channel: number): Terminal | undefined {
    return this.byChannel.get(channel);
  }

  /** Board nodes the map lists, in map order (ground not included). */
  get nodeNames(): string[] {
    return Object.keys(this.data.nodes);
  }

  /** Every wired channel, ascending. */
  get channels(): number[] {
    return [...this.byChannel.keys()].sort((a, b) => a - b);
  }

  /** A copy of the plain data (for writing the map to a file). */
  toData(): FixtureMapData {
    const nodes: Record<string, NodeChannels> = {};
    for (const [node, channels] of Object.entries(this.data.nodes)) nodes[node] = { ...channels };
    return { nodes, gnd: { ...this.data.gnd } };
  }
}
