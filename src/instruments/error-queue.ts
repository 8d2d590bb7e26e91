// Entries of the SCPI error/event queue as SYSTem:ERRor[:NEXT]? answers them: <code>,"<message>"
// (SCPI-99 vol. 2, 21.8 (from memory)); code 0 means the queue is empty.

export interface ErrorEntry {
  code: number;
  message: string;
}

const ENTRY = /^([+-]?\d+),"((?:[^"]|"")*)"$/;

/** The entry, or undefined when the answer is not of the form <code>,"<message>". */
export function parseErrorEntry(answer: string): ErrorEntry | undefined {
  const match = ENTRY.exec(answer);
  if (!match) return undefined;
  // IEEE 488.2 string response data doubles an embedded quote (8.7.8 (from memory)).
  return { code: Number(match[1]), message: match[2].replace(/""/g, '"') };
}

export function formatErrorEntry(entry: ErrorEntry): string {
  return `${entry.code},"${entry.message.replace(/"/g, '""')}"`;
}

export function formatErrorEntries(entries: readonly ErrorEntry[]): string {
  return entries.map(formatErrorEntry).join('; ');
}
