// Injected part faults: how they are written (REF=open|short|VALUE), how they fail with one line, and
// the board as built that results. Values are read like the board file reads them (SI prefixes, units).
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { loadBoard, parseBoardText } from '../../../src/board/index.js';
import { GROUND } from '../../../src/board/types.js';
import { ImpedanceSolver } from '../../../src/circuit/impedance.js';
import { GroundedLaplacian } from '../../../src/circuit/laplacian.js';
import { buildBoardAsBuilt, floatingNodes, LEAKAGE_RESISTANCE, SHORT_RESISTANCE } from '../../../simulators/board-as-built.js';
import { FaultError, parseFault, parseFaults } from '../../../simulators/faults.js';
import { NO_PARASITICS } from '../../../simulators/bench-physics.js';
import { makeBoard } from '../../support/make-board.js';
import { testBench, relativeError, closeOnly } from '../../support/physics-bench.js';


const chain = loadBoard('shared/boards/chain-24.yaml');
const tankText = readFileSync('shared/boards/tank-3.json', 'utf8');
const tank = parseBoardText(tankText, 'tank-3.json');

function faultMessage(text: string, board = chain): string {
  try {
    parseFaults([text], board);
  } catch (error) {
    expect(error).toBeInstanceOf(FaultError);
    expect((error as FaultError).exitCode).toBe(2);
    const message = (error as Error).message;
    expect(message).not.toContain('\n');
    return message;
  }
  throw new Error(`${text} was accepted`);
}

describe('reading faults', () => {
  it('reads open, short and values with SI prefixes and units in the part unit (SI prefixes, common practice)', () => {
    expect(parseFault('C_intra_3=open', chain).change).toEqual({ kind: 'open' });
    expect(parseFault('L_tanka_5=SHORT', chain).change).toEqual({ kind: 'short' });
    expect(parseFault('C_intra_3=33n', chain).change).toEqual({ kind: 'value', value: 33e-9 });
    expect(parseFault('C_intra_3=33 nF', chain).change).toEqual({ kind: 'value', value: 33e-9 });
    expect(parseFault('L_tanka_5=2.2uH', chain).change).toEqual({ kind: 'value', value: 2.2e-6 });
    expect(parseFault('R1=4k7', tank).change).toEqual({ kind: 'value', value: 4700 });
    expect(parseFault(' C12 = 12n ', tank)).toMatchObject({ ref: 'C12', change: { kind: 'value', value: 12e-9 } });
  });

  it('refuses bad faults with one line naming the fault and the problem', () => {
    expect(faultMessage('C_intra_3')).toBe('fault "C_intra_3": has no "="; expected REF=open, REF=short or REF=VALUE (e.g. C_intra_3=33n)');
    expect(faultMessage('=open')).toMatch(/^fault "=open": names no part before "="/);
    expect(faultMessage('C_intra_3=')).toMatch(/^fault "C_intra_3=": says nothing after "="/);
    expect(faultMessage('C_intra_33=open')).toMatch(/^fault "C_intra_33=open": no part "C_intra_33" on board chain-24; near names: C_intra_3, /);
    expect(faultMessage('Cintra3=open')).toMatch(/near names: .*C_intra_3/);
    expect(faultMessage('C_intra_3=33uH')).toBe('fault "C_intra_3=33uH": "33uH" is in henries, expected farads (C_intra_3 is a capacitor; or write open or short)');
    expect(faultMessage('L_tanka_5=closed')).toMatch(/^fault "L_tanka_5=closed": "closed" is not a value/);
    expect(faultMessage('C_intra_3=-1n')).toMatch(/is negative/);
    expect(faultMessage('C_intra_3=0')).toMatch(/is zero/);
  });

  it('allows one fault per part', () => {
    expect(() => parseFaults(['C_intra_3=open', 'C_intra_3=short'], chain)).toThrow(
      'fault "C_intra_3=short": C_intra_3 already has a fault (C_intra_3=open); give one fault per part',
    );
    expect(parseFaults(['C_intra_3=open', 'C_intra_4=short'], chain)).toHaveLength(2);
  });
});

describe('the board as built', () => {
  it('a value fault is the board with that value written in the file (keeps its esr)', () => {
    const built = buildBoardAsBuilt(tank, parseFaults(['C2=33n'], tank));
    const written = parseBoardText(tankText.replace('"value": "24nF"', '"value": "33nF"'), 'tank-3.json');
    const c2 = built.parts.find((p) => p.ref === 'C2')!;
    expect(c2).toMatchObject({ kind: 'C', value: 33e-9, esr: 0.02 });
    for (const f of [100e3, 163e3, 300e3]) {
      const a = new ImpedanceSolver(new GroundedLaplacian(built)).at(f);
      const b = new ImpedanceSolver(new GroundedLaplacian(written)).at(f);
      for (const node of ['t1', 't2', 't3']) expect(a.toGround(node)).toEqual(b.toGround(node));
    }
    // The design itself is untouched.
    expect(tank.parts.find((p) => p.ref === 'C2')!.value).toBe(24e-9);
  });

  it('open removes the part; short puts 1 mΩ in its place', () => {
    const built = buildBoardAsBuilt(tank, parseFaults(['L3=open', 'C12=short'], tank));
    expect(built.parts.find((p) => p.ref === 'L3')).toBeUndefined();
    expect(built.parts.find((p) => p.ref === 'C12')).toMatchObject({ kind: 'R', nodes: ['t1', 't2'], value: SHORT_RESISTANCE });
    expect(built.parts).toHaveLength(tank.parts.length - 1);
    // t1 and t2 bridged by 1 mΩ: their impedances to ground nearly agree (a short, common practice).
    const solved = new ImpedanceSolver(new GroundedLaplacian(built)).at(150e3);
    expect(relativeError(solved.toGround('t1'), solved.toGround('t2'))).toBeLessThan(1e-3);
  });

  it('nodes left floating get a 1 TΩ leak to ground each and read as an open circuit (overload)', () => {
    const board = makeBoard('stub', [
      ['L', 'a', GROUND, 22e-6, 0.3],
      ['C', 'a', 'b', 10e-9],
      ['C', 'b', 'c', 10e-9],
      ['L', 'c', GROUND, 22e-6, 0.3],
    ]);
    const map = { nodes: { a: { hi: 1 }, b: { hi: 3 }, c: { hi: 4 } }, gnd: { lo: 2 } };
    // Opening L4 leaves c on the board through C3 and C2: nothing floats, nothing is added.
    const stillJoined = buildBoardAsBuilt(board, parseFaults(['L4=open'], board));
    expect(stillJoined.parts.filter((p) => p.ref.startsWith('R_leak_'))).toEqual([]);
    // Opening C2 as well cuts b and c off from every path to ground.
    const cut = buildBoardAsBuilt(board, parseFaults(['L4=open', 'C2=open'], board));
    expect(floatingNodes(['a', 'b', 'c'], cut.parts)).toEqual([]);
    expect(cut.parts.filter((p) => p.ref.startsWith('R_leak_')).map((p) => [p.kind, p.nodes, p.value])).toEqual([
      ['R', ['b', GROUND], LEAKAGE_RESISTANCE],
      ['R', ['c', GROUND], LEAKAGE_RESISTANCE],
    ]);
    const bench = testBench(cut, map, { ...NO_PARASITICS });
    closeOnly(bench, 1, 2);
    expect(bench.read(100e3)).not.toBe('overload');
    // b: 1 TΩ in parallel with (C3 in series with c's 1 TΩ), far above the 100 MΩ range.
    closeOnly(bench, 3, 2);
    expect(bench.read(100e3)).toBe('overload');
  });
});
