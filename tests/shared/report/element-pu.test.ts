/** Source, line and bank impedances in per unit of the study's bases (the property panel's readout). */
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { elementImpedancesPu } from '../../../shared/report/element-pu.ts';
import { readPerUnitSettings } from '../../../shared/report/per-unit.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const el = (id: string) => openNeutral.elements.find((e) => e.id === id)!;
const defaults = readPerUnitSettings(undefined);
const nominal = () => 208;

describe('element impedances in per unit', () => {
  it('a source in ohms over Z_base of its level (0.208 kV, 1 MVA: 0.043264 Ω)', () => {
    const [z] = elementImpedancesPu(el('XFMR-SEC'), defaults, nominal);
    // (C) (0.004 + j0.012) / 0.043264
    expect(z.pu.re).toBeCloseTo(0.004 / 0.043264, 12);
    expect(z.pu.im).toBeCloseTo(0.012 / 0.043264, 12);
    expect(z.base).toBe('on 1 MVA, 0.208 kV');
  });

  it('a line over its whole length on its from-bus level', () => {
    const [z] = elementImpedancesPu(el('DROP'), defaults, nominal);
    // (C) 30 m × (0.00054 + j0.0003) Ω/m / 0.043264 Ω
    expect(z.pu.re).toBeCloseTo((30 * 0.00054) / 0.043264, 12);
    expect(z.pu.im).toBeCloseTo((30 * 0.0003) / 0.043264, 12);
    expect(elementImpedancesPu(el('DROP'), defaults, () => undefined)).toEqual([]);
  });

  it('a bank moved from its own rating to the system base (the textbook change of base)', () => {
    // Grainger & Stevenson's change-of-base example (M), as a bank: X = 25 % on 500 MVA, 18 kV,
    // wanted on 100 MVA with the 18 kV level based at 20 kV: 0.25·(18/20)²·(100/500) = 0.0405 pu (C).
    const bank = { type: 'transformer', id: 'T1', from: 'HV', to: 'LV', kva: 500_000, kvHigh: 18, kvLow: 0.48, percentR: 0, percentX: 25 };
    const [z] = elementImpedancesPu(bank, readPerUnitSettings({ perUnit: { baseMva: 100, baseKv: { '18': 20 } } }), nominal);
    expect(z.pu.re).toBe(0);
    expect(z.pu.im).toBeCloseTo(0.0405, 12);
    expect(z.base).toBe('on 100 MVA, 20 kV');
  });

  it('a source by short-circuit MVA: |Z1| = MVA_base / MVA_sc at the angle of X/R', () => {
    const src = { type: 'source', id: 'SUB', bus: 'F0', kvLL: 12.47, impedance: { shortCircuitMva: 150, xOverR: 8 } };
    const [z] = elementImpedancesPu(src, readPerUnitSettings({ perUnit: { baseMva: 100 } }), nominal);
    expect(Math.hypot(z.pu.re, z.pu.im)).toBeCloseTo(100 / 150, 12);
    expect(z.pu.im / z.pu.re).toBeCloseTo(8, 12);
  });
});
