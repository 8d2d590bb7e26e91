// A simulated instrument on a raw TCP socket, as LAN instruments offer SCPI (port 5025 is customary,
// common practice). Loopback only: the bench is never reachable from another machine.
import net from 'node:net';
import type { SimulatedDevice } from '../device.js';
import { serveDevice, type ServeOptions } from './serve-device.js';

export const LOOPBACK = '127.0.0.1';

export interface RunningServer {
  endpoint: string;
  close(): Promise<void>;
}

export function serveTcp(device: SimulatedDevice, port: number, options: ServeOptions = {}): Promise<RunningServer> {
  const sockets = new Set<net.Socket>();
  const server = net.createServer((socket) => {
    sockets.add(socket);
    socket.setNoDelay(true);
    const feed = serveDevice(
      device,
      {
        write: (bytes) => {
          if (!socket.destroyed) socket.write(bytes);
        },
        drop: () => socket.destroy(),
      },
      options,
    );
    socket.on('data', feed);
    socket.on('error', () => socket.destroy());
    socket.on('close', () => sockets.delete(socket));
  });
  return new Promise((resolve, reject) => {
    server.once('error', (err: NodeJS.ErrnoException) => {
      reject(new Error(err.code === 'EADDRINUSE' ? `TCP port ${port} on ${LOOPBACK} is already in use` : `cannot listen on ${LOOPBACK}:${port}: ${err.message}`));
    });
    server.listen(port, LOOPBACK, () => {
      const address = server.address() as net.AddressInfo;
      resolve({
        endpoint: `${LOOPBACK}:${address.port}`,
        close: () =>
          new Promise<void>((done) => {
            for (const s of sockets) s.destroy();
            server.close(() => done());
          }),
      });
    });
  });
}
