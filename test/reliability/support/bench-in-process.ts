// The simulated bench served from the test's own process, exactly as `topoprobe sim` serves it (the same
// flag parsers, the same pty and TCP servers), without a Node start-up per case. The runner under test
// stays a separate process on the far end of the pty or socket. Being in process also lets a test look
// at the relay contacts themselves, not only at what the matrix answers.
import type { Board } from '../../../src/board/types.js';
import { parseMisbehaviour, parseStuck } from '../../../src/cli/sim-options.js';
import { SimulatedBench } from '../../../simulators/bench.js';
import { Misbehaviour } from '../../../simulators/misbehaviour.js';
import { servePty } from '../../../simulators/serve/pty-server.js';
import { serveTcp, type RunningServer } from '../../../simulators/serve/tcp-server.js';

export interface BenchFlags {
  over: 'pty' | 'tcp';
  board: Board;
  seed: number;
  /** As `topoprobe sim --stuck`. */
  stuck?: string[];
  /** As `topoprobe sim --misbehave`. */
  misbehave?: string[];
  senseContacts?: boolean;
}

export interface ServedBench {
  bench: SimulatedBench;
  endpoints: { analyzer: string; switch: string };
  close(): Promise<void>;
}

export async function serveBench(f: BenchFlags): Promise<ServedBench> {
  const bench = new SimulatedBench({ board: f.board, seed: f.seed, timing: 'instant', stuck: parseStuck(f.stuck ?? []), senseContacts: f.senseContacts });
  const misbehaviour = parseMisbehaviour(f.misbehave ?? [], f.seed);
  const servers: RunningServer[] = [];
  for (const which of ['analyzer', 'switch'] as const) {
    const device = which === 'analyzer' ? bench.analyzer : bench.switchMatrix;
    const m = misbehaviour[which];
    const options = { misbehaviour: m ? new Misbehaviour(m) : undefined };
    servers.push(f.over === 'pty' ? await servePty(device, { ...options, name: which }) : await serveTcp(device, 0, options));
  }
  return {
    bench,
    endpoints: { analyzer: servers[0].endpoint, switch: servers[1].endpoint },
    close: async () => {
      await Promise.all(servers.map((s) => s.close()));
    },
  };
}
