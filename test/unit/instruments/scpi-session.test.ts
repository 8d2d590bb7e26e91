// The SCPI session over an in-process pair, against a tiny fake instrument written here: terminators,
// timeouts, one outstanding query at a time, draining the error queue, finding its place after a late
// answer, garbled answers, a peer that goes away, and the traffic trace.
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ScpiSession, type SessionNotice } from '../../../src/instruments/scpi-session.js';
import { TransportError } from '../../../src/instruments/transport.js';
import { AnswerError, InstrumentError, InstrumentSettingError } from '../../../src/instruments/instrument-errors.js';
import { deviceOnPair, IDENTITY, simpleHandler, type Handler } from './fake-device.js';

const delay = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

async function rejection(promise: Promise<unknown>): Promise<Error> {
  try {
    await promise;
  } catch (error) {
    return error as Error;
  }
  throw new Error('expected the promise to reject');
}

describe('terminators', () => {
  // IEEE 488.2 (from memory): the response message terminator is NL (LF); CR LF and CR are the other
  // customary line ends of serial and socket instruments (common practice).
  for (const [name, text] of [['LF', '\n'], ['CRLF', '\r\n'], ['CR', '\r']] as const) {
    it(`writes and reads with ${name}`, async () => {
      const { transport, device } = await deviceOnPair(simpleHandler(), { readTerminator: text, writeTerminator: text });
      const session = new ScpiSession(transport, { writeTerminator: name, readTerminator: name, timeoutMs: 1000 });
      await session.open();
      expect(await session.query('*IDN?')).toBe(IDENTITY);
      await session.write('*CLS');
      expect(await session.query('*OPC?')).toBe('1');
      expect(device.heard).toEqual(['*IDN?', '*CLS', '*OPC?']);
      await session.close();
    });
  }

  it('reassembles an answer delivered a few bytes at a time', async () => {
    const { transport } = await deviceOnPair(simpleHandler(), { readTerminator: '\r\n', writeTerminator: '\r\n', pair: { chunkSize: 3 } });
    const session = new ScpiSession(transport, { writeTerminator: 'CRLF', readTerminator: 'CRLF', timeoutMs: 1000 });
    await session.open();
    expect(await session.query('*IDN?')).toBe(IDENTITY);
    await session.close();
  });

  it('names the fix when the instrument ends its answers with CR LF and LF is expected', async () => {
    const { transport } = await deviceOnPair(simpleHandler(), { writeTerminator: '\r\n' });
    const session = new ScpiSession(transport, { timeoutMs: 1000 });
    await session.open();
    const error = await rejection(session.query('*IDN?'));
    expect(error).toBeInstanceOf(TransportError);
    expect(error.message).toBe('memory:bench: answer to "*IDN?" ends in CR LF, but the read terminator is LF: set the read terminator to CRLF');
    await session.close();
  });

  it('says what arrived when the answer never gets the expected terminator', async () => {
    const { transport } = await deviceOnPair(simpleHandler(), { writeTerminator: '\r' });
    const session = new ScpiSession(transport, { timeoutMs: 100 });
    await session.open();
    const error = (await rejection(session.query('*OPC?'))) as TransportError;
    expect(error.failure).toBe('timeout');
    expect(error.message).toBe(
      'memory:bench: no answer to "*OPC?" within 100 ms (received "1\\r" but no LF after it: the instrument seems to end its answers with CR: set the read terminator to CR)',
    );
    await session.close();
  });
});

describe('timeouts and one outstanding query', () => {
  it('fails a query that gets no answer with a timeout naming the command', async () => {
    const { transport } = await deviceOnPair(() => undefined);
    const session = new ScpiSession(transport, { timeoutMs: 80 });
    await session.open();
    const error = (await rejection(session.query('FETCh?'))) as TransportError;
    expect(error).toBeInstanceOf(TransportError);
    expect(error.failure).toBe('timeout');
    expect(error.exitCode).toBe(3);
    expect(error.message).toBe('memory:bench: no answer to "FETCh?" within 80 ms');
    await session.close();
  });

  it('a per-command timeout overrides the session default', async () => {
    const slow: Handler = async (m) => {
      if (m === 'READ?') {
        await delay(150);
        return '1,2';
      }
      return simpleHandler()(m, undefined as never);
    };
    const { transport } = await deviceOnPair(slow);
    const session = new ScpiSession(transport, { timeoutMs: 50 });
    await session.open();
    expect(await session.query('READ?', { timeoutMs: 2000 })).toBe('1,2');
    await session.close();
  });

  it('never sends a query before the previous one is answered, and answers go to their queries', async () => {
    const handler: Handler = async (m) => {
      await delay(15);
      return m.includes('?') ? `answer to ${m}` : undefined;
    };
    const { transport, device } = await deviceOnPair(handler);
    const session = new ScpiSession(transport, { timeoutMs: 2000 });
    await session.open();
    const answers = await Promise.all([session.query('A?'), session.query('B?'), session.query('C?')]);
    expect(answers).toEqual(['answer to A?', 'answer to B?', 'answer to C?']);
    expect(device.heard).toEqual(['A?', 'B?', 'C?']);
    expect(device.overlapped).toBe(false);
    await session.close();
  });

  it('after a timeout, skips the late answer instead of taking it for the next query', async () => {
    let first = true;
    const handler: Handler = async (m) => {
      if (m === 'FETCh?' && first) {
        first = false;
        await delay(150); // answers, but too late
        return '5,6';
      }
      if (m === 'FETCh?') return '7,8';
      if (m === '*IDN?') return IDENTITY;
      return undefined;
    };
    const { transport, device } = await deviceOnPair(handler);
    const session = new ScpiSession(transport, { timeoutMs: 60 });
    const notices: SessionNotice[] = [];
    session.onNotice((n) => notices.push(n));
    await session.open();
    expect((await rejection(session.query('FETCh?'))).message).toMatch(/no answer to "FETCh\?" within 60 ms/);
    await delay(200); // the late "5,6" arrives while nothing waits
    expect(await session.query('FETCh?', { timeoutMs: 1000 })).toBe('7,8');
    expect(device.heard).toEqual(['FETCh?', '*IDN?', 'SYSTem:ERRor?', 'FETCh?']);
    expect(notices).toEqual([{ kind: 'resynchronized', discarded: ['5,6'], errors: [] }]);
    await session.close();
  });

  it('refuses to send a command holding a terminator or non-ASCII text', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport);
    await session.open();
    const error = await rejection(session.write('FREQ 1\nVOLT 2'));
    expect(error).toBeInstanceOf(InstrumentSettingError);
    expect(error.message).toBe('memory:bench: command "FREQ 1\\nVOLT 2" holds a character that cannot be sent ("\\n")');
    expect(device.heard).toEqual([]);
    await session.close();
  });
});

describe('error queue', () => {
  it('drains SYSTem:ERRor? until 0,"No error" and returns the entries oldest first', async () => {
    // SCPI-99 (from memory): -222 Data out of range, -113 Undefined header; 0,"No error" when empty.
    const { transport, device } = await deviceOnPair(simpleHandler());
    device.errors.push('-222,"Data out of range"', '-113,"Undefined header"');
    const session = new ScpiSession(transport);
    await session.open();
    expect(await session.drainErrors()).toEqual([
      { code: -222, message: 'Data out of range' },
      { code: -113, message: 'Undefined header' },
    ]);
    expect(device.heard).toEqual(['SYSTem:ERRor?', 'SYSTem:ERRor?', 'SYSTem:ERRor?']);
    expect(await session.drainErrors()).toEqual([]);
    await session.close();
  });

  it('reads doubled quotes inside the message as one quote (IEEE 488.2 string data, from memory)', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    device.errors.push('-224,"Illegal parameter value; ""POL"" expected"');
    const session = new ScpiSession(transport);
    await session.open();
    expect(await session.drainErrors()).toEqual([{ code: -224, message: 'Illegal parameter value; "POL" expected' }]);
    await session.close();
  });

  it('stops at the drain limit when the queue never empties', async () => {
    const { transport, device } = await deviceOnPair((m) => (/ERR/.test(m) ? '-350,"Queue overflow"' : undefined), { errorQueue: false });
    const session = new ScpiSession(transport, { errorQuery: 'SYST:ERR?', errorDrainLimit: 5 });
    await session.open();
    const error = (await rejection(session.drainErrors())) as InstrumentError;
    expect(error).toBeInstanceOf(InstrumentError);
    expect(error.exitCode).toBe(3);
    expect(error.message).toBe('memory:bench: the error queue did not empty after 5 reads of "SYST:ERR?" (last: -350,"Queue overflow")');
    expect(error.entries).toHaveLength(5);
    expect(device.heard.filter((m) => m === 'SYST:ERR?')).toHaveLength(5);
    await session.close();
  });

  it('configure sends the setup and returns what the error queue then holds', async () => {
    const { transport, device } = await deviceOnPair((m, d) => {
      if (m === 'FORM POLAR') d.errors.push('-224,"Illegal parameter value"');
      return undefined;
    });
    const session = new ScpiSession(transport);
    await session.open();
    expect(await session.configure(['*CLS', 'FORM POLAR'])).toEqual([{ code: -224, message: 'Illegal parameter value' }]);
    expect(device.heard).toEqual(['*CLS', 'FORM POLAR', 'SYSTem:ERRor?', 'SYSTem:ERRor?']);
    await session.close();
  });

  it('an answer nobody asked for is reported with the error queue drained right after', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport);
    const notices: SessionNotice[] = [];
    session.onNotice((n) => notices.push(n));
    await session.open();
    device.errors.push('-410,"Query INTERRUPTED"');
    await device.say('stray text\n');
    await delay(20);
    await session.query('*OPC?');
    expect(notices).toEqual([{ kind: 'unexpected-answer', lines: ['stray text'], errors: [{ code: -410, message: 'Query INTERRUPTED' }] }]);
    expect(device.heard).toEqual(['SYSTem:ERRor?', 'SYSTem:ERRor?', '*OPC?']);
    await session.close();
  });

  it('a malformed error queue answer is an AnswerError quoting it', async () => {
    const { transport } = await deviceOnPair((m) => (/ERR/.test(m) ? 'no error' : undefined), { errorQueue: false });
    const session = new ScpiSession(transport);
    await session.open();
    const error = await rejection(session.drainErrors());
    expect(error).toBeInstanceOf(AnswerError);
    expect(error.message).toBe('answer to "SYSTem:ERRor?" is not an error queue entry <code>,"<message>": "no error"');
    await session.close();
  });
});

describe('IEEE 488.2 common commands', () => {
  it('identify() splits *IDN? into maker, model, serial and firmware', async () => {
    const { transport } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport);
    await session.open();
    expect(await session.identify()).toEqual({ maker: 'Topoprobe Lab', model: 'SIM-ZA100', serial: 'ZA-0042', firmware: '1.3.0', raw: IDENTITY });
    await session.close();
  });

  it('identify() refuses an answer without four fields', async () => {
    const { transport } = await deviceOnPair(() => 'Topoprobe Lab,SIM-ZA100');
    const session = new ScpiSession(transport);
    await session.open();
    const error = await rejection(session.identify());
    expect(error.message).toBe('answer to "*IDN?" has 2 fields, expected 4 (maker, model, serial, firmware): "Topoprobe Lab,SIM-ZA100"');
    await session.close();
  });

  it('reset, clearStatus and operationComplete send *RST, *CLS and *OPC?', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport);
    await session.open();
    await session.reset();
    await session.clearStatus();
    await session.operationComplete();
    expect(device.heard).toEqual(['*RST', '*CLS', '*OPC?']);
    await session.close();
  });

  it('operationComplete refuses an answer other than 1', async () => {
    const { transport } = await deviceOnPair(() => '0');
    const session = new ScpiSession(transport);
    await session.open();
    expect((await rejection(session.operationComplete())).message).toBe('answer to "*OPC?" is not 1: "0"');
    await session.close();
  });
});

describe('garbage and lost connections', () => {
  it('calls bytes that are not ASCII garbage and names the likely cause', async () => {
    // What a 9600-baud answer read at 115200 looks like: high bytes and control characters.
    const { transport } = await deviceOnPair(() => '\xf0\x1e\x86x');
    const session = new ScpiSession(transport);
    await session.open();
    const error = (await rejection(session.query('*IDN?'))) as TransportError;
    expect(error.failure).toBe('garbage');
    expect(error.message).toBe(
      'memory:bench: answer to "*IDN?" holds bytes that are not ASCII text (0xF0 0x1E 0x86 0x78 at byte 1): likely a wrong baud rate, or a read terminator other than LF',
    );
    await session.close();
  });

  it('fails the waiting query and every later one when the peer closes', async () => {
    const { transport, device } = await deviceOnPair(() => undefined);
    const session = new ScpiSession(transport, { timeoutMs: 5000 });
    await session.open();
    const waiting = session.query('READ?');
    await delay(10);
    await device.end.close();
    const error = (await rejection(waiting)) as TransportError;
    expect(error.failure).toBe('closed');
    expect(error.message).toBe('memory:bench: closed by peer: the other end closed');
    expect((await rejection(session.query('*IDN?'))).message).toBe('memory:bench: closed by peer: the other end closed');
  });

  it('reconnects: open after close starts a clean conversation', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport);
    await session.open();
    await session.close();
    expect((await rejection(session.query('*IDN?'))).message).toBe('memory:bench: session closed');
    await delay(10); // the instrument's side hears of the close...
    await device.end.open(); // ...and takes the next connection
    await session.open();
    expect(await session.query('*IDN?')).toBe(IDENTITY);
    expect(device.heard).toEqual(['*IDN?']);
    await session.close();
  });
});

describe('traffic trace', () => {
  it('writes timestamped > and < lines as it goes, with control bytes made visible', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'topoprobe-trace-'));
    const file = join(dir, 'bench.trace');
    const { transport, device } = await deviceOnPair(simpleHandler({ 'FETCh?': '1.5E+3,-2.0E+1' }));
    const session = new ScpiSession(transport, { traceFile: file, timeoutMs: 60 });
    await session.open();
    await session.query('*IDN?');
    // Flushed as it goes: the lines are in the file before the session is closed.
    expect(readFileSync(file, 'utf8')).toContain(`< ${IDENTITY}\n`);
    await session.write('FREQ 163E3');
    await session.query('FETCh?');
    await device.say('odd\x07\n');
    await delay(20);
    await session.close();
    const lines = readFileSync(file, 'utf8').trimEnd().split('\n');
    // ISO 8601 UTC timestamps (ISO 8601 / RFC 3339, from memory).
    for (const line of lines) expect(line).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z [<>!] /);
    expect(lines.map((l) => l.slice(25))).toEqual([
      '! opened memory:bench',
      '> *IDN?',
      `< ${IDENTITY}`,
      '> FREQ 163E3',
      '> FETCh?',
      '< 1.5E+3,-2.0E+1',
      '< odd\\x07',
      '! unexpected answer: no query was waiting',
      '! closed memory:bench',
    ]);
  });

  it('a trace file that cannot be opened is a one-line error naming it, before anything is sent', async () => {
    const { transport, device } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport, { traceFile: '/nonexistent-topoprobe-dir/bench.trace' });
    const error = await rejection(session.open());
    expect(error).toBeInstanceOf(InstrumentSettingError);
    expect(error.message).toBe('trace file /nonexistent-topoprobe-dir/bench.trace: cannot open it (its folder does not exist)');
    expect(device.heard).toEqual([]);
  });

  // /dev/full fails every write with ENOSPC (Linux null(4) man page, from memory): a full disk.
  it.skipIf(!existsSync('/dev/full'))('a trace that can no longer be written stops, and the conversation goes on', async () => {
    const { transport } = await deviceOnPair(simpleHandler());
    const session = new ScpiSession(transport, { traceFile: '/dev/full' });
    const notices: SessionNotice[] = [];
    session.onNotice((n) => notices.push(n));
    await session.open();
    expect(await session.query('*IDN?')).toBe(IDENTITY);
    expect(await session.query('*OPC?')).toBe('1');
    expect(notices).toHaveLength(1);
    expect(notices[0]).toMatchObject({ kind: 'trace-failed' });
    expect((notices[0] as { reason: string }).reason).toMatch(/^trace file \/dev\/full: writing failed \(.*ENOSPC.*\); tracing stopped, the session goes on$/);
    await session.close();
  });
});
