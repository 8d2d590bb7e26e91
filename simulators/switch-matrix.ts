// The simulated switch matrix: relays on channels 1..9999 that tie board nodes to the analyzer's buses.
// It keeps what the physics needs (which contacts are closed, their resistance) and what a lab wants to know
// afterwards (operations per relay, and every moment two board nodes were tied to one bus).
//
// Commanded state and contact state differ only for a stuck relay. Like a real mainframe, which cannot sense
// its contacts, the queries report the commanded state; `closedChannels()` reports the contacts. With
// `senseContacts` (a matrix with relay readback) the queries report the contacts, so a stuck relay shows.

import { ScpiInstrument } from './scpi-instrument.js';
import type { CommandSpec } from './scpi/command-tree.js';
import { delay } from './scpi/delay.js';
import { channelList, nr1 } from './scpi/response-format.js';
import { ScpiDevice } from './scpi/scpi-device.js';
import type { ChannelsSpec } from './scpi/parameters.js';
import { VERSION } from '../src/version.js';

export const CHANNEL_MIN = 1;
export const CHANNEL_MAX = 9999;

export type BusName = 'hi' | 'lo' | 'sense';

/** What closing a channel does: joins `node` (a board node name, or the ground node) to `bus`. */
export interface ChannelRoute {
  bus: BusName;
  node: string;
}

/** The fixture's channel -> (bus, node) mapping; channels it does not know join nothing. */
export type ChannelRoutes = ((channel: number) => ChannelRoute | undefined) | ReadonlyMap<number, ChannelRoute>;

export type StuckState = 'open' | 'closed';

/** A moment when two or more different nodes became tied to one bus. */
export interface BusConflict {
  /** Which relay operation since power-on caused it (1 is the first). */
  operation: number;
  /** The command as typed, or a note for a fault that appeared by itself. */
  command: string;
  bus: BusName;
  /** The distinct nodes tied to the bus, sorted. */
  nodes: string[];
  /** The closed channels on the bus, ascending. */
  channels: number[];
}

export interface SwitchMatrixOptions {
  serial?: string;
  /** Closed-contact resistance in ohms, exposed for the physics; default 0.15 Ω. */
  contactResistanceOhm?: number;
  /** Per-channel exceptions (a worn relay), in ohms. */
  contactResistanceByChannel?: ReadonlyMap<number, number>;
  /** Relay operate time in ms, added after every command that moves a relay; default 0. */
  operateTimeMs?: number;
  /** Without routes, bus conflicts are not tracked. */
  routes?: ChannelRoutes;
  /** Relays that stay open or closed whatever is commanded. */
  stuck?: ReadonlyMap<number, StuckState>;
  /** A matrix that senses its contacts (relay readback): the queries report the contacts, not the commands. */
  senseContacts?: boolean;
  /**
   * Relays already closed when the matrix starts, as a crashed session may leave a mainframe that was not
   * power-cycled. Not counted as operations; a conflict they make is recorded as "left closed at start".
   */
  closedAtStart?: readonly number[];
  errorQueueSize?: number;
}

export type ChangeListener = (closed: ReadonlySet<number>) => void;

export class SimulatedSwitchMatrix extends ScpiInstrument {
  readonly contactResistanceOhm: number;
  readonly operateTimeMs: number;
  protected readonly scpi: ScpiDevice;
  private readonly commanded = new Set<number>();
  private contacts = new Set<number>();
  private readonly operations = new Map<number, number>();
  private readonly stuck = new Map<number, StuckState>();
  private readonly listeners = new Set<ChangeListener>();
  private readonly recorded: BusConflict[] = [];
  /** The node sets of the buses in conflict right now, so that a lasting conflict is recorded once. */
  private readonly conflictNow = new Map<BusName, string>();
  private readonly routeOf?: (channel: number) => ChannelRoute | undefined;
  private readonly contactResistanceByChannel: ReadonlyMap<number, number>;
  private operationCount = 0;
  private readonly senseContacts: boolean;

  constructor(options: SwitchMatrixOptions = {}) {
    super();
    this.contactResistanceOhm = options.contactResistanceOhm ?? 0.15;
    this.operateTimeMs = options.operateTimeMs ?? 0;
    if (!(this.contactResistanceOhm >= 0) || !Number.isFinite(this.contactResistanceOhm)) throw new RangeError(`switch matrix: contactResistanceOhm must be a finite value >= 0, got ${this.contactResistanceOhm}`);
    if (!(this.operateTimeMs >= 0) || !Number.isFinite(this.operateTimeMs)) throw new RangeError(`switch matrix: operateTimeMs must be a finite value >= 0, got ${this.operateTimeMs}`);
    this.contactResistanceByChannel = options.contactResistanceByChannel ?? new Map();
    const routes = options.routes;
    if (routes !== undefined) this.routeOf = typeof routes === 'function' ? routes : (channel) => routes.get(channel);
    for (const [channel, state] of options.stuck ?? []) this.stuck.set(channel, state);
    this.senseContacts = options.senseContacts ?? false;
    for (const channel of options.closedAtStart ?? []) {
      if (!Number.isInteger(channel) || channel < CHANNEL_MIN || channel > CHANNEL_MAX) throw new RangeError(`switch matrix: closedAtStart channel ${channel} is outside ${CHANNEL_MIN}..${CHANNEL_MAX}`);
      this.commanded.add(channel);
    }
    this.contacts = this.contactState();
    if (this.contacts.size > 0) this.recordConflicts('left closed at start');
    this.scpi = new ScpiDevice(
      {
        identity: `Topoprobe Lab,SIM-SW256,${options.serial ?? 'SW0001'},${VERSION}`,
        commands: this.commands(),
        resetSettings: () => this.openAllNow('*RST'),
        // Power-on: every relay drops open. Operation counts and the conflict record survive, as on the bench.
        powerOn: () => this.openAllNow('power-on'),
      },
      { errorQueueSize: options.errorQueueSize },
    );
  }

  /** The channels whose contacts are closed now (stuck relays included): what the physics connects. */
  closedChannels(): ReadonlySet<number> {
    return new Set(this.contacts);
  }

  /** The channels commanded closed (what the queries report). */
  commandedChannels(): ReadonlySet<number> {
    return new Set(this.commanded);
  }

  conflicts(): readonly BusConflict[] {
    return this.recorded.map((c) => ({ ...c, nodes: [...c.nodes], channels: [...c.channels] }));
  }

  clearConflicts(): void {
    this.recorded.length = 0;
  }

  /** Relay operations (open->closed or closed->open as commanded) of a channel since the simulator started. */
  cycles(channel: number): number {
    return this.operations.get(channel) ?? 0;
  }

  contactResistance(channel: number): number {
    return this.contactResistanceByChannel.get(channel) ?? this.contactResistanceOhm;
  }

  /** Makes a relay stick open or closed (undefined repairs it); takes effect on the contacts at once. */
  setStuck(channel: number, state: StuckState | undefined): void {
    if (state === undefined) this.stuck.delete(channel);
    else this.stuck.set(channel, state);
    this.applyContacts(`fault: channel ${channel} ${state === undefined ? 'repaired' : `stuck ${state}`}`);
  }

  /** Called after every change of the contacts; returns the function that unsubscribes. */
  onChange(listener: ChangeListener): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private commands(): CommandSpec[] {
    const list: ChannelsSpec[] = [{ kind: 'channels', name: 'the channel list', min: CHANNEL_MIN, max: CHANNEL_MAX }];
    const reported = () => (this.senseContacts ? this.contacts : this.commanded);
    const states = (channels: readonly number[], closed: boolean) => channels.map((c) => (reported().has(c) === closed ? '1' : '0')).join(',');
    return [
      {
        header: 'ROUTe:CLOSe',
        set: { params: list, run: (c) => this.operate(c.header, c.channels(0), true) },
        query: { params: list, run: (c) => states(c.channels(0), true) },
      },
      {
        header: 'ROUTe:OPEN',
        set: { params: list, run: (c) => this.operate(c.header, c.channels(0), false) },
        query: { params: list, run: (c) => states(c.channels(0), false) },
      },
      { header: 'ROUTe:OPEN:ALL', set: { run: (c) => this.operate(c.header, [...this.commanded].sort((a, b) => a - b), false) } },
      { header: 'ROUTe:CLOSe:LIST', query: { run: () => channelList([...reported()].sort((a, b) => a - b)) } },
      { header: 'DIAGnostic:RELay:CYCLes', query: { params: list, run: (c) => c.channels(0).map((ch) => nr1(this.cycles(ch))).join(',') } },
      { header: 'DIAGnostic:BUS:CONFlicts', query: { run: () => nr1(this.recorded.length) } },
      { header: 'DIAGnostic:BUS:CONFlicts:CLEar', set: { run: () => this.clearConflicts() } },
    ];
  }

  /**
   * Moves the relays of one command together: the coils switch at once, the contacts follow after the
   * operate time, and only then does the next command run (so make-before-break is visible in between).
   */
  private operate(command: string, channels: readonly number[], close: boolean): Promise<void> | void {
    if (this.moveCoils(channels, close) === 0) return;
    const note = `${command} ${channelList(channels)}`;
    if (this.operateTimeMs === 0) return this.applyContacts(note);
    return delay(this.operateTimeMs).then(() => this.applyContacts(note));
  }

  /** *RST and power-on: every relay opens, with no operate time to wait for (nothing else runs meanwhile). */
  private openAllNow(note: string): void {
    this.moveCoils([...this.commanded], false);
    this.applyContacts(note);
  }

  /** Commands the coils; counts one operation per relay that changes. Returns how many changed. */
  private moveCoils(channels: readonly number[], close: boolean): number {
    const moved = [...new Set(channels)].filter((c) => this.commanded.has(c) !== close);
    for (const c of moved) {
      if (close) this.commanded.add(c);
      else this.commanded.delete(c);
      this.operations.set(c, this.cycles(c) + 1);
    }
    if (moved.length > 0) this.operationCount++;
    return moved.length;
  }

  private contactState(): Set<number> {
    const contacts = new Set<number>();
    for (const c of this.commanded) if (this.stuck.get(c) !== 'open') contacts.add(c);
    for (const [c, state] of this.stuck) if (state === 'closed') contacts.add(c);
    return contacts;
  }

  private applyContacts(command: string): void {
    const next = this.contactState();
    const same = next.size === this.contacts.size && [...next].every((c) => this.contacts.has(c));
    if (same) return;
    this.contacts = next;
    this.recordConflicts(command);
    const snapshot: ReadonlySet<number> = new Set(next);
    for (const listener of this.listeners) listener(snapshot);
  }

  private recordConflicts(command: string): void {
    if (this.routeOf === undefined) return;
    const byBus = new Map<BusName, { nodes: Set<string>; channels: number[] }>();
    for (const channel of [...this.contacts].sort((a, b) => a - b)) {
      const route = this.routeOf(channel);
      if (route === undefined) continue;
      const entry = byBus.get(route.bus) ?? { nodes: new Set<string>(), channels: [] };
      entry.nodes.add(route.node);
      entry.channels.push(channel);
      byBus.set(route.bus, entry);
    }
    for (const bus of ['hi', 'lo', 'sense'] as const) {
      const entry = byBus.get(bus);
      if (entry === undefined || entry.nodes.size < 2) {
        this.conflictNow.delete(bus);
        continue;
      }
      const nodes = [...entry.nodes].sort();
      const key = nodes.join('\u0000');
      if (this.conflictNow.get(bus) === key) continue;
      this.conflictNow.set(bus, key);
      this.recorded.push({ operation: this.operationCount, command, bus, nodes, channels: entry.channels });
    }
  }
}
