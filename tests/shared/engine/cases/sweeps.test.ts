/**
 * Sweeps: the point generator, setPath, and two checks against outside sources on a lost neutral:
 * a kW sweep agrees at every point with Millman's theorem (J. Millman, "A useful network theorem",
 * Proc. IRE 28 (1940)), evaluated independently in lost-neutral-fixture.ts; a sweep of the earth
 * rod's resistance runs from the solid-neutral answer (0 Ω) to the open-neutral one (very large).
 */
import { describe, expect, it } from 'vitest';
import { getPath, InvalidCircuitError, setPath, solveCircuit, sweepCircuit, sweepPoints, sweepValues, type CircuitResult } from '../../../../shared/engine/index.ts';
import { cabs, LOADS, millman, serviceCircuit, type C } from './lost-neutral-fixture.ts';

const near = (a: C, b: C) => cabs({ re: a.re - b.re, im: a.im - b.im });

/** Largest distance between the engine's house voltages and Millman's, V. */
function millmanError(r: CircuitResult, m: ReturnType<typeof millman>): number {
  let worst = near(r.nodes['HOUSE.n'], m.star);
  for (const k of ['a', 'b', 'c'] as const) worst = Math.max(worst, near(r.nodes[`HOUSE.${k}`], m.house[k]));
  return worst;
}

describe('sweep points', () => {
  it('linear: both ends exact, evenly spaced; steps counts points (P)', () => {
    expect(sweepValues({ from: 1, to: 3, steps: 5 })).toEqual([1, 1.5, 2, 2.5, 3]);
    expect(sweepValues({ from: 2, to: 0, steps: 3 })).toEqual([2, 1, 0]);
    expect(sweepValues({ from: 7, to: 9, steps: 1 })).toEqual([7]);
  });
  it('log: constant ratio between neighbours (P)', () => {
    const v = sweepValues({ from: 0.01, to: 100, steps: 5, scale: 'log' });
    expect(v[0]).toBe(0.01);
    expect(v[4]).toBe(100);
    for (let k = 1; k < 5; k++) expect(v[k] / v[k - 1]).toBeCloseTo(10, 10);
    expect(() => sweepValues({ from: 0, to: 10, steps: 3, scale: 'log' })).toThrow(/above 0/);
  });
  it('two parameters give every combination, the first varying slowest', () => {
    expect(sweepPoints([{ from: 0, to: 1, steps: 2 }, { from: 5, to: 7, steps: 3 }])).toEqual([[0, 5], [0, 6], [0, 7], [1, 5], [1, 6], [1, 7]]);
    expect(() => sweepPoints([])).toThrow(InvalidCircuitError);
    expect(() => sweepPoints([{ from: 0, to: 1, steps: 0 }])).toThrow(/points ≥ 1/);
    expect(() => sweepPoints([{ from: 0, to: 1, steps: 2000 }, { from: 0, to: 1, steps: 2000 }])).toThrow(/more than/);
  });
});

describe('setPath', () => {
  const c = serviceCircuit();
  it('writes a nested numeric field and copies only along the path', () => {
    const d = setPath(c, 'KITCHEN.each.kw', 2.5);
    expect(getPath(d, 'KITCHEN.each.kw')).toBe(2.5);
    expect(getPath(c, 'KITCHEN.each.kw')).toBe(1.5);
    expect(getPath(d, 'KITCHEN.each.kvar')).toBe(0.2);
    expect(d.elements[0]).toBe(c.elements[0]);
    expect(getPath(setPath(c, 'DROP.impedance.ohmsPerLength.n.re', 0.001), 'DROP.impedance.ohmsPerLength.n.re')).toBe(0.001);
  });
  it('element ids with dots resolve to the longest matching id', () => {
    const dotted = { ...c, elements: [...c.elements, { type: 'earthing' as const, id: 'ROD.2', node: 'HOUSE.n', ohms: 40 }] };
    expect(getPath(setPath(dotted, 'ROD.2.ohms', 10), 'ROD.2.ohms')).toBe(10);
    expect(getPath(setPath(dotted, 'ROD.ohms', 11), 'ROD.ohms')).toBe(11);
  });
  it('clear errors: unknown element, a path without a field, a non-numeric value', () => {
    expect(() => setPath(c, 'KITCHN.each.kw', 1)).toThrow('parameter "KITCHN.each.kw": no element "KITCHN" in the circuit');
    expect(() => setPath(c, 'KITCHEN', 1)).toThrow(/write it as <element>\.<field>/);
    expect(() => setPath(c, 'KITCHEN.each', 1)).toThrow(/not a number/);
    expect(() => setPath(c, 'KITCHEN.bus.x', 1)).toThrow(/single value/);
  });
});

describe('lost neutral, checked against Millman (C from the theorem, evaluated independently)', () => {
  it("a sweep of KITCHEN's kW with the neutral open and no rod agrees with Millman at every point", () => {
    const base = serviceCircuit(LOADS, null, ['n']);
    const points = sweepPoints([{ from: 0.2, to: 6, steps: 12 }]);
    for (const [kw] of points) {
      const r = solveCircuit(sweepCircuit(base, ['KITCHEN.each.kw'], [kw]));
      const m = millman({ ...LOADS, a: { ...LOADS.a, kw } }, null);
      expect(millmanError(r, m), `at ${kw} kW`).toBeLessThan(1e-9 * 120);
    }
    // the sweep is not flat: the star point moves by volts across it
    const first = millman({ ...LOADS, a: { ...LOADS.a, kw: 0.2 } }, null).star;
    const last = millman({ ...LOADS, a: { ...LOADS.a, kw: 6 } }, null).star;
    expect(near(first, last)).toBeGreaterThan(10);
  });

  it('a two-parameter sweep (KITCHEN kW × HEATER kW) agrees with Millman at every point', () => {
    const base = serviceCircuit(LOADS, 25, ['n']);
    for (const [ka, kb] of sweepPoints([{ from: 0.5, to: 4, steps: 4 }, { from: 0.5, to: 5, steps: 4, scale: 'log' }])) {
      const r = solveCircuit(sweepCircuit(base, ['KITCHEN.each.kw', 'HEATER.each.kw'], [ka, kb]));
      const m = millman({ ...LOADS, a: { ...LOADS.a, kw: ka }, b: { ...LOADS.b, kw: kb } }, 25);
      expect(millmanError(r, m), `at ${ka}, ${kb} kW`).toBeLessThan(1e-9 * 120);
    }
  });

  it('a sweep of the rod resistance: 0 Ω gives the solid-neutral answer, very large the open-neutral one', () => {
    const base = serviceCircuit(LOADS, 25, ['n']);
    const solid = millman(LOADS, 0); // star point held at earth: each load on its own phase
    const open = millman(LOADS, null); // no path from the star point to earth
    const values = sweepValues({ from: 1e-3, to: 1e9, steps: 13, scale: 'log' });
    const results = [0, ...values].map((ohms) => ({ ohms, r: solveCircuit(sweepCircuit(base, ['ROD.ohms'], [ohms])) }));
    // every point is Millman's with the rod as one more branch to earth
    for (const { ohms, r } of results) expect(millmanError(r, millman(LOADS, ohms)), `at ${ohms} Ω`).toBeLessThan(1e-9 * 120);
    // the limits
    expect(millmanError(results[0].r, solid)).toBeLessThan(1e-9 * 120);
    expect(millmanError(results[results.length - 1].r, open)).toBeLessThan(1e-4); // 1e9 Ω vs ~3.6 Ω loads: ~1e-7 relative
    // and between them the star point moves monotonically away from earth
    const shifts = results.map(({ r }) => r.nodes['HOUSE.n'].mag);
    for (let k = 1; k < shifts.length; k++) expect(shifts[k]).toBeGreaterThanOrEqual(shifts[k - 1] - 1e-9);
    expect(shifts[shifts.length - 1]).toBeCloseTo(cabs(open.star), 3);
  });
});
