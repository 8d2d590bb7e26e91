// Arithmetic on lattice cells: cells are integer index lists, counted from 0, enumerated with the
// first axis running fastest (like reading a row left to right, then the next row).

export type Boundary = 'open' | 'periodic';

export function cellCount(repeats: readonly number[]): number {
  return repeats.reduce((product, n) => product * n, 1);
}

export function cellAt(index: number, repeats: readonly number[]): number[] {
  const cell: number[] = [];
  for (const n of repeats) {
    cell.push(index % n);
    index = Math.floor(index / n);
  }
  return cell;
}

export function cellIndex(cell: readonly number[], repeats: readonly number[]): number {
  let index = 0;
  for (let axis = repeats.length - 1; axis >= 0; axis--) index = index * repeats[axis] + cell[axis];
  return index;
}

/** The cell at `offset` from `cell`, wrapped on periodic axes; undefined past an open boundary. */
export function shiftCell(
  cell: readonly number[],
  offset: readonly number[],
  repeats: readonly number[],
  boundary: readonly Boundary[],
): number[] | undefined {
  const shifted: number[] = [];
  for (let axis = 0; axis < repeats.length; axis++) {
    const n = repeats[axis];
    const raw = cell[axis] + offset[axis];
    if (boundary[axis] === 'periodic') shifted.push(((raw % n) + n) % n);
    else if (raw < 0 || raw >= n) return undefined;
    else shifted.push(raw);
  }
  return shifted;
}

/** "(2,0)": how cells are shown in messages and part origins. */
export function cellLabel(cell: readonly number[]): string {
  return `(${cell.join(',')})`;
}

/**
 * Reads a cell selector: one entry per axis, each a whole number, a range "a..b" (both ends included)
 * or "all". A single entry may stand without a list for a one-axis lattice. Returns the selected cells
 * in enumeration order, or a problem with the index of the entry at fault (-1 for the whole selector).
 */
export function selectCells(
  input: number | string | (number | string)[],
  repeats: readonly number[],
): { cells: number[][] } | { problem: string; entry: number } {
  const entries = Array.isArray(input) ? input : [input];
  if (entries.length !== repeats.length) {
    return { problem: `has ${entries.length} entries, the lattice has ${axes(repeats.length)}`, entry: -1 };
  }
  const perAxis: number[][] = [];
  for (let axis = 0; axis < entries.length; axis++) {
    const read = readAxisEntry(entries[axis], repeats[axis]);
    if ('problem' in read) return { problem: read.problem, entry: Array.isArray(input) ? axis : -1 };
    perAxis.push(read.indices);
  }
  const cells: number[][] = [];
  const pick = (axis: number, partial: number[]) => {
    if (axis < 0) return void cells.push([...partial]);
    for (const index of perAxis[axis]) {
      partial[axis] = index;
      pick(axis - 1, partial);
    }
  };
  pick(perAxis.length - 1, new Array(perAxis.length).fill(0));
  return { cells };
}

function readAxisEntry(entry: number | string, n: number): { indices: number[] } | { problem: string } {
  const inRange = (i: number) => Number.isInteger(i) && i >= 0 && i < n;
  const range = (from: number, to: number) => Array.from({ length: to - from + 1 }, (_, k) => from + k);
  if (typeof entry === 'number') {
    return inRange(entry) ? { indices: [entry] } : { problem: `cell ${entry} is outside 0..${n - 1}` };
  }
  const text = entry.trim();
  if (text === 'all') return { indices: range(0, n - 1) };
  const match = /^(\d+)\s*\.\.\s*(\d+)$/.exec(text);
  if (!match) return { problem: `${JSON.stringify(entry)} is not a cell index, a range like "2..5" or "all"` };
  const [from, to] = [Number(match[1]), Number(match[2])];
  if (from > to) return { problem: `range ${JSON.stringify(entry)} runs backwards` };
  if (!inRange(from) || !inRange(to)) return { problem: `range ${JSON.stringify(entry)} is outside 0..${n - 1}` };
  return { indices: range(from, to) };
}

export function axes(count: number): string {
  return count === 1 ? '1 axis' : `${count} axes`;
}
