// A simulated instrument on the far end of an in-process byte line (a memory pair), served exactly as the
// TCP and pty servers serve it, so `run --sim` goes through the real session, driver and parser code.
// When our end closes (a reconnect), the far end opens again as a fresh connection, like a server would.
import { memoryPair, TERMINATORS, type Terminator, type Transport } from '../../instruments/index.js';
import { TERMINATOR_TEXT } from '../../instruments/terminators.js';
import type { SimulatedDevice } from '../../../simulators/device.js';
import type { Misbehaviour } from '../../../simulators/misbehaviour.js';
import { serveDevice } from '../../../simulators/serve/serve-device.js';

/** `misbehaviour` makes the far end's link misbehave (late, dropped or garbled answers, disconnects). */
export function inProcessLine(device: SimulatedDevice, name: string, responseTerminator: Terminator, misbehaviour?: Misbehaviour): Transport {
  if (!TERMINATORS.includes(responseTerminator)) throw new RangeError(`unknown terminator ${responseTerminator}`);
  const [ours, theirs] = memoryPair({ names: [`memory:${name}`, `memory:${name}-device`] });
  const serve = () => {
    const feed = serveDevice(
      device,
      {
        write: (bytes) => void theirs.write(bytes).catch(() => undefined),
        // A dropped line: our end hears "closed by peer"; the far end listens again for the reconnect.
        drop: () => void theirs.close().then(serve),
      },
      { terminator: TERMINATOR_TEXT[responseTerminator], misbehaviour },
    );
    theirs.onData(feed);
    void theirs.open();
  };
  theirs.onClose(() => serve());
  serve();
  return ours;
}
