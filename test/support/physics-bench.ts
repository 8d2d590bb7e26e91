// A bench-physics harness for tests: a board with a hand-written (or default) fixture map and a mutable
// set of closed channels, read directly without the SCPI layer.
import type { Board } from '../../src/board/types.js';
import { FixtureMap, type FixtureMapData } from '../../src/instruments/fixture-map.js';
import { BenchPhysics, type BenchPhysicsOptions } from '../../simulators/bench-physics.js';

export interface TestBench {
  physics: BenchPhysics;
  closed: Set<number>;
  read(frequencyHz: number, fn?: 'impedance' | 'transfer', averages?: number): { re: number; im: number } | 'overload';
  value(frequencyHz: number, fn?: 'impedance' | 'transfer', averages?: number): { re: number; im: number };
}

export function testBench(board: Board, map: FixtureMap | FixtureMapData, options: BenchPhysicsOptions): TestBench {
  const fixture = map instanceof FixtureMap ? map : new FixtureMap(map, 'test map');
  const closed = new Set<number>();
  const physics = new BenchPhysics(board, fixture, () => closed, options);
  const read = (frequencyHz: number, fn: 'impedance' | 'transfer' = 'impedance', averages = 1) =>
    physics.measure({ frequencyHz, level: 0.1, function: fn, averages });
  const value = (frequencyHz: number, fn: 'impedance' | 'transfer' = 'impedance', averages = 1) => {
    const r = read(frequencyHz, fn, averages);
    if (r === 'overload') throw new Error(`overload at ${frequencyHz} Hz with channels ${[...closed].join(',')}`);
    return r;
  };
  return { physics, closed, read, value };
}

export function relativeError(a: { re: number; im: number }, b: { re: number; im: number }): number {
  return Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im);
}

export function closeOnly(bench: TestBench, ...channels: number[]): void {
  bench.closed.clear();
  for (const c of channels) bench.closed.add(c);
}
