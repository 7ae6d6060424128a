/** A sweep's points as packed by the workers and kept on the page: exact values, failures with their message, each point counted once. */
import { describe, expect, it } from 'vitest';
import { packRows, SweepStore } from '../../../../../src/features/workspace/cases/sweep-store.ts';

describe('sweep store', () => {
  it('keeps every value exactly, a missing output as null, a failed point with its message', () => {
    const rows = [{ outputs: [0.1 + 0.2, 230.5] }, { outputs: [null, 1e-300] }, { outputs: [null, null], error: 'cannot be solved' }];
    const packed = packRows(rows, 2);
    expect(packed.values).toHaveLength(6);
    const store = new SweepStore(5, 2);
    expect(store.put(2, packed)).toBe(3);
    expect(store.row(0)).toBeUndefined();
    expect(store.rows().slice(2)).toEqual(rows);
    expect(store.value(0, 2)).toBe(0.1 + 0.2);
    expect(store.error(4)).toBe('cannot be solved');
    expect([store.done, store.failed]).toEqual([3, 1]);
    // a point answered again is not counted twice
    expect(store.putRows(4, [{ outputs: [1, 2] }])).toBe(0);
    expect(store.done).toBe(3);
    expect(() => store.put(4, packRows(rows, 2))).toThrow(RangeError);
  });
});
