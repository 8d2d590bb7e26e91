// Message terminators: what ends a program message we send and a response message we read. IEEE 488.2
// uses LF (NL); serial and socket instruments often want CR LF or CR instead (common practice).

export type Terminator = 'LF' | 'CRLF' | 'CR';

export const TERMINATORS: readonly Terminator[] = ['LF', 'CRLF', 'CR'];

export const TERMINATOR_TEXT: Record<Terminator, string> = { LF: '\n', CRLF: '\r\n', CR: '\r' };

/** For messages: "LF", "CR LF", "CR". */
export function terminatorName(terminator: Terminator): string {
  return terminator === 'CRLF' ? 'CR LF' : terminator;
}
