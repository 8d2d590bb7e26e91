// Serves one simulated device over one byte link (a TCP socket or our end of a pty): splits the incoming
// bytes into program messages, hands them to the device one at a time in order, and writes each answer
// with the response terminator. Misbehaviour, when configured, is carried out here, at the link.
import type { SimulatedDevice } from '../device.js';
import { answerBytes, type Misbehaviour } from '../misbehaviour.js';
import { delay } from '../scpi/delay.js';
import { LineSplitter } from './line-splitter.js';

export interface ByteLink {
  write(bytes: Uint8Array): void;
  /** Drops the link, as an unplugged cable would. */
  drop(): void;
}

export interface ServeOptions {
  /** Response terminator; default LF. */
  terminator?: string;
  misbehaviour?: Misbehaviour;
  /** Called with every message and answer, for a traffic trace. */
  onTraffic?: (direction: 'in' | 'out', text: string) => void;
}

/** Returns the function to feed incoming bytes to. Messages are handled strictly in arrival order. */
export function serveDevice(device: SimulatedDevice, link: ByteLink, options: ServeOptions = {}): (chunk: Uint8Array) => void {
  const splitter = new LineSplitter();
  const terminator = options.terminator ?? '\n';
  const misbehaviour = options.misbehaviour;
  misbehaviour?.newConnection();
  let chain: Promise<void> = Promise.resolve();
  let dropped = false;

  const handle = async (message: string): Promise<void> => {
    if (dropped) return;
    options.onTraffic?.('in', message);
    const decision = misbehaviour?.decide(message);
    if (decision?.injectError) device.injectError?.(decision.injectError.code, decision.injectError.detail);
    const answer = await device.receive(message);
    if (answer !== undefined && !decision?.drop && !dropped) {
      if (decision && decision.delayMs > 0) await delay(decision.delayMs);
      options.onTraffic?.('out', answer);
      link.write(Buffer.concat([answerBytes(answer, decision?.corrupt), Buffer.from(terminator, 'latin1')]));
    }
    if (decision?.reboot) (device.reboot ?? device.reset).call(device);
    if (decision?.disconnectAfter && !dropped) {
      dropped = true;
      link.drop();
    }
  };

  return (chunk: Uint8Array) => {
    // latin1 keeps every byte as one character, so garbage from a confused client cannot break the splitter
    for (const message of splitter.push(Buffer.from(chunk).toString('latin1'))) {
      chain = chain.then(() => handle(message)).catch(() => undefined);
    }
  };
}
