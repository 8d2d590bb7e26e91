// Instrument addresses as users write them, and what the operating system's serial errors are turned into.
import { describe, expect, it } from 'vitest';
import { parseAddress } from '../../../src/instruments/transports/address.js';
import { classifyOpenError } from '../../../src/instruments/transports/serial-failures.js';
import { describeSocketError } from '../../../src/instruments/transports/tcp-transport.js';
import { InstrumentSettingError } from '../../../src/instruments/instrument-errors.js';
import { sessionOptionsFor, transportFor } from '../../../src/instruments/connect.js';
import { builtinProfile } from '../../../src/instruments/profile.js';
import { SerialTransport } from '../../../src/instruments/transports/serial-transport.js';

describe('parseAddress', () => {
  it('reads serial paths, with an optional @baud', () => {
    expect(parseAddress('/dev/ttyUSB0')).toEqual({ medium: 'serial', path: '/dev/ttyUSB0' });
    expect(parseAddress('/dev/serial/by-id/usb-Lab_Bench-if00@115200')).toEqual({ medium: 'serial', path: '/dev/serial/by-id/usb-Lab_Bench-if00', baudRate: 115200 });
    expect(parseAddress('COM3')).toEqual({ medium: 'serial', path: 'COM3' });
    expect(parseAddress('serial:ttyS1')).toEqual({ medium: 'serial', path: 'ttyS1' });
  });

  it('reads HOST:PORT, with an optional tcp: prefix (5025 is the customary SCPI socket, common practice)', () => {
    expect(parseAddress('192.168.1.20:5025')).toEqual({ medium: 'tcp', host: '192.168.1.20', port: 5025 });
    expect(parseAddress('tcp:bench-za.lab:5025')).toEqual({ medium: 'tcp', host: 'bench-za.lab', port: 5025 });
    expect(parseAddress('[::1]:5025')).toEqual({ medium: 'tcp', host: '::1', port: 5025 });
  });

  it('refuses anything else with one line naming the flag', () => {
    const bad = (text: string) => {
      try {
        parseAddress(text, '--analyzer');
      } catch (error) {
        expect(error).toBeInstanceOf(InstrumentSettingError);
        expect((error as InstrumentSettingError).exitCode).toBe(2);
        return (error as Error).message;
      }
      throw new Error(`${text} was accepted`);
    };
    expect(bad('bench')).toMatch(/^--analyzer: "bench" is neither a serial port nor HOST:PORT; expected /);
    expect(bad('10.0.0.1:70000')).toMatch(/^--analyzer: "10.0.0.1:70000" has port 70000, outside 1..65535;/);
    expect(bad('/dev/ttyUSB0@fast')).toMatch(/^--analyzer: "\/dev\/ttyUSB0@fast" has a baud rate "fast" that is not a whole number above zero;/);
    expect(bad('')).toMatch(/is empty/);
  });
});

describe('serial open failures', () => {
  // The texts are those the serialport bindings build from strerror (glibc wording, common practice).
  it('no such port', () => {
    const c = classifyOpenError('/dev/ttyUSB7', new Error('Error: No such file or directory, cannot open /dev/ttyUSB7'));
    expect(c).toEqual({ failure: 'no-such-port', reason: 'no such serial port (run "topoprobe ports" to list the ports this machine has)' });
  });

  it('permission denied names the group that owns the port', () => {
    const c = classifyOpenError('/dev/ttyUSB0', new Error('Error: Permission denied, cannot open /dev/ttyUSB0'), 'dialout');
    expect(c.failure).toBe('permission-denied');
    expect(c.reason).toBe('permission denied: add your user to the group "dialout" that may open serial ports (sudo usermod -aG dialout $USER), then log in again');
    const unknown = classifyOpenError('/dev/ttyUSB0', new Error('Error: Permission denied, cannot open /dev/ttyUSB0'), undefined);
    expect(unknown.reason).toContain('"dialout" (or as your distribution names it, e.g. "uucp")');
  });

  it('busy or locked', () => {
    expect(classifyOpenError('/dev/ttyACM0', new Error('Error Resource temporarily unavailable Cannot lock port')).failure).toBe('port-busy');
    expect(classifyOpenError('/dev/ttyACM0', new Error('Error: Device or resource busy, cannot open /dev/ttyACM0')).failure).toBe('port-busy');
  });

  it('anything else keeps the system text', () => {
    expect(classifyOpenError('/dev/ttyS0', new Error('Error: Input/output error, cannot open /dev/ttyS0'))).toEqual({
      failure: 'other',
      reason: 'cannot open the port: Error: Input/output error, cannot open /dev/ttyS0',
    });
  });
});

describe('socket failures (libuv errno names, common practice)', () => {
  const err = (code: string) => Object.assign(new Error(code), { code });
  it('maps refused, unknown host and reset', () => {
    expect(describeSocketError(err('ECONNREFUSED'), 5025)[0]).toBe('refused');
    expect(describeSocketError(err('ECONNREFUSED'), 5025)[1]).toMatch(/^connection refused: nothing listens on port 5025 there/);
    expect(describeSocketError(err('ENOTFOUND'), 5025)[0]).toBe('no-such-port');
    expect(describeSocketError(err('ECONNRESET'), 5025)).toEqual(['closed', 'closed by peer: the connection was reset']);
  });
});

describe('transportFor and sessionOptionsFor follow the profile', () => {
  const profile = builtinProfile('sim-polar-analyzer');

  it('a serial address gets the profile\'s serial settings; "@baud" in the address wins', () => {
    const t = transportFor(parseAddress('/dev/ttyUSB0@9600'), profile) as SerialTransport;
    expect(t.medium).toBe('serial');
    expect(t.settings).toEqual({ path: '/dev/ttyUSB0', baudRate: 9600, dataBits: 8, parity: 'none', stopBits: 1, flowControl: 'none' });
    expect((transportFor(parseAddress('/dev/ttyUSB0'), profile) as SerialTransport).settings.baudRate).toBe(115200);
  });

  it('a TCP address gets the profile\'s connect timeout; the session its terminators, timeout and error query', () => {
    const t = transportFor(parseAddress('127.0.0.1:5025'), profile);
    expect(t.endpoint).toBe('127.0.0.1:5025');
    expect(t.medium).toBe('tcp');
    expect(sessionOptionsFor(profile, { traceFile: 'run.trace' })).toEqual({
      writeTerminator: 'CRLF',
      readTerminator: 'CRLF',
      timeoutMs: 2500,
      errorQuery: 'SYST:ERR?',
      errorDrainLimit: 64,
      traceFile: 'run.trace',
    });
  });
});
