/** Faults (REFERENCES.md R9) and fault-kind checks against the sequence-network formulas. */
import { describe, expect, it } from 'vitest';
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

// R9: generator 100 MVA, 25 kV, X1 = X2 = 0.2 pu, X0 = 0.05 pu, solidly earthed, unloaded.
const zBase = (25 * 25) / 100; // Ω
const iBase = 100e6 / (Math.sqrt(3) * 25e3); // A
const gen = (fault: object): CircuitInput => ({
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'source', id: 'G', bus: 'G', kvLL: 25, impedance: { z1: { re: 0, im: 0.2 * zBase }, z0: { re: 0, im: 0.05 * zBase } } },
    { type: 'fault', id: 'F', bus: 'G', ...fault } as CircuitInput['elements'][number],
  ],
});

describe('R9: bolted phase-a-to-earth fault on an unloaded generator', () => {
  const r = solveChecked(gen({ kind: 'lineEarth' }));
  const f = r.faults[0];
  it('fault current 6.667 pu = 15 396 A (V)', () => {
    expect(f.phaseCurrents.a.mag / iBase).toBeCloseTo(6.667, 3);
    expect(Math.abs(f.phaseCurrents.a.mag - 15396)).toBeLessThan(1);
    expect(f.earthCurrent.mag).toBeCloseTo(f.phaseCurrents.a.mag, 6);
    expect(f.phaseCurrents.b.mag).toBe(0);
  });
  it('Ia1 = −j2.222 pu and I0 = I1 = I2 (V; Ia1 = Vf/(Z1+Z2+Z0) textbook formula)', () => {
    const i1 = f.sequence.positive;
    expect(i1.re / iBase).toBeCloseTo(0, 9);
    expect(i1.im / iBase).toBeCloseTo(-2.222, 3);
    expect(Math.hypot(f.sequence.zero.re - i1.re, f.sequence.zero.im - i1.im)).toBeLessThan(1e-6);
    expect(Math.hypot(f.sequence.negative.re - i1.re, f.sequence.negative.im - i1.im)).toBeLessThan(1e-6);
  });
});

describe('other fault kinds on the same generator (C: sequence-network formulas, P)', () => {
  const vf = 1; // pu, prefault
  it('three-phase: |Ia| = Vf/X1 = 5 pu', () => {
    const f = solveChecked(gen({ kind: 'threePhase' })).faults[0];
    expect(f.phaseCurrents.a.mag / iBase).toBeCloseTo(vf / 0.2, 9);
    expect(f.sequence.negative.mag).toBeLessThan(1e-6);
  });
  it('line-line b–c: |Ib| = √3·Vf/(X1+X2) = 4.330 pu, no earth current', () => {
    const f = solveChecked(gen({ kind: 'lineLine' })).faults[0];
    expect(f.phaseCurrents.b.mag / iBase).toBeCloseTo((Math.sqrt(3) * vf) / 0.4, 9);
    expect(f.sequence.zero.mag).toBeLessThan(1e-6);
  });
  it('line-earth through 3 Ω: Ia = 3Vf/(Z1+Z2+Z0+3Zf)', () => {
    const zf = 3;
    const f = solveChecked(gen({ kind: 'lineEarth', ohms: zf })).faults[0];
    const zsum = { re: (3 * zf) / zBase, im: 0.45 };
    expect(f.phaseCurrents.a.mag / iBase).toBeCloseTo((3 * vf) / Math.hypot(zsum.re, zsum.im), 9);
  });
  it('double line-earth: earth current 3·I0 with I1 = Vf/(Z1 + Z2∥Z0)', () => {
    const f = solveChecked(gen({ kind: 'doubleLineEarth' })).faults[0];
    const x2x0 = (0.2 * 0.05) / 0.25;
    const i1 = vf / (0.2 + x2x0);
    const i0 = (i1 * 0.2) / 0.25; // current divider between X2 and X0
    expect(f.sequence.positive.mag / iBase).toBeCloseTo(i1, 9);
    expect(f.earthCurrent.mag / iBase).toBeCloseTo(3 * i0, 9);
  });
});
