// The simulated switch matrix: relay states, operation counters, stuck relays, operate time and the record
// of bus conflicts. The rule checked is the bench's own: never tie two board nodes to one analyzer bus,
// so switch break-before-make (common practice for instrument switching).

import { describe, expect, it } from 'vitest';
import { SimulatedSwitchMatrix, type ChannelRoute } from '../../../simulators/switch-matrix.js';

/** A fixture like the default map: node k on HI via 1000+k, LO via 2000+k, SENSe via 3000+k; ground k = 0. */
function route(channel: number): ChannelRoute | undefined {
  const bus = (['hi', 'lo', 'sense'] as const)[Math.floor(channel / 1000) - 1];
  const k = channel % 1000;
  if (bus === undefined || k > 24) return undefined;
  return { bus, node: k === 0 ? 'gnd' : `n${k}` };
}

const sorted = (set: ReadonlySet<number>) => [...set].sort((a, b) => a - b);

describe('relay states and queries (SCPI-99 vol. 2, ROUTe subsystem (from memory))', () => {
  it('CLOSe, OPEN and OPEN:ALL change the states that CLOSe?, OPEN? and CLOSe:LIST? report', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@1001,2000,3005)');
    expect(sorted(s.closedChannels())).toEqual([1001, 2000, 3005]);
    expect(await s.receive('ROUT:CLOS? (@3005,1001,1002)')).toBe('1,1,0');
    expect(await s.receive('ROUT:OPEN? (@3005,1001,1002)')).toBe('0,0,1');
    await s.receive('ROUT:OPEN (@2000)');
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@1001,3005)');
    await s.receive('ROUT:OPEN:ALL');
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@)');
    expect(s.closedChannels().size).toBe(0);
    expect(await s.receive('SYST:ERR?')).toBe('0,"No error"');
  });

  it('*RST and power-on open every relay (SCPI-99 *RST state of ROUTe (from memory))', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@1:3)');
    await s.receive('*RST');
    expect(s.closedChannels().size).toBe(0);
    await s.receive('ROUT:CLOS (@4)');
    s.reset();
    expect(s.closedChannels().size).toBe(0);
  });
});

describe('operation counters', () => {
  it('count each change of a relay, not repeated commands to the state it already has', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@101,102)');
    await s.receive('ROUT:CLOS (@101)'); // already closed: no operation
    await s.receive('ROUT:OPEN (@101,103)'); // 103 already open
    await s.receive('ROUT:CLOS (@101,101)'); // listed twice, operates once
    await s.receive('ROUT:OPEN:ALL');
    expect(await s.receive('DIAG:REL:CYCL? (@101,102,103)')).toBe('4,2,0');
    expect([s.cycles(101), s.cycles(102), s.cycles(103)]).toEqual([4, 2, 0]);
  });

  it('survive *RST and power-on, as a relay\'s wear does', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@7)');
    await s.receive('*RST');
    s.reset();
    expect(await s.receive('DIAGnostic:RELay:CYCLes? (@7)')).toBe('2');
  });
});

describe('stuck relays', () => {
  it('a relay stuck open keeps its contacts open while the queries report what was commanded', async () => {
    const s = new SimulatedSwitchMatrix({ stuck: new Map([[1003, 'open']]) });
    await s.receive('ROUT:CLOS (@1003,2000)');
    expect(await s.receive('ROUT:CLOS? (@1003,2000)')).toBe('1,1');
    expect(sorted(s.closedChannels())).toEqual([2000]);
    expect(s.cycles(1003)).toBe(1);
  });

  it('a relay stuck closed stays closed through OPEN, OPEN:ALL and *RST', async () => {
    const s = new SimulatedSwitchMatrix();
    s.setStuck(2004, 'closed');
    expect(sorted(s.closedChannels())).toEqual([2004]);
    await s.receive('ROUT:CLOS (@2004);OPEN (@2004);OPEN:ALL;*RST');
    expect(sorted(s.closedChannels())).toEqual([2004]);
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@)');
    s.setStuck(2004, undefined);
    expect(s.closedChannels().size).toBe(0);
  });
});

describe('bus conflicts (two different board nodes on one bus)', () => {
  it('make-before-break (close the new node, then open the old one) is recorded', async () => {
    const s = new SimulatedSwitchMatrix({ routes: route });
    await s.receive('ROUT:CLOS (@1001,2000)');
    await s.receive('ROUT:CLOS (@1002)');
    await s.receive('ROUT:OPEN (@1001)');
    expect(await s.receive('DIAG:BUS:CONF?')).toBe('1');
    expect(s.conflicts()).toEqual([{ operation: 2, command: 'ROUT:CLOS (@1002)', bus: 'hi', nodes: ['n1', 'n2'], channels: [1001, 1002] }]);
  });

  it('also inside one message: ROUT:CLOS (@1003);OPEN (@1002)', async () => {
    const s = new SimulatedSwitchMatrix({ routes: route });
    await s.receive('ROUT:CLOS (@1002)');
    await s.receive('ROUT:CLOS (@1003);OPEN (@1002)');
    expect(s.conflicts().map((c) => c.nodes)).toEqual([['n2', 'n3']]);
  });

  it('break-before-make (open the old node, then close the new one) is not', async () => {
    const s = new SimulatedSwitchMatrix({ routes: route });
    await s.receive('ROUT:CLOS (@1001,2000)');
    await s.receive('ROUT:OPEN (@1001)');
    await s.receive('ROUT:CLOS (@1002)');
    await s.receive('ROUT:OPEN (@1002);CLOS (@1003)');
    expect(await s.receive('DIAG:BUS:CONF?')).toBe('0');
    expect(s.conflicts()).toEqual([]);
  });

  it('a node on HI and ground on LO is the normal measurement, not a conflict; ground on HI with a node is', async () => {
    const s = new SimulatedSwitchMatrix({ routes: route });
    await s.receive('ROUT:CLOS (@1005,2000,3005)');
    expect(s.conflicts()).toEqual([]);
    await s.receive('ROUT:CLOS (@1000)');
    expect(s.conflicts().map((c) => [c.bus, c.nodes])).toEqual([['hi', ['gnd', 'n5']]]);
  });

  it('a lasting conflict is one moment; a third node joining is another; CLEar empties the record', async () => {
    const s = new SimulatedSwitchMatrix({ routes: new Map([[1, { bus: 'lo', node: 'a' }], [2, { bus: 'lo', node: 'b' }], [3, { bus: 'lo', node: 'c' }], [4, { bus: 'lo', node: 'a' }]]) });
    await s.receive('ROUT:CLOS (@1,2)');
    await s.receive('ROUT:CLOS (@4)'); // node a again: same set of nodes
    await s.receive('ROUT:CLOS (@3)');
    expect(await s.receive('DIAG:BUS:CONF?')).toBe('2');
    await s.receive('DIAG:BUS:CONF:CLE');
    expect(await s.receive('DIAG:BUS:CONF?')).toBe('0');
  });

  it('two channels of the same node on one bus are no conflict', async () => {
    const s = new SimulatedSwitchMatrix({ routes: new Map([[1, { bus: 'hi', node: 'n1' }], [2, { bus: 'hi', node: 'n1' }]]) });
    await s.receive('ROUT:CLOS (@1,2)');
    expect(s.conflicts()).toEqual([]);
  });

  it('a relay stuck closed makes a conflict when the next node is closed', async () => {
    const s = new SimulatedSwitchMatrix({ routes: route, stuck: new Map([[1001, 'closed']]) });
    await s.receive('ROUT:OPEN (@1001);CLOS (@1002)');
    expect(s.conflicts().map((c) => c.nodes)).toEqual([['n1', 'n2']]);
  });

  it('without routes nothing is tracked', async () => {
    const s = new SimulatedSwitchMatrix();
    await s.receive('ROUT:CLOS (@1001,1002)');
    expect(await s.receive('DIAG:BUS:CONF?')).toBe('0');
  });
});

describe('operate time, contact resistance and the change hook', () => {
  it('with an operate time the contacts follow only when the command completes, before *OPC? answers', async () => {
    const s = new SimulatedSwitchMatrix({ operateTimeMs: 5 });
    const closing = s.receive('ROUT:CLOS (@1001);*OPC?');
    expect(s.closedChannels().has(1001)).toBe(false); // coil energised, contacts still moving
    expect(await closing).toBe('1');
    expect(s.closedChannels().has(1001)).toBe(true);
  });

  it('make-before-break is visible with an operate time too', async () => {
    const s = new SimulatedSwitchMatrix({ operateTimeMs: 2, routes: route });
    await s.receive('ROUT:CLOS (@1001)');
    await s.receive('ROUT:CLOS (@1002);OPEN (@1001)');
    expect(s.conflicts()).toHaveLength(1);
  });

  it('exposes the contact resistance, 0.15 ohm by default, with per-channel exceptions', () => {
    expect(new SimulatedSwitchMatrix().contactResistance(1001)).toBe(0.15);
    const s = new SimulatedSwitchMatrix({ contactResistanceOhm: 0.1, contactResistanceByChannel: new Map([[1002, 2.5]]) });
    expect([s.contactResistanceOhm, s.contactResistance(1001), s.contactResistance(1002)]).toEqual([0.1, 0.1, 2.5]);
  });

  it('onChange tells every change of the contacts, and stops after unsubscribing', async () => {
    const s = new SimulatedSwitchMatrix();
    const seen: number[][] = [];
    const stop = s.onChange((closed) => seen.push(sorted(closed)));
    await s.receive('ROUT:CLOS (@5,6)');
    await s.receive('ROUT:CLOS (@5)'); // no change, no call
    await s.receive('ROUT:OPEN (@5)');
    stop();
    await s.receive('ROUT:OPEN:ALL');
    expect(seen).toEqual([[5, 6], [6]]);
  });

  it('refuses a negative operate time or contact resistance with a one-line message', () => {
    expect(() => new SimulatedSwitchMatrix({ operateTimeMs: -1 })).toThrow(/^switch matrix: operateTimeMs must be/);
    expect(() => new SimulatedSwitchMatrix({ contactResistanceOhm: Number.NaN })).toThrow(/^switch matrix: contactResistanceOhm/);
  });
});
