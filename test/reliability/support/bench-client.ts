// A plain SCPI client for the tests: connects to a simulated instrument served by `topoprobe sim --tcp`,
// sends one program message at a time and reads the answer line, so that a test can ask the bench itself
// (not the runner) what state it is in. Also reads the instruments' own record (`sim --traffic FILE`).
import { existsSync, readFileSync } from 'node:fs';
import net from 'node:net';

export interface ScpiClient {
  /** Sends a message without a query. */
  send(message: string): Promise<void>;
  /** Sends a query and resolves with its answer line. */
  ask(query: string): Promise<string>;
  close(): void;
}

export function connectScpi(endpoint: string): Promise<ScpiClient> {
  const [host, port] = splitEndpoint(endpoint);
  return new Promise((resolve, reject) => {
    const socket = net.connect({ host, port });
    let buffer = '';
    const waiting: ((line: string) => void)[] = [];
    socket.setEncoding('latin1');
    socket.on('data', (chunk: string) => {
      buffer += chunk;
      for (let nl = buffer.indexOf('\n'); nl >= 0; nl = buffer.indexOf('\n')) {
        const line = buffer.slice(0, nl).replace(/\r$/, '');
        buffer = buffer.slice(nl + 1);
        waiting.shift()?.(line);
      }
    });
    socket.once('error', reject);
    socket.once('connect', () => {
      const write = (message: string) => new Promise<void>((done) => socket.write(`${message}\n`, () => done()));
      resolve({
        send: async (message) => {
          await write(message);
          // *OPC? makes the instrument finish the command before the next one is sent (IEEE 488.2).
          const answer = await ask('*OPC?');
          if (answer !== '1') throw new Error(`*OPC? after ${message} answered ${answer}`);
        },
        ask,
        close: () => socket.destroy(),
      });
      function ask(query: string): Promise<string> {
        return new Promise((answer, fail) => {
          const timer = setTimeout(() => fail(new Error(`no answer to ${query} from ${endpoint}`)), 10_000);
          waiting.push((line) => (clearTimeout(timer), answer(line)));
          socket.write(`${query}\n`);
        });
      }
    });
  });
}

export function splitEndpoint(endpoint: string): [string, number] {
  const at = endpoint.lastIndexOf(':');
  return [endpoint.slice(0, at), Number(endpoint.slice(at + 1))];
}

/** `(@1000:1003,2000)` -> [1000, 1001, 1002, 1003, 2000]; ranges either direction, as SCPI-99 writes them. */
export function expandChannelList(text: string): number[] {
  const m = /^\(@(.*)\)$/.exec(text.trim());
  if (!m) throw new Error(`not a channel list: ${text}`);
  if (m[1] === '') return [];
  return m[1].split(',').flatMap((item) => {
    const [a, b] = item.split(':').map(Number);
    if (b === undefined) return [a];
    const out: number[] = [];
    for (let c = Math.min(a, b); c <= Math.max(a, b); c++) out.push(c);
    return out;
  });
}

export interface TrafficLine {
  instrument: 'analyzer' | 'switch';
  direction: 'in' | 'out';
  text: string;
}

/** The lines of a `sim --traffic` record; none when the file is absent. */
export function readTraffic(file: string): TrafficLine[] {
  if (!existsSync(file)) return [];
  return readFileSync(file, 'utf8')
    .split('\n')
    .filter((l) => l !== '')
    .map((l) => {
      const m = /^\S+ (analyzer|switch) (in|out) (.*)$/.exec(l);
      if (!m) throw new Error(`unreadable traffic line: ${l}`);
      return { instrument: m[1] as TrafficLine['instrument'], direction: m[2] as TrafficLine['direction'], text: m[3] };
    });
}
