// The serial transport over a real pseudo-terminal pair made by socat, at 115200 baud, against a small
// responder on the other end: a conversation, terminators, a timeout, garbled bytes, a port already in
// use, a wrong path, a reconnect, and the other end going away (socat killed).
import { mkdtempSync, renameSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { transportRejection } from '../support/transport-rejection.js';
import { toolAvailable } from '../support/requirements.js';
import { SerialTransport } from '../../src/instruments/transports/serial-transport.js';
import { ScpiSession } from '../../src/instruments/scpi-session.js';
import { startPtyPair, startResponder, type PtyPair } from './pty-pair.js';

const IDN = 'Topoprobe Lab,SIM-ZA100,ZA-0042,1.3.0';
const hasSocat = toolAvailable('socat');

const rejection = transportRejection;

describe.skipIf(!hasSocat)('serial transport over a socat pty pair', () => {
  let pair: PtyPair;
  let responder: Awaited<ReturnType<typeof startResponder>>;

  beforeAll(async () => {
    pair = await startPtyPair();
    responder = await startResponder(pair.far, (line) => {
      if (line === '*IDN?') return `${IDN}\n`;
      if (line === 'TERM:CRLF?') return 'CRLF answer\r\n';
      if (line === 'NOISE?') return Uint8Array.from([0xf8, 0x80, 0x1c, 0xfe, 0x0a]); // as at a wrong baud rate
      if (line === 'FETCh?') return '1.25E+02,-3.5E+01\n';
      return undefined; // silence, e.g. for SILENT?
    });
  });

  afterAll(async () => {
    await responder?.close();
    await pair?.stop();
  });

  it('opens at 115200 baud and carries a query and its answer', async () => {
    const transport = new SerialTransport({ path: pair.near, baudRate: 115200 });
    const session = new ScpiSession(transport, { timeoutMs: 2000 });
    await session.open();
    expect(transport.isOpen).toBe(true);
    expect((await session.identify()).model).toBe('SIM-ZA100');
    expect(await session.query('FETCh?')).toBe('1.25E+02,-3.5E+01');
    await session.close();
    expect(transport.isOpen).toBe(false);
    expect(responder.heard.slice(-2)).toEqual(['*IDN?', 'FETCh?']);
  });

  it('writes and reads CR LF when told to', async () => {
    const session = new ScpiSession(new SerialTransport({ path: pair.near, baudRate: 115200, flowControl: 'none' }), {
      writeTerminator: 'CRLF',
      readTerminator: 'CRLF',
    });
    await session.open();
    expect(await session.query('TERM:CRLF?')).toBe('CRLF answer');
    expect(responder.heard[responder.heard.length - 1]).toBe('TERM:CRLF?\r');
    await session.close();
  });

  it('an unanswered query times out naming the command', async () => {
    const session = new ScpiSession(new SerialTransport({ path: pair.near, baudRate: 115200 }), { timeoutMs: 150 });
    await session.open();
    const error = await rejection(session.query('SILENT?'));
    expect(error.failure).toBe('timeout');
    expect(error.message).toBe(`${pair.near}: no answer to "SILENT?" within 150 ms`);
    await session.close();
  });

  it('bytes that are not ASCII are called garbage, with the baud rate hint', async () => {
    const session = new ScpiSession(new SerialTransport({ path: pair.near, baudRate: 115200 }), { timeoutMs: 1000 });
    await session.open();
    const error = await rejection(session.query('NOISE?'));
    expect(error.failure).toBe('garbage');
    expect(error.message).toBe(`${pair.near}: answer to "NOISE?" holds bytes that are not ASCII text (0xF8 0x80 0x1C 0xFE at byte 1): likely a wrong baud rate (or data bits, parity)`);
    await session.close();
  });

  it('a port held open by another program is busy (serialport locks ports by default)', async () => {
    const first = new SerialTransport({ path: pair.near, baudRate: 115200 });
    await first.open();
    const error = await rejection(new SerialTransport({ path: pair.near, baudRate: 115200 }).open());
    expect(error.failure).toBe('port-busy');
    expect(error.message).toBe(`${pair.near}: port is busy: another program has it open or locked; close that program first`);
    await first.close();
  });

  it('reconnects: close and open again on the same transport', async () => {
    const transport = new SerialTransport({ path: pair.near, baudRate: 115200, parity: 'none', dataBits: 8, stopBits: 1 });
    const session = new ScpiSession(transport);
    await session.open();
    await session.close();
    await session.open();
    expect(await session.query('*IDN?')).toBe(IDN);
    await session.close();
    await transport.close(); // twice is fine
  });
});

describe.skipIf(!hasSocat)('serial transport failures', () => {
  it('a wrong path is "no such serial port"', async () => {
    const error = await rejection(new SerialTransport({ path: '/dev/ttyTOPOPROBE-none', baudRate: 115200 }).open());
    expect(error.failure).toBe('no-such-port');
    expect(error.exitCode).toBe(3);
    expect(error.message).toBe('/dev/ttyTOPOPROBE-none: no such serial port (run "topoprobe ports" to list the ports this machine has)');
  });

  it('the other end going away (socat killed) is "closed by peer", for the waiting query and after', async () => {
    const pair = await startPtyPair();
    const transport = new SerialTransport({ path: pair.near, baudRate: 115200 });
    const session = new ScpiSession(transport, { timeoutMs: 10_000 });
    await session.open();
    const waiting = session.query('*IDN?'); // nobody on the far end answers
    await new Promise((r) => setTimeout(r, 50));
    await pair.stop();
    const error = await rejection(waiting);
    expect(error.failure).toBe('closed');
    expect(error.message).toBe(`${pair.near}: closed by peer: the port went away (cable or adapter unplugged, or the instrument switched off)`);
    expect(transport.isOpen).toBe(false);
    expect((await rejection(session.query('*IDN?'))).failure).toBe('closed');
    await session.close();
  });

  it('a device link that comes to name another device is "closed by peer" too, with no hang-up to hear', async () => {
    // Like /dev/serial/by-id/... after an adapter is swapped: the link now leads elsewhere, the old line is dead.
    const pair = await startPtyPair();
    const dir = mkdtempSync(path.join(tmpdir(), 'topoprobe-link-'));
    const link = path.join(dir, 'analyzer');
    symlinkSync(pair.near, link);
    const transport = new SerialTransport({ path: link, baudRate: 115200 });
    const session = new ScpiSession(transport, { timeoutMs: 10_000 });
    await session.open();
    const waiting = session.query('*IDN?'); // nobody answers, and socat keeps both ends up
    const moved = path.join(dir, 'moved');
    symlinkSync(pair.far, moved);
    renameSync(moved, link);
    const error = await rejection(waiting);
    expect(error.failure).toBe('closed');
    expect(error.message).toBe(`${link}: closed by peer: the port went away (cable or adapter unplugged, or the instrument switched off)`);
    await session.close();
    await pair.stop();
    rmSync(dir, { recursive: true, force: true });
  });
});
