// Puts the pieces together for one instrument: an address and a profile give a transport with the
// profile's serial settings and connect timeout, a session with its terminators, timeouts and error
// query, and the driver of its kind. Opening stays explicit, so a caller can reconnect after a failure.

import type { Transport } from './transport.js';
import { SerialTransport, type SerialSettings } from './transports/serial-transport.js';
import { TcpTransport } from './transports/tcp-transport.js';
import type { InstrumentAddress } from './transports/address.js';
import { ScpiSession, type SessionOptions } from './scpi-session.js';
import type { InstrumentProfile } from './profile-types.js';

/** The transport for `address`, with the profile's serial settings (an "@baud" in the address wins). */
export function transportFor(address: InstrumentAddress, profile: InstrumentProfile, serial: Partial<Omit<SerialSettings, 'path'>> = {}): Transport {
  if (address.medium === 'tcp') {
    return new TcpTransport({ host: address.host, port: address.port, connectTimeoutMs: profile.timeouts.connectMs });
  }
  return new SerialTransport({ ...profile.serial, ...serial, path: address.path, ...(address.baudRate ? { baudRate: address.baudRate } : {}) });
}

/** Session options that follow the profile; `extra` adds a trace file or overrides. */
export function sessionOptionsFor(profile: InstrumentProfile, extra: SessionOptions = {}): SessionOptions {
  return {
    writeTerminator: profile.terminators.write,
    readTerminator: profile.terminators.read,
    timeoutMs: profile.timeouts.commandMs,
    errorQuery: profile.errors.query,
    errorDrainLimit: profile.errors.drainLimit,
    ...extra,
  };
}

export function sessionFor(profile: InstrumentProfile, transport: Transport, extra: SessionOptions = {}): ScpiSession {
  return new ScpiSession(transport, sessionOptionsFor(profile, extra));
}
