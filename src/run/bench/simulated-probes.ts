// In a simulated operator-probed run nobody can touch the simulated board, so once the operator presses
// Enter the probes are "placed" by tying the step's nodes to the analyzer's buses through the simulated
// matrix in process (the bench's fixture wiring stands in for probe leads), and lifted at the end.
import { GROUND } from '../../board/types.js';
import type { FixtureMap } from '../../instruments/fixture-map.js';
import type { PlanStep } from '../../plan/types.js';
import type { SimulatedBench } from '../../../simulators/bench.js';
import type { ProbeHands } from '../probe-guide.js';

export function simulatedProbeHands(bench: SimulatedBench, fixture: FixtureMap = bench.fixture): ProbeHands {
  const matrix = bench.switchMatrix;
  const channelOf = (node: string, bus: 'hi' | 'lo' | 'sense') => {
    const c = fixture.channel(node === GROUND ? GROUND : node, bus);
    if (c === undefined) throw new RangeError(`the simulated fixture has no ${bus} lead for ${node}`);
    return c;
  };
  return {
    async placed(step: PlanStep) {
      const leads = [channelOf(step.hi, 'hi'), channelOf(step.lo, 'lo'), ...(step.sense !== undefined ? [channelOf(step.sense, 'sense')] : [])];
      await matrix.receive('ROUTe:OPEN:ALL');
      await matrix.receive(`ROUTe:CLOSe (@${leads.join(',')})`);
    },
    async released() {
      await matrix.receive('ROUTe:OPEN:ALL');
    },
  };
}
