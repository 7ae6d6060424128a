/**
 * Textbook three-phase circuits (REFERENCES.md R1–R5, R11, R13), solved end to end through the
 * circuit format. Each expected value carries its source label as in REFERENCES.md.
 */
import { describe, expect, it } from 'vitest';
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { expectBalanced, solveChecked } from '../solve-checked.ts';

const SQRT3 = Math.sqrt(3);
const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 } as const;
/** Expect a phasor's magnitude (absolute tolerance) and angle in degrees. */
function near(p: { mag: number; angleDeg: number }, mag: number, angle: number, magTol: number, angTol = 1e-3) {
  expect(Math.abs(p.mag - mag), `magnitude ${p.mag} vs ${mag}`).toBeLessThanOrEqual(magTol);
  expect(Math.abs(((p.angleDeg - angle + 540) % 360) - 180), `angle ${p.angleDeg} vs ${angle}`).toBeLessThanOrEqual(angTol);
}

describe('R1: wye generator with internal impedance, line and wye load', () => {
  // Nilsson & Riedel, Electric Circuits, Example 11.1 (V values; book and example number M)
  const circuit: CircuitInput = {
    ...base,
    elements: [
      { type: 'source', id: 'G', bus: 'GEN', kvLL: (0.12 * SQRT3), impedance: { ohms: { re: 0.2, im: 0.5 } } },
      { type: 'line', id: 'L', from: 'GEN', to: 'LOAD', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: 0.8, im: 1.5 }, b: { re: 0.8, im: 1.5 }, c: { re: 0.8, im: 1.5 }, n: { re: 1, im: 0 } } } },
      { type: 'load', id: 'Z', bus: 'LOAD', connection: 'wye', each: { ohms: { re: 39, im: 28 } } },
    ],
  };
  const r = solveChecked(circuit);
  it('line current 2.4∠−36.870° A (V)', () => {
    near(r.elements.L.ports![0].currents[0], 2.4, -36.87, 5e-4, 1e-3);
  });
  it('load VAN 115.225∠−1.193° V and VAB 199.576∠28.807° V (V)', () => {
    const load = r.buses.find((b) => b.bus === 'LOAD')!;
    near(load.lineToNeutral.a, 115.225, -1.193, 5e-4, 1e-3);
    near(load.lineToLine.ab, 199.576, 28.807, 5e-4, 1e-3);
  });
  it('generator terminal Van 118.898∠−0.324° V (V)', () => {
    near(r.buses.find((b) => b.bus === 'GEN')!.lineToNeutral.a, 118.898, -0.324, 5e-4, 1e-3);
  });
  it('S load 673.92 + j483.84 VA and S of the EMFs 691.2 + j518.4 VA (V)', () => {
    expect(r.elements.Z.power.re).toBeCloseTo(673.92, 6);
    expect(r.elements.Z.power.im).toBeCloseTo(483.84, 6);
    expect(r.elements.G.emfPower!.re).toBeCloseTo(691.2, 6);
    expect(r.elements.G.emfPower!.im).toBeCloseTo(518.4, 6);
  });
  it('balanced: V0 = V2 = 0 and no neutral current (P)', () => expectBalanced(r));
});

describe('R2: ideal source, wye load 10 + j8 Ω', () => {
  // P (C): Ia = 120/(10+j8)
  const make = (connection: 'wye' | 'wyeFloating'): CircuitInput => ({
    ...base,
    elements: [
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.12 * SQRT3 },
      { type: 'load', id: 'Z', bus: 'B', connection, each: { ohms: { re: 10, im: 8 } } },
    ],
  });
  const solid = solveChecked(make('wye'));
  it('Ia 9.3704∠−38.660° A, S3φ 2634.15 + j2107.32 VA, pf 0.78087 lagging (C)', () => {
    near(solid.elements.Z.currents[0], 9.3704, -38.66, 5e-5, 1e-3);
    expect(Math.abs(solid.elements.Z.power.re - 2634.15)).toBeLessThan(0.005);
    expect(Math.abs(solid.elements.Z.power.im - 2107.32)).toBeLessThan(0.005);
    const pf = solid.elements.Z.power.re / solid.elements.Z.power.mag;
    expect(pf).toBeCloseTo(0.78087, 5);
  });
  it('balanced: no neutral current (P)', () => expectBalanced(solid));
  it('with the neutral open (floating star) the neutral shift is exactly 0 (C)', () => {
    const open = solveChecked(make('wyeFloating'));
    near(open.elements.Z.currents[0], 9.3704, -38.66, 5e-5, 1e-3);
    // the floating star point is an internal node of the load
    expect(open.nodes['Z#star'].mag).toBeLessThan(1e-9);
  });
});

describe('R3: wye source 100∠10° V feeding a delta load 8 + j4 Ω', () => {
  // Alexander & Sadiku, Fundamentals of Electric Circuits, Example 12.3 family (M; values C)
  const r = solveChecked({
    ...base,
    elements: [
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.1 * SQRT3, angleDeg: 10 },
      { type: 'load', id: 'D', bus: 'B', connection: 'delta', each: { ohms: { re: 8, im: 4 } } },
    ],
  });
  it('VAB 173.205∠40° V, IAB 19.3649∠13.435° A, Ia 33.541∠−16.565° A (C)', () => {
    near(r.buses[0].lineToLine.ab, 173.205, 40, 5e-4, 1e-3);
    near(r.elements.D.branchCurrents!.ab, 19.3649, 13.435, 5e-5, 1e-3);
    near(r.elements.D.currents[0], 33.541, -16.565, 5e-4, 1e-3);
  });
  it('the equivalent wye ZY = ZΔ/3 draws the same line current (C)', () => {
    const y = solveChecked({
      ...base,
      elements: [
        { type: 'source', id: 'S', bus: 'B', kvLL: 0.1 * SQRT3, angleDeg: 10 },
        { type: 'load', id: 'Y', bus: 'B', connection: 'wyeFloating', each: { ohms: { re: 8 / 3, im: 4 / 3 } } },
      ],
    });
    near(y.elements.Y.currents[0], r.elements.D.currents[0].mag, r.elements.D.currents[0].angleDeg, 1e-9, 1e-9);
  });
});

describe('R4: delta source Vab 330∠0° V, delta load 20 − j15 Ω', () => {
  // Alexander & Sadiku, Ch. 12 (M; values C)
  const r = solveChecked({
    ...base,
    elements: [
      // a delta source's Vab leads angleDeg by 30° (documented), so angleDeg −30 puts Vab at 0°
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.33, connection: 'delta', angleDeg: -30 },
      { type: 'load', id: 'D', bus: 'B', connection: 'delta', each: { ohms: { re: 20, im: -15 } } },
    ],
  });
  it('IAB 13.200∠36.870° A and Ia 22.863∠6.870° A (C)', () => {
    near(r.buses[0].lineToLine.ab, 330, 0, 1e-9, 1e-9);
    near(r.elements.D.branchCurrents!.ab, 13.2, 36.87, 5e-4, 1e-3);
    near(r.elements.D.currents[0], 22.863, 6.87, 5e-4, 1e-3);
  });
  it('the whole network has no path to earth and is reported floating (P)', () => {
    expect(r.floating.length).toBe(1);
    expect(r.buses[0].floating).toBe(true);
    expect(r.flags.some((f) => f.code === 'floating')).toBe(true);
  });
});

describe('R5: 100 V per phase, sequence ACB, unequal wye load with solid neutral', () => {
  // Alexander & Sadiku, Example 12.9 (inputs partly V; values C)
  const r = solveChecked({
    ...base,
    sequence: 'ACB',
    elements: [
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.1 * SQRT3 },
      { type: 'load', id: 'Z', bus: 'B', connection: 'wye', phases: { a: { ohms: 15 }, b: { ohms: { re: 10, im: 5 } }, c: { ohms: { re: 6, im: -8 } } } },
    ],
  });
  it('Ia 6.6667∠0°, Ib 8.9443∠93.435°, Ic 10.000∠−66.870° A (C)', () => {
    const [ia, ib, ic] = r.elements.Z.currents;
    near(ia, 6.6667, 0, 5e-5, 1e-3);
    near(ib, 8.9443, 93.435, 5e-5, 1e-3);
    near(ic, 10, -66.87, 5e-5, 1e-3);
  });
  it('the neutral carries 10.0625∠−1.526° A back to the source (C)', () => {
    // the load's neutral port current flows into the load from the bus: −(Ia+Ib+Ic)
    const inN = r.elements.Z.currents[3];
    near({ mag: inN.mag, angleDeg: inN.angleDeg + 180 }, 10.0625, -1.526, 5e-4, 1e-3);
  });
  it('total S 2066.67 − j400 VA (C)', () => {
    expect(Math.abs(r.elements.Z.power.re - 2066.67)).toBeLessThan(0.005);
    expect(Math.abs(r.elements.Z.power.im + 400)).toBeLessThan(1e-9);
  });
});

describe('R11: the "208 V" of a 208Y/120 V service', () => {
  // P: 120∠0° − 120∠120° = 207.846∠−30°
  const r = solveChecked({ ...base, elements: [{ type: 'source', id: 'S', bus: 'B', kvLL: 0.12 * SQRT3 }, { type: 'load', id: 'R', bus: 'B', connection: 'wye', each: { ohms: 10 } }] });
  it('Va − Vc = 207.846∠−30° V (P)', () => {
    const ca = r.buses[0].lineToLine.ca; // Vc − Va
    near({ mag: ca.mag, angleDeg: ca.angleDeg + 180 }, 207.846, -30, 5e-4, 1e-6);
  });
});

describe('R13: two-wattmeter readings of a balanced load', () => {
  // Alexander & Sadiku, Example 12.12 (M; values C): W1 1560 W, W2 2100 W, VL 220 V → P 3660 W, Q 935.31 var
  const r = solveChecked({
    ...base,
    elements: [
      { type: 'source', id: 'S', bus: 'B', kvLL: 0.22 },
      { type: 'load', id: 'M', bus: 'B', connection: 'wyeFloating', total: { kw: 3.66, kvar: 0.93531 } },
    ],
  });
  it('W1 = Re(Vab·Ia*) ≈ 1560 W and W2 = Re(Vcb·Ic*) ≈ 2100 W (C)', () => {
    const b = r.buses[0];
    const [ia, , ic] = r.elements.M.currents;
    const vab = b.lineToLine.ab;
    const vcb = { re: -b.lineToLine.bc.re, im: -b.lineToLine.bc.im };
    const w1 = vab.re * ia.re + vab.im * ia.im;
    const w2 = vcb.re * ic.re + vcb.im * ic.im;
    expect(Math.abs(w1 - 1560)).toBeLessThan(0.01);
    expect(Math.abs(w2 - 2100)).toBeLessThan(0.01);
    expect(r.elements.M.power.re / r.elements.M.power.mag).toBeCloseTo(0.96886, 5);
  });
});
