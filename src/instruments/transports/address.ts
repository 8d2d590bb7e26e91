// Where an instrument is, as a user writes it: a serial port path (/dev/ttyUSB0, /dev/serial/by-id/...,
// COM3), optionally with "@baud", or HOST:PORT for a raw TCP socket, optionally prefixed "tcp:".

import { InstrumentSettingError } from '../instrument-errors.js';

export type InstrumentAddress = { medium: 'serial'; path: string; baudRate?: number } | { medium: 'tcp'; host: string; port: number };

const EXAMPLES = 'a serial port such as /dev/ttyUSB0, /dev/ttyUSB0@115200 or COM3, or HOST:PORT such as 192.168.1.20:5025';

/** Reads an address; `what` names the flag or field in the message ("--analyzer"). */
export function parseAddress(text: string, what = 'instrument address'): InstrumentAddress {
  const bad = (why: string) => new InstrumentSettingError(`${what}: ${JSON.stringify(text)} ${why}; expected ${EXAMPLES}`);
  const input = text.trim();
  if (input === '') throw bad('is empty');
  const serialText = input.startsWith('serial:') ? input.slice('serial:'.length) : input;
  if (input.startsWith('serial:') || serialText.startsWith('/') || /^COM\d+(@|$)/i.test(serialText)) {
    const [path, baud, ...extra] = serialText.split('@');
    if (path === '' || extra.length > 0) throw bad('is not a port path');
    if (baud === undefined) return { medium: 'serial', path };
    if (!/^\d+$/.test(baud) || Number(baud) <= 0) throw bad(`has a baud rate "${baud}" that is not a whole number above zero`);
    return { medium: 'serial', path, baudRate: Number(baud) };
  }
  const tcpText = input.startsWith('tcp:') ? input.slice('tcp:'.length) : input;
  const match = /^(\[[0-9A-Fa-f:.]+\]|[A-Za-z0-9._-]+):(\d+)$/.exec(tcpText);
  if (!match) throw bad('is neither a serial port nor HOST:PORT');
  const port = Number(match[2]);
  if (port < 1 || port > 65535) throw bad(`has port ${port}, outside 1..65535`);
  return { medium: 'tcp', host: match[1].replace(/^\[|\]$/g, ''), port };
}
