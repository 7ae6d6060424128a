/**
 * Voltage-dependent (ZIP) loads: the iteration converges to S = V·I* at the solved voltage for
 * each part (constant impedance ∝ V², constant current ∝ V, constant power), agrees with the
 * closed-form solution of a source feeding a constant-power load, follows the documented
 * low-voltage rule, and reports non-convergence naming the worst load.
 */
import { describe, expect, it } from 'vitest';
import { NonConvergenceError } from '../../../../shared/engine/errors.ts';
import { solvePrimitives } from '../../../../shared/engine/solver/index.ts';
import type { Cx, Primitive, PrimitiveSolution } from '../../../../shared/engine/types.ts';
import { cabs, expectInvariants, polar } from '../helpers/invariants.ts';

const source = (r: number, x: number): Primitive => ({ type: 'voltageSource', id: 'V', plus: 's', minus: 'earth', volts: { re: 230, im: 0 }, seriesOhms: { re: r, im: x } });
const load = (id: string, from: string, to: string, va: Cx, zip: { z: number; i: number; p: number }, ratedVolts = 230): Primitive => ({ type: 'zipLoad', id, from, to, ratedVolts, ratedVA: va, zip });

/** S = V·I* drawn by a two-terminal load at its solved terminal voltage. */
function drawn(sol: PrimitiveSolution, id: string, from: string, to: string): { s: Cx; v: number } {
  const vf = sol.nodeVolts.get(from)!;
  const vt = sol.nodeVolts.get(to)!;
  const v = { re: vf.re - vt.re, im: vf.im - vt.im };
  const i = sol.elementCurrents.get(id)![0];
  return { s: { re: v.re * i.re + v.im * i.im, im: v.im * i.re - v.re * i.im }, v: cabs(v) };
}

describe('zip loads', () => {
  it('constant power behind a resistance matches the closed form V = (E + √(E² − 4PR))/2 (C)', () => {
    // E = 230 V, R = 1 Ω, P = 5 kW at unity power factor: V² − E·V + P·R = 0, upper root
    const prims = [source(1, 0), load('L', 's', 'earth', { re: 5000, im: 0 }, { z: 0, i: 0, p: 1 })];
    const sol = solvePrimitives(prims);
    expectInvariants(prims, sol);
    const { s, v } = drawn(sol, 'L', 's', 'earth');
    expect(v).toBeCloseTo((230 + Math.sqrt(230 * 230 - 4 * 5000)) / 2, 6);
    expect(Math.abs(s.re - 5000)).toBeLessThan(5000 * 1e-8);
    expect(Math.abs(s.im)).toBeLessThan(5000 * 1e-8);
    expect(sol.iterations).toBeGreaterThan(1);
  });

  it('each part draws its law at the solved voltage: z·S·v², i·S·v, p·S (v in per unit) (P)', () => {
    const S: Cx = { re: 3000, im: 1000 };
    const zip = { z: 0.3, i: 0.3, p: 0.4 };
    const prims: Primitive[] = [
      source(0.4, 0.8),
      { type: 'impedance', id: 'line', from: 's', to: 'b', ohms: { re: 0.3, im: 0.2 } },
      load('Lzip', 'b', 'earth', S, zip),
      load('Lz', 'b', 'earth', S, { z: 1, i: 0, p: 0 }),
      load('Li', 'b', 'earth', S, { z: 0, i: 1, p: 0 }),
      load('Lp', 'b', 'earth', S, { z: 0, i: 0, p: 1 }),
    ];
    const sol = solvePrimitives(prims, { tolerance: 1e-12 });
    expectInvariants(prims, sol);
    const v = drawn(sol, 'Lz', 'b', 'earth').v / 230;
    expect(v).toBeGreaterThan(0.7); // above the low-voltage threshold
    expect(v).toBeLessThan(0.98);
    const check = (id: string, factor: number) => {
      const { s } = drawn(sol, id, 'b', 'earth');
      expect(Math.hypot(s.re - S.re * factor, s.im - S.im * factor), id).toBeLessThan(1e-7 * cabs(S));
    };
    check('Lz', v * v);
    check('Li', v);
    check('Lp', 1);
    check('Lzip', zip.z * v * v + zip.i * v + zip.p);
  });

  it('a constant-power load between two phases (delta-connected) also converges to its rating (P)', () => {
    const prims: Primitive[] = [
      { type: 'voltageSource', id: 'Va', plus: 'a', minus: 'earth', volts: polar(230, 0), seriesOhms: { re: 0.2, im: 0.4 } },
      { type: 'voltageSource', id: 'Vb', plus: 'b', minus: 'earth', volts: polar(230, -120), seriesOhms: { re: 0.2, im: 0.4 } },
      load('Lab', 'a', 'b', { re: 20000, im: 6000 }, { z: 0, i: 0, p: 1 }, 400),
    ];
    const sol = solvePrimitives(prims);
    expectInvariants(prims, sol);
    const { s } = drawn(sol, 'Lab', 'a', 'b');
    expect(Math.hypot(s.re - 20000, s.im - 6000)).toBeLessThan(1e-5);
  });

  it('below the low-voltage threshold the constant-power part becomes the impedance it has at the threshold (documented rule)', () => {
    // P far above what 1 Ω can deliver at 0.7 pu: the load ends as the impedance (0.7·230)²/P
    const P = 50000;
    const prims = [source(1, 0), load('L', 's', 'earth', { re: P, im: 0 }, { z: 0, i: 0, p: 1 })];
    const sol = solvePrimitives(prims);
    const zEq = (0.7 * 230) ** 2 / P;
    const { v } = drawn(sol, 'L', 's', 'earth');
    expect(v).toBeCloseTo((230 * zEq) / (zEq + 1), 6);
    expect(v / 230).toBeLessThan(0.7);
    // and the solution says which load was converted, at what voltage
    expect(sol.lowVoltageLoads).toHaveLength(1);
    expect(sol.lowVoltageLoads![0].id).toBe('L');
    expect(sol.lowVoltageLoads![0].voltsPu).toBeCloseTo(v / 230, 12);
    expect(sol.lowVoltageLoads![0].lowVoltagePu).toBe(0.7);
  });

  it('loads above the threshold, and constant-impedance ones below it, are not reported as converted', () => {
    const fine = solvePrimitives([source(1, 0), load('L', 's', 'earth', { re: 5000, im: 0 }, { z: 0, i: 0, p: 1 })]);
    expect(fine.lowVoltageLoads).toEqual([]);
    // 0.5 pu on a pure constant-impedance zip load: nothing was converted
    const zOnly = solvePrimitives([source(230 * 230 / 10000, 0), load('Z', 's', 'earth', { re: 10000, im: 0 }, { z: 1, i: 0, p: 0 })]);
    expect(drawn(zOnly, 'Z', 's', 'earth').v / 230).toBeCloseTo(0.5, 9);
    expect(zOnly.lowVoltageLoads).toEqual([]);
    // a lower threshold set by the caller is the one reported against
    const low = solvePrimitives([source(1, 0), load('L', 's', 'earth', { re: 8000, im: 0 }, { z: 0, i: 0, p: 1 })], { lowVoltagePu: 0.9 });
    expect(low.lowVoltageLoads!.map((l) => [l.id, l.lowVoltagePu])).toEqual([['L', 0.9]]);
  });

  it('past the nose of the constant-power curve, the documented low-voltage rule gives the solution on the low branch (C)', () => {
    // With the threshold lowered to 0.05 pu, 20 kW behind 1 Ω is beyond the constant-power nose
    // (max transfer 230²/4 = 13.2 kW), so both loads end below 0.05 pu as the impedances they have
    // there: Lbig (0.05·230)²/20 kW; Lsmall (z 0.5, p 0.5 of 100 W) 230²/50 W in parallel with
    // (0.05·230)²/50 W. Closed form V = 230/(1 + R·Y).
    const prims = [source(1, 0), load('Lsmall', 's', 'earth', { re: 100, im: 0 }, { z: 0.5, i: 0, p: 0.5 }), load('Lbig', 's', 'earth', { re: 20000, im: 0 }, { z: 0, i: 0, p: 1 })];
    const sol = solvePrimitives(prims, { lowVoltagePu: 0.05, tolerance: 1e-12 });
    expectInvariants(prims, sol);
    const vl = 0.05 * 230;
    const y = 20000 / vl ** 2 + 50 / 230 ** 2 + 50 / vl ** 2;
    expect(drawn(sol, 'Lbig', 's', 'earth').v).toBeCloseTo(230 / (1 + y), 9);
    expect(sol.lowVoltageLoads!.map((l) => l.id).sort()).toEqual(['Lbig', 'Lsmall']);
  });

  it('an iteration limit reached names the load with the worst mismatch', () => {
    const prims = [source(1, 0), load('Lsmall', 's', 'earth', { re: 100, im: 0 }, { z: 0.5, i: 0, p: 0.5 }), load('Lbig', 's', 'earth', { re: 12000, im: 0 }, { z: 0, i: 0, p: 1 })];
    let err: unknown;
    try {
      solvePrimitives(prims, { maxIterations: 2 });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(NonConvergenceError);
    const e = err as NonConvergenceError;
    expect(e.code).toBe('non-convergence');
    expect(e.elementIds).toEqual(['Lbig']);
    expect(e.message).toMatch(/^Voltage-dependent loads did not converge in 2 iterations \(possible voltage collapse: the loads ask for more power than the network can deliver\)\. Worst mismatch at load 'Lbig': [\d.e+-]+ VA at terminal voltage /);
  });

  it('a constant-power load near its nose converges to the upper root (chord, then Newton) (C)', () => {
    // 13 kW behind 1 Ω from 230 V (nose at 13.225 kW): upper root of V² − 230·V + 13 000 = 0
    const prims = [source(1, 0), load('L', 's', 'earth', { re: 13000, im: 0 }, { z: 0, i: 0, p: 1 })];
    const sol = solvePrimitives(prims, { tolerance: 1e-12, lowVoltagePu: 0.05 });
    expect(drawn(sol, 'L', 's', 'earth').v).toBeCloseTo((230 + Math.sqrt(230 * 230 - 4 * 13000)) / 2, 8);
    expect(sol.lowVoltageLoads).toEqual([]);
  });

  it('an iteration limit too small for the tolerance is reported, not ignored', () => {
    const prims = [source(1, 0), load('L', 's', 'earth', { re: 10000, im: 0 }, { z: 0, i: 0, p: 1 })];
    expect(() => solvePrimitives(prims, { maxIterations: 3 })).toThrow(NonConvergenceError);
    expect(() => solvePrimitives(prims, { maxIterations: 3 })).toThrow(/did not converge in 3 iterations/);
  });

  it('a pure constant-impedance zip load is linear: one iteration, S ∝ V² (P)', () => {
    const prims = [source(1, 1), load('L', 's', 'earth', { re: 3000, im: 1000 }, { z: 1, i: 0, p: 0 })];
    const sol = solvePrimitives(prims);
    expect(sol.iterations).toBe(1);
    const { s, v } = drawn(sol, 'L', 's', 'earth');
    const f = (v / 230) ** 2;
    expect(Math.hypot(s.re - 3000 * f, s.im - 1000 * f)).toBeLessThan(1e-9);
  });
});
