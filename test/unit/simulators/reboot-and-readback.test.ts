// Two simulator features the fault suite leans on: an instrument that reboots mid-scan (once, after N
// messages: its *IDN? firmware field changes, its settings and relays reset, the link drops), and a matrix
// that reads back its contacts, so that a stuck relay shows in ROUTe:CLOSe? and ROUTe:CLOSe:LIST?.
// *IDN? has four fields, maker, model, serial, firmware (IEEE 488.2, 10.14 (from memory)).
import { describe, expect, it } from 'vitest';
import { SimulatedAnalyzer } from '../../../simulators/analyzer.js';
import { Misbehaviour, withMisbehaviour } from '../../../simulators/misbehaviour.js';
import { serveDevice } from '../../../simulators/serve/serve-device.js';
import { SimulatedSwitchMatrix } from '../../../simulators/switch-matrix.js';

const analyzer = () => new SimulatedAnalyzer({ source: { measure: () => ({ re: 50, im: -20 }) }, timeScale: 0 });
const fields = (idn: string) => idn.split(',');

describe('reboot', () => {
  it('is decided once, after N messages, and also drops the link', () => {
    const m = new Misbehaviour({ seed: 3, rebootAfter: 4 });
    const decisions = Array.from({ length: 12 }, () => m.decide('*IDN?'));
    expect(decisions.map((d) => d.reboot)).toEqual([false, false, false, true, false, false, false, false, false, false, false, false]);
    expect(decisions[3].disconnectAfter).toBe(true);
  });

  it('changes the firmware field only, and resets the settings', async () => {
    const a = analyzer();
    const before = await a.receive('*IDN?');
    await a.receive('SOUR:FREQ 123k');
    a.reboot();
    const after = await a.receive('*IDN?');
    expect(after).not.toBe(before);
    expect(fields(after!).slice(0, 3)).toEqual(fields(before!).slice(0, 3));
    expect(fields(after!)[3]).toBe(`${fields(before!)[3]}-boot1`);
    // The reset value of the frequency is 1 kHz (simulators/analyzer.ts), not what was set.
    expect(Number(await a.receive('SOUR:FREQ?'))).toBe(1e3);
  });

  it('over a served link: the answer to the Nth message goes out, then the device reboots and the link drops', async () => {
    const s = new SimulatedSwitchMatrix();
    const out: string[] = [];
    let drops = 0;
    const feed = serveDevice(s, { write: (b) => out.push(Buffer.from(b).toString('latin1')), drop: () => drops++ }, { misbehaviour: new Misbehaviour({ seed: 1, rebootAfter: 3 }) });
    feed(Buffer.from('*IDN?\nROUT:CLOS (@1001)\nROUT:CLOS? (@1001)\n'));
    await new Promise((r) => setTimeout(r, 20));
    expect(out).toHaveLength(2);
    expect(out[1]).toBe('1\n');
    expect(drops).toBe(1);
    expect(s.commandedChannels().size).toBe(0);
    expect(fields(s.identity)[3]).toMatch(/-boot1$/);
  });

  it('an in-process device that reboots through withMisbehaviour comes back as another', async () => {
    const device = withMisbehaviour(analyzer(), new Misbehaviour({ seed: 2, rebootAfter: 2 }));
    const first = await device.receive('*IDN?');
    await device.receive('*IDN?');
    expect(await device.receive('*IDN?')).not.toBe(first);
  });
});

describe('contact readback', () => {
  it('reports a relay stuck open as open and one stuck closed as closed', async () => {
    const s = new SimulatedSwitchMatrix({ stuck: new Map([[1003, 'open'], [2004, 'closed']]), senseContacts: true });
    await s.receive('ROUT:CLOS (@1003,2000)');
    expect(await s.receive('ROUT:CLOS? (@1003,2000)')).toBe('0,1');
    await s.receive('ROUT:OPEN:ALL');
    expect(await s.receive('ROUT:CLOS:LIST?')).toBe('(@2004)');
    expect(await s.receive('ROUT:OPEN? (@2004)')).toBe('0');
  });

  it('without it the queries report what was commanded, as before', async () => {
    const s = new SimulatedSwitchMatrix({ stuck: new Map([[1003, 'open']]) });
    await s.receive('ROUT:CLOS (@1003)');
    expect(await s.receive('ROUT:CLOS? (@1003)')).toBe('1');
  });
});
