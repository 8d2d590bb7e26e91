// `topoprobe ports` and the port scan behind it, on a made-up /dev and /sys tree: the Linux layout of
// tty devices and USB attributes (sysfs, common practice), and serialport's list when it works.
import { mkdirSync, mkdtempSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { listSerialPorts, scanDevicePorts } from '../../../src/instruments/port-list.js';
import { methodNote, portsCommand, portsJson, portsTable } from '../../../src/cli/ports-command.js';

/** A /dev with ttyUSB0 (an FTDI adapter, by-id link), ttyACM0, ttyS0 (a UART) and ttyS1 (none there). */
function fakeTree(): { dev: string; sys: string } {
  const root = mkdtempSync(join(tmpdir(), 'topoprobe-ports-'));
  const dev = join(root, 'dev');
  const sys = join(root, 'sys');
  mkdirSync(join(dev, 'serial', 'by-id'), { recursive: true });
  for (const name of ['ttyUSB0', 'ttyACM0', 'ttyS0', 'ttyS1', 'tty0', 'null']) writeFileSync(join(dev, name), '');
  symlinkSync('../../ttyUSB0', join(dev, 'serial', 'by-id', 'usb-Lab_Bench_Adapter_A1B2C3-if00-port0'));
  symlinkSync('../../ttyUSB9', join(dev, 'serial', 'by-id', 'usb-gone-if00')); // dangling: unplugged
  // USB device: attributes two levels above the tty's interface.
  const usb = join(sys, 'devices', 'pci0000:00', 'usb1', '1-2');
  const iface = join(usb, '1-2:1.0', 'ttyUSB0');
  mkdirSync(iface, { recursive: true });
  writeFileSync(join(usb, 'idVendor'), '0403\n');
  writeFileSync(join(usb, 'idProduct'), '6001\n');
  writeFileSync(join(usb, 'manufacturer'), 'FTDI\n');
  writeFileSync(join(usb, 'serial'), 'A1B2C3\n');
  mkdirSync(join(sys, 'class', 'tty', 'ttyUSB0'), { recursive: true });
  symlinkSync(iface, join(sys, 'class', 'tty', 'ttyUSB0', 'device'));
  for (const [name, type] of [['ttyS0', '4'], ['ttyS1', '0']]) {
    mkdirSync(join(sys, 'class', 'tty', name), { recursive: true });
    writeFileSync(join(sys, 'class', 'tty', name, 'type'), `${type}\n`);
  }
  return { dev, sys };
}

describe('scanDevicePorts', () => {
  it('finds USB, ACM and present UART ports once each, with USB details and the stable name', () => {
    const { dev, sys } = fakeTree();
    const ports = scanDevicePorts(dev, sys);
    expect(ports).toEqual([
      { path: join(dev, 'ttyACM0') },
      { path: join(dev, 'ttyS0') },
      {
        path: join(dev, 'ttyUSB0'),
        alias: join(dev, 'serial', 'by-id', 'usb-Lab_Bench_Adapter_A1B2C3-if00-port0'),
        manufacturer: 'FTDI',
        serialNumber: 'A1B2C3',
        vendorId: '0403',
        productId: '6001',
      },
    ]);
  });

  it('is empty, not an error, where there is no /dev at all', () => {
    expect(scanDevicePorts('/nonexistent/dev', '/nonexistent/sys')).toEqual([]);
  });
});

describe('listSerialPorts', () => {
  it('uses serialport\'s list when it works', async () => {
    const listing = await listSerialPorts({ list: async () => [{ path: '/dev/ttyUSB3', manufacturer: 'Prolific', vendorId: '067b', productId: '2303', serialNumber: undefined }] });
    expect(listing).toEqual({ method: 'serialport', ports: [{ path: '/dev/ttyUSB3', manufacturer: 'Prolific', vendorId: '067b', productId: '2303' }] });
    expect(methodNote(listing)).toBe('ports listed by the serialport library');
  });

  it('falls back to the scan when the list fails, and says why', async () => {
    const { dev, sys } = fakeTree();
    const missing = Object.assign(new Error('spawn udevadm ENOENT'), { code: 'ENOENT' });
    const listing = await listSerialPorts({ list: () => Promise.reject(missing), devDir: dev, sysDir: sys });
    expect(listing.method).toBe('device-scan');
    expect(listing.ports).toHaveLength(3);
    expect(methodNote(listing)).toBe(
      'the serialport library could not list ports (udevadm is not installed); scanned /dev/serial/by-id, /dev/ttyUSB*, /dev/ttyACM* and /dev/ttyS* instead',
    );
  });
});

describe('topoprobe ports', () => {
  it('--json prints one document with snake_case fields; stderr names the method', async () => {
    const { dev, sys } = fakeTree();
    const out: string[] = [];
    const err: string[] = [];
    const stdout = vi.spyOn(process.stdout, 'write').mockImplementation((s) => (out.push(String(s)), true));
    const stderr = vi.spyOn(process.stderr, 'write').mockImplementation((s) => (err.push(String(s)), true));
    try {
      await portsCommand({ list: () => Promise.reject(new Error('spawn udevadm ENOENT')), devDir: dev, sysDir: sys }).parseAsync(['--json'], { from: 'user' });
    } finally {
      stdout.mockRestore();
      stderr.mockRestore();
    }
    const doc = JSON.parse(out.join(''));
    expect(doc.method).toBe('device-scan');
    expect(doc.ports[2]).toEqual({
      path: join(dev, 'ttyUSB0'),
      alias: join(dev, 'serial', 'by-id', 'usb-Lab_Bench_Adapter_A1B2C3-if00-port0'),
      manufacturer: 'FTDI',
      serial_number: 'A1B2C3',
      vendor_id: '0403',
      product_id: '6001',
    });
    expect(err.join('')).toMatch(/^topoprobe: the serialport library could not list ports \(udevadm is not installed\)/);
  });

  it('the table has a header and one row per port; no ports says so', () => {
    const table = portsTable({ method: 'serialport', ports: [{ path: '/dev/ttyUSB0', manufacturer: 'FTDI', vendorId: '0403', productId: '6001' }] });
    const lines = table.trimEnd().split('\n');
    expect(lines[0]).toMatch(/^path\s+manufacturer\s+serial number\s+vendor\s+product\s+stable name$/);
    expect(lines[2]).toMatch(/^\/dev\/ttyUSB0\s+FTDI\s+0403\s+6001$/);
    expect(portsTable({ method: 'device-scan', ports: [] })).toBe('no serial ports found\n');
    expect(JSON.parse(portsJson({ method: 'device-scan', ports: [] }))).toEqual({ method: 'device-scan', ports: [] });
  });
});
