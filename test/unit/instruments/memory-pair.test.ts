// The in-process pair: what one end writes the other receives, in order; closing one end closes the other.
import { describe, expect, it } from 'vitest';
import { memoryPair } from '../../../src/instruments/transports/memory-pair.js';
import { TransportError } from '../../../src/instruments/transport.js';

const tick = () => new Promise((r) => setTimeout(r, 5));

describe('memoryPair', () => {
  it('delivers bytes in order, in chunks of at most chunkSize', async () => {
    const [a, b] = memoryPair({ chunkSize: 4 });
    await a.open();
    await b.open();
    const chunks: string[] = [];
    b.onData((c) => chunks.push(Buffer.from(c).toString('latin1')));
    await a.write('*IDN?\n');
    await a.write(Uint8Array.from([0x31, 0x0a]));
    await tick();
    expect(chunks).toEqual(['*IDN', '?\n', '1\n']);
  });

  it('closing one end tells the other "closed by peer"', async () => {
    const [a, b] = memoryPair();
    await a.open();
    await b.open();
    const reasons: string[] = [];
    b.onClose((r) => reasons.push(r));
    await a.close();
    await tick();
    expect(reasons).toEqual(['closed by peer: the other end closed']);
    expect(b.isOpen).toBe(false);
    await a.close(); // twice is fine
  });

  it('writing on a closed end is a TransportError', async () => {
    const [a] = memoryPair({ names: ['memory:analyzer', 'memory:bench'] });
    await expect(a.write('x')).rejects.toThrow(TransportError);
    await expect(a.write('x')).rejects.toThrow('memory:analyzer: not open');
  });
});
