// The map used when no fixture map file is given. For the nodes in board order k = 1..N:
//   hi = 1000 + k, lo = 2000 + k, sense = 3000 + k; ground: hi 1000, lo 2000, sense 3000.
// Three decades of channels per bus leave room for 999 nodes; a bigger board needs a map file.
import { GROUND, type Board } from '../board/types.js';
import { FixtureMapError } from './fixture-map-error.js';
import { FixtureMap, type FixtureMapData } from './fixture-map-model.js';

export const DEFAULT_MAP_MAX_NODES = 999;
const BUS_BASE = { hi: 1000, lo: 2000, sense: 3000 } as const;

export function defaultFixtureMap(board: Pick<Board, 'name' | 'file' | 'nodes'>): FixtureMap {
  const count = board.nodes.filter((n) => n.name !== GROUND).length;
  if (count > DEFAULT_MAP_MAX_NODES) {
    throw new FixtureMapError([
      {
        file: board.file,
        path: '',
        message: `board ${board.name} has ${count} nodes, more than the ${DEFAULT_MAP_MAX_NODES} the default fixture map covers; give a fixture map file`,
      },
    ]);
  }
  const data: FixtureMapData = { nodes: {}, gnd: { hi: BUS_BASE.hi, lo: BUS_BASE.lo, sense: BUS_BASE.sense } };
  board.nodes
    .filter((n) => n.name !== GROUND)
    .forEach((node, i) => {
      const k = i + 1;
      data.nodes[node.name] = { hi: BUS_BASE.hi + k, lo: BUS_BASE.lo + k, sense: BUS_BASE.sense + k };
    });
  return new FixtureMap(data, `default map for board ${board.name}`);
}
