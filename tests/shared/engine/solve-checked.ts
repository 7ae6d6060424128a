/**
 * Test helper: solve a circuit through the public steps (validate, expand, solve, build results)
 * and assert, on every solve, the invariants the engine issue asks for:
 * - KCL at every node and the complex power balance of the primitive solution (core helper);
 * - the results' own power-balance residual and KCL residual are small;
 * - rotating every source angle by θ rotates every node voltage by θ (same magnitudes).
 * `expectBalanced` adds: V0 = V2 = 0 at every three-phase bus and no neutral current anywhere.
 */
import { expect } from 'vitest';
import { circuitResults, prepareCircuit, solvePrimitives, type CircuitInput, type CircuitResult, type Cx, type Primitive } from '../../../shared/engine/index.ts';
import type { LimitsInput } from '../../../shared/engine/schema/circuit.ts';
import { expectInvariants } from './helpers/invariants.ts';

const rot = (c: Cx, deg: number): Cx => {
  const t = (deg * Math.PI) / 180;
  return { re: c.re * Math.cos(t) - c.im * Math.sin(t), im: c.re * Math.sin(t) + c.im * Math.cos(t) };
};

/** Rotate every source (EMF and current source) by `deg`. */
export function rotateSources(prims: Primitive[], deg: number): Primitive[] {
  return prims.map((p) => (p.type === 'voltageSource' ? { ...p, volts: rot(p.volts, deg) } : p.type === 'currentSource' ? { ...p, amps: rot(p.amps, deg) } : p));
}

/** Solve and check the invariants; returns the typed results. */
export function solveChecked(circuit: CircuitInput, limits?: LimitsInput): CircuitResult {
  const prepared = prepareCircuit(circuit);
  // Voltage-dependent loads iterate to a tolerance; a tight one keeps their KCL mismatch below the checks' 1e-9.
  const sol = solvePrimitives(prepared.primitives, { tolerance: 1e-11 });
  expectInvariants(prepared.primitives, sol);
  const result = circuitResults(prepared, sol, { limits });
  const scale = Math.max(1, result.totals.sourcePower.mag);
  expect(result.totals.powerBalanceResidual.mag, 'power-balance residual of the results').toBeLessThanOrEqual(1e-8 * scale);
  expect(result.totals.maxKclResidualAmps).toBeLessThan(1e-6);
  // Rotation: every phasor turns by the same angle (floating islands keep their reference at 0 V).
  const theta = 37;
  const rotated = solvePrimitives(rotateSources(prepared.primitives, theta), { tolerance: 1e-11 });
  let vmax = 0;
  for (const v of sol.nodeVolts.values()) vmax = Math.max(vmax, Math.hypot(v.re, v.im));
  for (const [node, v] of sol.nodeVolts) {
    const w = rotated.nodeVolts.get(node)!;
    const expected = rot(v, theta);
    expect(Math.hypot(w.re - expected.re, w.im - expected.im), `rotation invariance at ${node}`).toBeLessThanOrEqual(1e-9 * Math.max(vmax, 1));
  }
  return result;
}

/** Balanced network: V0 = V2 = 0 at every three-phase bus and zero neutral current in every element. */
export function expectBalanced(result: CircuitResult): void {
  for (const b of result.buses) {
    if (!b.sequence) continue;
    const v1 = b.sequence.positive.mag;
    expect(b.sequence.zero.mag, `V0 at ${b.bus}`).toBeLessThanOrEqual(1e-9 * v1);
    expect(b.sequence.negative.mag, `V2 at ${b.bus}`).toBeLessThanOrEqual(1e-9 * v1);
  }
  for (const el of Object.values(result.elements)) {
    for (const p of el.ports ?? []) {
      const k = p.conductors.indexOf('n');
      if (k < 0) continue;
      const scale = Math.max(1, ...p.currents.map((c) => c.mag));
      expect(p.currents[k].mag, `neutral current of ${el.id}`).toBeLessThanOrEqual(1e-9 * scale);
    }
  }
}

/** |a − b| for phasor-like values. */
export const cdist = (a: { re: number; im: number }, b: { re: number; im: number }) => Math.hypot(a.re - b.re, a.im - b.im);
