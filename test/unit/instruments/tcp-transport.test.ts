// The TCP transport against a node:net server on 127.0.0.1 (loopback only): bytes both ways, a SCPI
// session on top, refused connections, a peer that hangs up, a connect that never completes, reconnect.
import { createServer, Socket, type Server } from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import { transportRejection } from '../../support/transport-rejection.js';
import { TcpTransport } from '../../../src/instruments/transports/tcp-transport.js';
import { ScpiSession } from '../../../src/instruments/scpi-session.js';

const servers: Server[] = [];
const sockets: Socket[] = [];
afterEach(async () => {
  for (const socket of sockets.splice(0)) socket.destroy();
  await Promise.all(servers.splice(0).map((s) => new Promise((r) => s.close(r))));
});

/** A line-echoing instrument: answers "*IDN?" and echoes other queries upper-cased. */
function listen(onSocket?: (socket: Socket) => void): Promise<number> {
  const server = createServer((socket) => {
    sockets.push(socket);
    if (onSocket) return onSocket(socket);
    let buffer = '';
    socket.on('data', (d) => {
      buffer += d.toString('latin1');
      let at: number;
      while ((at = buffer.indexOf('\n')) >= 0) {
        const line = buffer.slice(0, at);
        buffer = buffer.slice(at + 1);
        if (line === '*IDN?') socket.write('Topoprobe Lab,SIM-SW256,SW-0007,2.0.1\n');
        else if (line.includes('?')) socket.write(`${line.toUpperCase()}\n`);
      }
    });
  });
  servers.push(server);
  return new Promise((resolve) => server.listen(0, '127.0.0.1', () => resolve((server.address() as { port: number }).port)));
}

const rejection = transportRejection;

describe('TcpTransport', () => {
  it('carries a SCPI conversation', async () => {
    const port = await listen();
    const transport = new TcpTransport({ host: '127.0.0.1', port });
    expect(transport.endpoint).toBe(`127.0.0.1:${port}`);
    const session = new ScpiSession(transport, { timeoutMs: 2000 });
    await session.open();
    expect(transport.isOpen).toBe(true);
    expect((await session.identify()).model).toBe('SIM-SW256');
    expect(await session.query('rout:clos? (@101)')).toBe('ROUT:CLOS? (@101)');
    await session.close();
    expect(transport.isOpen).toBe(false);
    await session.close(); // twice is fine
  });

  it('connection refused', async () => {
    const port = await listen();
    await new Promise((r) => servers.pop()!.close(r)); // nothing listens there any more
    const error = await rejection(new TcpTransport({ host: '127.0.0.1', port }).open());
    expect(error.failure).toBe('refused');
    expect(error.exitCode).toBe(3);
    expect(error.message).toBe(`127.0.0.1:${port}: connection refused: nothing listens on port ${port} there (instrument off, or its LAN/SCPI socket disabled)`);
  });

  it('a connection that is never accepted times out', async () => {
    // A socket whose connect() goes nowhere stands in for a host that drops the request.
    const silent = () => Object.assign(new Socket(), { connect: function (this: Socket) { return this; } }) as Socket;
    const error = await rejection(new TcpTransport({ host: '127.0.0.1', port: 5025, connectTimeoutMs: 50, socketFactory: silent }).open());
    expect(error.failure).toBe('timeout');
    expect(error.message).toBe('127.0.0.1:5025: no answer to the connection request within 50 ms (wrong address, instrument off, or a firewall drops it)');
  });

  it('a peer that hangs up is "closed by peer", for the waiting query too', async () => {
    const port = await listen((socket) => socket.on('data', () => socket.end()));
    const transport = new TcpTransport({ host: '127.0.0.1', port });
    const session = new ScpiSession(transport, { timeoutMs: 5000 });
    await session.open();
    const error = await rejection(session.query('*IDN?'));
    expect(error.failure).toBe('closed');
    expect(error.message).toBe(`127.0.0.1:${port}: closed by peer: the instrument ended the connection`);
  });

  it('reconnects after a close', async () => {
    const port = await listen();
    const transport = new TcpTransport({ host: '127.0.0.1', port });
    const session = new ScpiSession(transport);
    await session.open();
    await session.close();
    await session.open();
    expect(await session.query('x?')).toBe('X?');
    await session.close();
  });

  it('writing while closed is refused', async () => {
    const error = await rejection(new TcpTransport({ host: '127.0.0.1', port: 1 }).write('*CLS\n'));
    expect(error.message).toBe('127.0.0.1:1: not open');
  });
});
