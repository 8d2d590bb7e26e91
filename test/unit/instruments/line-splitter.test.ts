// The response line splitter: pure on text, incremental over chunks, byte for byte (latin1).
import { describe, expect, it } from 'vitest';
import { LineSplitter, splitLines } from '../../../src/instruments/line-splitter.js';
import { badAnswerBytes } from '../../../src/instruments/answer-bytes.js';

describe('splitLines', () => {
  it('cuts at every terminator and keeps the unfinished rest', () => {
    expect(splitLines('1,0\n+5\npart', '\n')).toEqual({ lines: ['1,0', '+5'], rest: 'part' });
    expect(splitLines('a\r\nb\r\n', '\r\n')).toEqual({ lines: ['a', 'b'], rest: '' });
    expect(splitLines('no end yet', '\r')).toEqual({ lines: [], rest: 'no end yet' });
  });

  it('keeps empty lines: an empty response message is still an answer', () => {
    expect(splitLines('\n\n', '\n')).toEqual({ lines: ['', ''], rest: '' });
  });
});

describe('LineSplitter', () => {
  it('joins a line split across chunks, including a CR LF split between CR and LF', () => {
    const s = new LineSplitter('\r\n');
    expect(s.push(Buffer.from('1.5E+3,'))).toEqual([]);
    expect(s.push(Buffer.from('2.0\r'))).toEqual([]);
    expect(s.pending).toBe('1.5E+3,2.0\r');
    expect(s.push(Buffer.from('\n0,"No error"\r\n'))).toEqual(['1.5E+3,2.0', '0,"No error"']);
    expect(s.pending).toBe('');
  });

  it('keeps high bytes one to one, so noise can be recognised', () => {
    const s = new LineSplitter('\n');
    const [line] = s.push(Uint8Array.from([0xf0, 0x9f, 0x41, 0x0a]));
    expect([...line].map((c) => c.charCodeAt(0))).toEqual([0xf0, 0x9f, 0x41]);
    // IEEE 488.2 (from memory): response messages are 7-bit ASCII.
    expect(badAnswerBytes(line, 'LF')).toBe('holds bytes that are not ASCII text (0xF0 0x9F 0x41 at byte 1)');
  });

  it('reads a chunk that is a view into a larger buffer correctly', () => {
    const big = Buffer.from('xxxxOK\nyyyy');
    const s = new LineSplitter('\n');
    expect(s.push(big.subarray(4, 7))).toEqual(['OK']);
  });
});

describe('badAnswerBytes', () => {
  it('accepts printable ASCII and TAB', () => {
    expect(badAnswerBytes('Topoprobe Lab,SIM-ZA100,ZA-0042,1.3.0', 'LF')).toBeUndefined();
    expect(badAnswerBytes('a\tb', 'LF')).toBeUndefined();
  });

  it('names the terminator fix for a CR LF read as LF, and for the LF left over when reading CR', () => {
    expect(badAnswerBytes('1,0\r', 'LF')).toBe('ends in CR LF, but the read terminator is LF: set the read terminator to CRLF');
    expect(badAnswerBytes('\n1,0', 'CR')).toBe('starts with the LF of a CR LF, but the read terminator is CR: set the read terminator to CRLF');
  });
});
