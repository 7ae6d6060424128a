/**
 * Invariants every solution of primitives must satisfy, computed independently of the solver
 * from the primitives, the node voltages and the element currents (conventions of
 * shared/engine/types.ts):
 * - KCL at every node but earth: the currents leaving the node into its elements sum to zero;
 * - complex power balance (Tellegen): Σ over all elements of the power they absorb, Σ V·I*, is zero.
 * Use `expectInvariants(prims, solution)` in any test that solves a network.
 */
import { expect } from 'vitest';
import type { Cx, Primitive, PrimitiveSolution } from '../../../../shared/engine/types.ts';
import { EARTH } from '../../../../shared/engine/types.ts';

/** Magnitude of a complex number. */
export const cabs = (c: Cx): number => Math.hypot(c.re, c.im);
/** Complex number from magnitude and angle in degrees. */
export const polar = (mag: number, angleDeg: number): Cx => ({ re: mag * Math.cos((angleDeg * Math.PI) / 180), im: mag * Math.sin((angleDeg * Math.PI) / 180) });
/** Angle of a complex number in degrees. */
export const angleDeg = (c: Cx): number => (Math.atan2(c.im, c.re) * 180) / Math.PI;

/** Expect |a − b| ≤ tol (absolute, complex); the message shows both values. */
export function expectCx(actual: Cx | undefined, expected: Cx, tol: number, what = 'value'): void {
  expect(actual, `${what} missing`).toBeDefined();
  const d = Math.hypot(actual!.re - expected.re, actual!.im - expected.im);
  expect(d, `${what}: got ${actual!.re} + j${actual!.im}, expected ${expected.re} + j${expected.im}`).toBeLessThanOrEqual(tol);
}

/** Terminal currents of an element as (node, current leaving the node into the element) pairs. */
export function terminalCurrents(e: Primitive, currents: Cx[]): [string, Cx][] {
  const neg = (c: Cx): Cx => ({ re: -c.re, im: -c.im });
  switch (e.type) {
    case 'impedance':
    case 'switch':
    case 'zipLoad':
      return [
        [e.from, currents[0]],
        [e.to, neg(currents[0])],
      ];
    case 'currentSource':
      // amps flows through the source from `from` to `to`: it leaves `from` into the source
      return [
        [e.from, currents[0]],
        [e.to, neg(currents[0])],
      ];
    case 'voltageSource':
      // the current leaves `plus` into the circuit, so it enters the source at `minus`
      return [
        [e.plus, neg(currents[0])],
        [e.minus, currents[0]],
      ];
    case 'coupledBranch':
      return e.from.flatMap((f, k): [string, Cx][] => [
        [f, currents[k]],
        [e.to[k], neg(currents[k])],
      ]);
    case 'admittanceMatrix':
      // the stamp's implicit return (its row sums) is earth, at 0 V
      return e.nodes.map((n, k): [string, Cx] => [n, currents[k]]);
  }
}

/** KCL residual per node (earth excluded) and the complex power balance of a solution. */
export function invariantResiduals(prims: readonly Primitive[], sol: PrimitiveSolution) {
  const sum = new Map<string, Cx>();
  const scale = new Map<string, number>();
  let sRe = 0;
  let sIm = 0;
  let sAbs = 0;
  for (const e of prims) {
    const cur = sol.elementCurrents.get(e.id);
    if (!cur) throw new Error(`no currents for element '${e.id}'`);
    for (const [node, i] of terminalCurrents(e, cur)) {
      const acc = sum.get(node) ?? { re: 0, im: 0 };
      sum.set(node, { re: acc.re + i.re, im: acc.im + i.im });
      scale.set(node, Math.max(scale.get(node) ?? 0, cabs(i)));
      const v = sol.nodeVolts.get(node);
      if (!v) throw new Error(`no voltage for node '${node}'`);
      // power absorbed through this terminal: V·conj(I into the element)
      const pr = v.re * i.re + v.im * i.im;
      const pi = v.im * i.re - v.re * i.im;
      sRe += pr;
      sIm += pi;
      sAbs += Math.hypot(pr, pi);
    }
  }
  let worstNode = '';
  let worstRel = 0;
  let worstAbs = 0;
  for (const [node, s] of sum) {
    if (node === EARTH) continue;
    const abs = cabs(s);
    const rel = abs / Math.max(scale.get(node) ?? 0, 1e-300);
    if (abs > worstAbs) worstAbs = abs;
    if (rel > worstRel) {
      worstRel = rel;
      worstNode = node;
    }
  }
  sum.delete(EARTH);
  return { perNode: sum, nodeScale: scale, kclWorstNode: worstNode, kclWorstRelative: worstRel, kclWorstAmps: worstAbs, powerResidual: { re: sRe, im: sIm }, powerScale: sAbs };
}

/**
 * Assert KCL at every node (each node's residual ≤ relTol × its largest current, or ≤ absAmps) and
 * the complex power balance (≤ relTol × Σ|V·I*|, or ≤ absAmps × the largest node voltage).
 */
export function expectInvariants(prims: readonly Primitive[], sol: PrimitiveSolution, relTol = 1e-9, absAmps = 1e-9): void {
  const r = invariantResiduals(prims, sol);
  for (const [node, s] of r.perNode) {
    const limit = Math.max(absAmps, relTol * (r.nodeScale.get(node) ?? 0));
    expect(cabs(s), `KCL at node '${node}' (largest current there ${r.nodeScale.get(node)} A)`).toBeLessThanOrEqual(limit);
  }
  let vmax = 0;
  for (const v of sol.nodeVolts.values()) vmax = Math.max(vmax, cabs(v));
  expect(cabs(r.powerResidual), `complex power balance (Σ V·I* = ${r.powerResidual.re} + j${r.powerResidual.im})`).toBeLessThanOrEqual(
    Math.max(relTol * r.powerScale, absAmps * vmax),
  );
  for (const [node, v] of sol.nodeVolts) {
    expect(Number.isFinite(v.re) && Number.isFinite(v.im), `finite voltage at '${node}'`).toBe(true);
  }
  expect(sol.nodeVolts.get(EARTH)).toEqual({ re: 0, im: 0 });
}
