/** Unbalance measures (REFERENCES.md R14 and the definitions table). */
import { describe, expect, it } from 'vitest';
import { iecUnbalanceFromLineMagnitudesPercent, iecUnbalancePercent, maxDeviationUnbalancePercent, polar, sequenceComponents } from '../../../../shared/engine/index.ts';

describe('unbalance', () => {
  it('R14: line voltages 460, 467, 450 V → NEMA line-voltage unbalance 1.961 % (V: NEMA MG 1 worked example)', () => {
    expect(maxDeviationUnbalancePercent([460, 467, 450])).toBeCloseTo(1.961, 3);
  });
  it('R14: the IEC factor from the same magnitudes is 2.1465 % (C)', () => {
    expect(iecUnbalanceFromLineMagnitudesPercent(460, 467, 450)).toBeCloseTo(2.1465, 4);
  });
  it('the magnitudes-only IEC formula agrees with |V2|/|V1| from phasors (P)', () => {
    // line voltages with angles, closing to zero: Vca = −(Vab + Vbc)
    const vab = polar(460, 30);
    const vbc = polar(467, -92);
    const vca = { re: -(vab.re + vbc.re), im: -(vab.im + vbc.im) };
    const s = sequenceComponents(vab, vbc, vca);
    expect(iecUnbalanceFromLineMagnitudesPercent(460, 467, Math.hypot(vca.re, vca.im))).toBeCloseTo(iecUnbalancePercent(s.positive, s.negative), 9);
  });
  it('a balanced set has zero unbalance (P)', () => {
    expect(maxDeviationUnbalancePercent([120, 120, 120])).toBe(0);
    expect(iecUnbalanceFromLineMagnitudesPercent(208, 208, 208)).toBeCloseTo(0, 6);
  });
});
