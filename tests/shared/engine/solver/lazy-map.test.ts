/**
 * The lazily filled Map behind PrimitiveSolution: it behaves as an ordinary Map on every read
 * and write path, fills once, and the solver's Maps hold the same entries as an eager build.
 */
import { describe, expect, it } from 'vitest';
import { LazyMap } from '../../../../shared/engine/solver/lazy-map.ts';
import { createNetwork } from '../../../../shared/engine/solver/index.ts';
import type { Primitive } from '../../../../shared/engine/types.ts';

const filled = () => {
  let calls = 0;
  const m = new LazyMap<string, number>((set) => {
    calls++;
    set('a', 1);
    set('b', 2);
  });
  return { m, calls: () => calls };
};

describe('LazyMap', () => {
  it('fills on first use, once, and reads like a Map through every accessor', () => {
    const { m, calls } = filled();
    expect(calls()).toBe(0);
    expect(m.get('a')).toBe(1);
    expect(m.size).toBe(2);
    expect(m.has('b')).toBe(true);
    expect(calls()).toBe(1);
    expect([...m]).toEqual([['a', 1], ['b', 2]]);
    expect([...m.keys()]).toEqual(['a', 'b']);
    expect([...m.values()]).toEqual([1, 2]);
    expect([...m.entries()]).toEqual([['a', 1], ['b', 2]]);
    const seen: string[] = [];
    m.forEach((v, k) => seen.push(`${k}=${v}`));
    expect(seen).toEqual(['a=1', 'b=2']);
    expect(m).toBeInstanceOf(Map);
    expect(m).toEqual(new Map([['a', 1], ['b', 2]]));
    expect(calls()).toBe(1);
  });

  it('every entry point fills first (iteration, size, set, delete), and clear empties without filling', () => {
    for (const use of [
      (m: Map<string, number>) => [...m].length,
      (m: Map<string, number>) => m.size,
      (m: Map<string, number>) => m.set('c', 3).size,
      (m: Map<string, number>) => (m.delete('a') ? m.size : -1),
      (m: Map<string, number>) => Array.from(m.values()).length,
    ]) {
      const { m, calls } = filled();
      expect(use(m)).toBeGreaterThanOrEqual(1);
      expect(calls()).toBe(1);
    }
    const { m: set } = filled();
    set.set('a', 10);
    expect([...set]).toEqual([['a', 10], ['b', 2]]); // the write is not overwritten by a later fill
    const { m: cleared, calls } = filled();
    cleared.clear();
    expect(cleared.size).toBe(0);
    expect(calls()).toBe(0);
  });

  it('a solution keeps its own values after the network is updated and solved again', () => {
    const prims = (r: number): Primitive[] => [
      { type: 'voltageSource', id: 'V', plus: 's', minus: 'earth', volts: { re: 100, im: 0 } },
      { type: 'impedance', id: 'R1', from: 's', to: 'm', ohms: { re: r, im: 0 } },
      { type: 'impedance', id: 'R2', from: 'm', to: 'earth', ohms: { re: 1, im: 0 } },
    ];
    const net = createNetwork(prims(1));
    const first = net.solve();
    net.update(prims(3));
    const second = net.solve();
    // V(m) = 100·1/(1 + r) (C: voltage divider)
    expect(second.nodeVolts.get('m')!.re).toBeCloseTo(25, 12);
    expect(first.nodeVolts.get('m')!.re).toBeCloseTo(50, 12);
    expect(first.elementCurrents.get('R1')![0].re).toBeCloseTo(50, 12);
    expect(second.elementCurrents.get('V')![0].re).toBeCloseTo(25, 12);
    expect([...first.nodeVolts.keys()].sort()).toEqual(['earth', 'm', 's']);
    expect([...first.elementCurrents.keys()]).toEqual(['V', 'R1', 'R2']);
  });
});
