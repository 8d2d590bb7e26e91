// Maps board node names to matrix rows. Ground is the reference node and has no row.
import { GROUND, type Board } from '../board/types.js';

export class NodeIndex {
  readonly names: readonly string[];
  private readonly rows = new Map<string, number>();

  constructor(board: Pick<Board, 'nodes'>) {
    this.names = board.nodes.map((n) => n.name);
    this.names.forEach((name, i) => this.rows.set(name, i));
  }

  get size(): number {
    return this.names.length;
  }

  /** Row of a node, -1 for ground; throws for a name not on the board. */
  row(name: string): number {
    if (name === GROUND) return -1;
    const r = this.rows.get(name);
    if (r === undefined) throw new UnknownNodeError(name);
    return r;
  }

  has(name: string): boolean {
    return name === GROUND || this.rows.has(name);
  }
}

export class UnknownNodeError extends Error {
  constructor(readonly node: string) {
    super(`no node "${node}" on this board`);
    this.name = 'UnknownNodeError';
  }
}
