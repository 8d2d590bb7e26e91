// Program message terminators: an instrument takes LF, CR or CRLF (common practice; IEEE 488.2 names
// NL as the terminator, and serial instruments commonly accept CR and CRLF as well (from memory)).
import { describe, expect, it } from 'vitest';
import { LineSplitter } from '../../../simulators/serve/line-splitter.js';

describe('LineSplitter', () => {
  it.each([
    ['LF', '*IDN?\nFREQ 1k\n'],
    ['CR', '*IDN?\rFREQ 1k\r'],
    ['CRLF', '*IDN?\r\nFREQ 1k\r\n'],
  ])('splits %s-terminated messages', (_name, text) => {
    expect(new LineSplitter().push(text)).toEqual(['*IDN?', 'FREQ 1k']);
  });

  it('keeps a partial line until its terminator arrives, even split inside a CRLF', () => {
    const s = new LineSplitter();
    expect(s.push('READ')).toEqual([]);
    expect(s.partial).toBe('READ');
    expect(s.push('?\r')).toEqual(['READ?']);
    expect(s.push('\nSYST:ERR?')).toEqual([]);
    expect(s.push('\n')).toEqual(['SYST:ERR?']);
  });

  it('an empty line between terminators is a message of its own', () => {
    expect(new LineSplitter().push('\n\n')).toEqual(['', '']);
  });
});
