// Turns what the operating system says about a serial port into one of our failure kinds with a reason a
// person can act on. The serialport bindings report open errors as text ("Error: Permission denied,
// cannot open /dev/ttyUSB0"), not as errno codes, so the text is what we read.

import { readFileSync, statSync } from 'node:fs';
import { TransportError, type TransportFailure } from '../transport.js';

interface Classified {
  failure: TransportFailure;
  reason: string;
}

const PATTERNS: { failure: TransportFailure; test: RegExp }[] = [
  // strerror texts of ENOENT, ENXIO and ENODEV (glibc wording, common practice)
  { failure: 'no-such-port', test: /ENOENT|ENXIO|ENODEV|No such file or directory|No such device/i },
  // EACCES / EPERM
  { failure: 'permission-denied', test: /EACCES|EPERM|Permission denied|Operation not permitted/i },
  // EBUSY, and the bindings' own wording when flock() fails with EWOULDBLOCK ("Cannot lock port")
  { failure: 'port-busy', test: /EBUSY|Device or resource busy|Cannot lock port|Resource temporarily unavailable|EAGAIN/i },
];

/** What went wrong opening `path`; `ownerGroup` names the group that owns the device, for the hint. */
export function classifyOpenError(path: string, error: unknown, ownerGroup = groupOwning(path)): Classified {
  const text = error instanceof Error ? `${(error as NodeJS.ErrnoException).code ?? ''} ${error.message}` : String(error);
  const failure = PATTERNS.find((p) => p.test.test(text))?.failure ?? 'other';
  switch (failure) {
    case 'no-such-port':
      return { failure, reason: 'no such serial port (run "topoprobe ports" to list the ports this machine has)' };
    case 'permission-denied':
      return { failure, reason: permissionHint(ownerGroup) };
    case 'port-busy':
      return { failure, reason: 'port is busy: another program has it open or locked; close that program first' };
    default:
      return { failure, reason: `cannot open the port: ${firstLine(text.trim())}` };
  }
}

export function openFailure(path: string, error: unknown): TransportError {
  const { failure, reason } = classifyOpenError(path, error);
  return new TransportError(path, failure, reason);
}

function permissionHint(group: string | undefined): string {
  // Serial devices belong to a group whose members may open them: "dialout" on Debian, Ubuntu and Fedora,
  // "uucp" on Arch and openSUSE (common practice). When we can read which group owns this one, name it.
  const which = group && group !== 'root' ? `"${group}"` : '"dialout" (or as your distribution names it, e.g. "uucp")';
  const name = group && group !== 'root' ? group : 'dialout';
  return `permission denied: add your user to the group ${which} that may open serial ports (sudo usermod -aG ${name} $USER), then log in again`;
}

/** The name of the group owning the device file, read from /etc/group; undefined if it cannot be told. */
export function groupOwning(path: string, groupFile = '/etc/group'): string | undefined {
  try {
    const gid = statSync(path).gid;
    for (const line of readFileSync(groupFile, 'utf8').split('\n')) {
      const [name, , id] = line.split(':');
      if (id !== undefined && Number(id) === gid) return name;
    }
  } catch {
    // no such file, or no /etc/group (not Linux): the generic hint will do
  }
  return undefined;
}

function firstLine(text: string): string {
  return text.split(/\r?\n/)[0];
}
