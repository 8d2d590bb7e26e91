// `topoprobe ports`: the serial ports of this machine, to find the one an instrument is on.
import { Command } from 'commander';
import { listSerialPorts, type ListOptions, type PortListing } from '../instruments/port-list.js';
import { textTable } from './text-table.js';

interface PortsOptions {
  json?: boolean;
}

export function portsCommand(listOptions: ListOptions = {}): Command {
  return new Command('ports')
    .description('list the serial ports of this machine (path, maker, serial number, USB vendor and product ids)')
    .option('--json', 'print one JSON document on stdout and nothing else')
    .addHelpText(
      'after',
      `
The list comes from the serialport library; where it cannot list (it needs udevadm on Linux), the
device files /dev/serial/by-id, /dev/ttyUSB*, /dev/ttyACM* and /dev/ttyS* are scanned instead. stderr
says which method was used.

Examples:
  topoprobe ports
  topoprobe ports --json`,
    )
    .action(async (options: PortsOptions) => {
      const listing = await listSerialPorts(listOptions);
      process.stderr.write(`topoprobe: ${methodNote(listing)}\n`);
      process.stdout.write(options.json ? portsJson(listing) : portsTable(listing));
    });
}

export function methodNote(listing: PortListing): string {
  if (listing.method === 'serialport') return 'ports listed by the serialport library';
  return `the serialport library could not list ports (${firstLine(listing.fallbackReason ?? 'no reason given')}); scanned /dev/serial/by-id, /dev/ttyUSB*, /dev/ttyACM* and /dev/ttyS* instead`;
}

export function portsJson(listing: PortListing): string {
  const ports = listing.ports.map((p) => ({
    path: p.path,
    alias: p.alias ?? null,
    manufacturer: p.manufacturer ?? null,
    serial_number: p.serialNumber ?? null,
    vendor_id: p.vendorId ?? null,
    product_id: p.productId ?? null,
  }));
  return `${JSON.stringify({ method: listing.method, ports }, null, 2)}\n`;
}

export function portsTable(listing: PortListing): string {
  if (listing.ports.length === 0) return 'no serial ports found\n';
  const rows = listing.ports.map((p) => [p.path, p.manufacturer ?? '', p.serialNumber ?? '', p.vendorId ?? '', p.productId ?? '', p.alias ?? '']);
  return textTable(['path', 'manufacturer', 'serial number', 'vendor', 'product', 'stable name'], rows);
}

function firstLine(text: string): string {
  return text.split(/\r?\n/)[0];
}
