// Tells a real answer from line noise. IEEE 488.2 response messages are 7-bit ASCII (8.4 (from memory)):
// printable characters, plus TAB in string data. Anything else in a line means the two ends do not agree
// on the baud rate or framing, or the terminators do not match.

import { terminatorName, type Terminator } from './terminators.js';

/** Why the line cannot be an answer, or undefined when it is plain ASCII text. */
export function badAnswerBytes(line: string, readTerminator: Terminator): string | undefined {
  // Terminator mix-ups first: they have an exact fix.
  if (readTerminator === 'LF' && line.endsWith('\r')) {
    return 'ends in CR LF, but the read terminator is LF: set the read terminator to CRLF';
  }
  if (readTerminator === 'CR' && line.startsWith('\n')) {
    return 'starts with the LF of a CR LF, but the read terminator is CR: set the read terminator to CRLF';
  }
  for (let i = 0; i < line.length; i++) {
    const code = line.charCodeAt(i);
    if ((code >= 0x20 && code <= 0x7e) || code === 0x09) continue;
    const shown = [...line.slice(i, i + 4)].map((c) => `0x${c.charCodeAt(0).toString(16).toUpperCase().padStart(2, '0')}`).join(' ');
    return `holds bytes that are not ASCII text (${shown} at byte ${i + 1})`;
  }
  return undefined;
}

/** The likely cause of non-ASCII bytes, by what carries them. */
export function garbageHint(medium: string | undefined, readTerminator: Terminator): string {
  if (medium === 'serial') return 'likely a wrong baud rate (or data bits, parity)';
  if (medium === 'tcp') return 'likely the wrong port: is this the instrument\'s SCPI socket?';
  return `likely a wrong baud rate, or a read terminator other than ${terminatorName(readTerminator)}`;
}
