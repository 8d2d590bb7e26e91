// The serial ports of this machine. serialport's list() asks udev (udevadm) on Linux; where udevadm is
// missing (containers, minimal installs) we look at the device files ourselves and read what sysfs tells
// about USB adapters (maker, serial number, vendor and product ids).

import { existsSync, readdirSync, readFileSync, realpathSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { SerialPort } from 'serialport';

export interface PortEntry {
  path: string;
  /** A stable name for the same port, from /dev/serial/by-id. */
  alias?: string;
  manufacturer?: string;
  serialNumber?: string;
  vendorId?: string;
  productId?: string;
}

export interface PortListing {
  /** "serialport": the library's list; "device-scan": our scan of /dev and /sys. */
  method: 'serialport' | 'device-scan';
  ports: PortEntry[];
  /** Why the library's list was not used, when it was not. */
  fallbackReason?: string;
}

interface LibraryPort {
  path: string;
  manufacturer?: string;
  serialNumber?: string;
  vendorId?: string;
  productId?: string;
}

export interface ListOptions {
  /** The library's lister; tests replace it. */
  list?: () => Promise<LibraryPort[]>;
  devDir?: string;
  sysDir?: string;
}

export async function listSerialPorts(options: ListOptions = {}): Promise<PortListing> {
  const list = options.list ?? (() => SerialPort.list());
  try {
    const ports = await list();
    return {
      method: 'serialport',
      ports: ports.map((p) => clean({ path: p.path, manufacturer: p.manufacturer, serialNumber: p.serialNumber, vendorId: p.vendorId, productId: p.productId })),
    };
  } catch (error) {
    return { method: 'device-scan', ports: scanDevicePorts(options.devDir, options.sysDir), fallbackReason: whyNotListed(error) };
  }
}

function whyNotListed(error: unknown): string {
  const message = error instanceof Error ? error.message : String(error);
  // On Linux the library runs udevadm; without it the spawn fails with ENOENT.
  if (/udevadm/.test(message) && /ENOENT/.test(message)) return 'udevadm is not installed';
  return message;
}

/** /dev/serial/by-id, /dev/ttyUSB*, /dev/ttyACM*, /dev/ttyS*: the ones that exist, each once. */
export function scanDevicePorts(devDir = '/dev', sysDir = '/sys'): PortEntry[] {
  const byPath = new Map<string, PortEntry>();
  const names = safeList(devDir).filter((n) => /^tty(USB|ACM)\d+$/.test(n) || (/^ttyS\d+$/.test(n) && uartPresent(n, sysDir)));
  for (const name of names.sort(naturalOrder)) byPath.set(join(devDir, name), { path: join(devDir, name), ...usbDetails(name, sysDir) });
  const byId = join(devDir, 'serial', 'by-id');
  for (const link of safeList(byId).sort()) {
    let target: string;
    try {
      target = realpathSync(join(byId, link));
    } catch {
      continue; // a dangling link: the adapter has gone
    }
    const entry = byPath.get(join(devDir, basename(target))) ?? byPath.get(target);
    if (entry) entry.alias = join(byId, link);
    else byPath.set(target, { path: target, alias: join(byId, link), ...usbDetails(basename(target), sysDir) });
  }
  return [...byPath.values()];
}

/**
 * The kernel makes ttyS0..ttyS31 whether or not a UART is there; sysfs "type" is 0 (PORT_UNKNOWN) for
 * the absent ones (Linux serial_core, common practice). Without the file we keep the port.
 */
function uartPresent(name: string, sysDir: string): boolean {
  const type = readText(join(sysDir, 'class', 'tty', name, 'type'));
  return type === undefined || type !== '0';
}

/** Maker, serial and ids of the USB device a tty belongs to, found by walking up its sysfs device path. */
function usbDetails(name: string, sysDir: string): Omit<PortEntry, 'path'> {
  let dir: string;
  try {
    dir = realpathSync(join(sysDir, 'class', 'tty', name, 'device'));
  } catch {
    return {};
  }
  for (let up = 0; up < 6 && dir !== dirname(dir); up++, dir = dirname(dir)) {
    if (!existsSync(join(dir, 'idVendor'))) continue;
    return clean({
      manufacturer: readText(join(dir, 'manufacturer')),
      serialNumber: readText(join(dir, 'serial')),
      vendorId: readText(join(dir, 'idVendor')),
      productId: readText(join(dir, 'idProduct')),
    });
  }
  return {};
}

function readText(file: string): string | undefined {
  try {
    return readFileSync(file, 'utf8').trim();
  } catch {
    return undefined;
  }
}

function safeList(dir: string): string[] {
  try {
    return readdirSync(dir);
  } catch {
    return [];
  }
}

function naturalOrder(a: string, b: string): number {
  return a.localeCompare(b, 'en', { numeric: true });
}

function clean<T extends object>(entry: T): T {
  return Object.fromEntries(Object.entries(entry).filter(([, v]) => v !== undefined && v !== '')) as T;
}
