// Step order and the operation counts, on examples counted by hand.
import { describe, expect, it } from 'vitest';
import { countOperations, orderSteps, type OrderableStep } from '../../../src/plan/step-order.js';

const step = (contacts: string[], ...frequencies: number[]): OrderableStep => ({ contacts, points: frequencies.map((frequency_hz) => ({ frequency_hz })) });

describe('countOperations', () => {
  it('counts every relay that changes state, the final opening included, and every frequency change', () => {
    // Counted by hand: close 1,2 (2); open 1, close 3 (2); open 3, close 1 (2); open 1, 2 at the end (2) = 8.
    const steps = [step(['1', '2'], 100, 200), step(['3', '2'], 200), step(['1', '2'], 300, 300)];
    expect(countOperations(steps)).toEqual({ readings: 5, relay_operations: 8, frequency_changes: 3, contact_changes: 3 });
  });
});

describe('orderSteps', () => {
  it('puts steps with the same contacts together: fewer relay operations than the derived order', () => {
    const naive = [step(['1', '2'], 100), step(['3', '2'], 100), step(['1', '2'], 150, 200)];
    const ordered = orderSteps(naive);
    // Hand count: A, A', B = close 1,2 (2); nothing; open 1, close 3 (2); open 3, 2 (2) = 6 instead of 8.
    expect(countOperations(naive).relay_operations).toBe(8);
    expect(countOperations(ordered).relay_operations).toBe(6);
    expect(ordered.map((s) => s.contacts.join())).toEqual(['1,2', '1,2', '3,2']);
  });

  it('runs each group in the direction that continues at the frequency the previous group ended on', () => {
    // Two sweeps over 1..3 on different contacts: up, then down, so the second starts where the first ended.
    const ordered = orderSteps([step(['a'], 1, 2, 3), step(['b'], 1, 2, 3)]);
    expect(ordered.map((s) => s.points.map((p) => p.frequency_hz))).toEqual([[1, 2, 3], [3, 2, 1]]);
    expect(countOperations(ordered).frequency_changes).toBe(5);
  });

  it('ends a group on the frequency the other steps share, so a profile continues without a change', () => {
    // Node x: a profile at 5 and a sweep 1, 3, .. 9; nodes y and z: profiles at 5. Counted by hand: the
    // derived order changes 1 + 5 + 1 = 7 times; sweep first, then x, y and z at 5, 5 + 1 = 6 times.
    const steps = [step(['x'], 5), step(['x'], 1, 3, 5, 7, 9), step(['y'], 5), step(['z'], 5)];
    const ordered = orderSteps(steps);
    expect(countOperations(steps).frequency_changes).toBe(7);
    expect(countOperations(ordered).frequency_changes).toBe(6);
    expect(ordered[ordered.length - 1].contacts).toEqual(['z']);
  });

  it('keeps every step and every point', () => {
    const steps = [step(['1'], 3, 1), step(['2'], 2), step(['1'], 4), step(['3', '1'], 5, 6)];
    const ordered = orderSteps(steps);
    expect(ordered).toHaveLength(steps.length);
    const points = (list: OrderableStep[]) => list.flatMap((s) => s.points.map((p) => p.frequency_hz)).sort();
    expect(points(ordered)).toEqual(points(steps));
  });
});
