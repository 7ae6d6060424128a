/** 120/240 V split-phase services (REFERENCES.md R12) and the centre-tapped transformer. */
import { describe, expect, it } from 'vitest';
import { demoCircuits, type CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const service = (neutralOpen: boolean): CircuitInput => ({
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'splitPhaseSource', id: 'S', bus: 'SVC' },
    { type: 'switch3', id: 'MAIN', from: 'SVC', to: 'HOUSE', conductors: ['1', '2', 'n'], open: neutralOpen ? ['n'] : [] },
    { type: 'load', id: 'L1', bus: 'HOUSE', connection: 'single', between: ['1', 'n'], each: { ohms: 14.4 } },
    { type: 'load', id: 'L2', bus: 'HOUSE', connection: 'single', between: ['2', 'n'], each: { ohms: 4.8 } },
  ],
});

describe('R12: 120/240 V service, 1 kW (14.4 Ω) on leg 1 and 3 kW (4.8 Ω) on leg 2', () => {
  it('neutral current 16.667 A (P (C))', () => {
    const r = solveChecked(service(false));
    const main = r.elements.MAIN.ports![0];
    expect(main.currents[main.conductors.indexOf('n')].mag).toBeCloseTo(16.667, 3);
    expect(r.elements.L1.power.re).toBeCloseTo(1000, 9);
    expect(r.elements.L2.power.re).toBeCloseTo(3000, 9);
  });
  it('with the neutral open the legs see 180 V and 60 V (P (C))', () => {
    const r = solveChecked(service(true));
    const house = r.buses.find((b) => b.bus === 'HOUSE')!;
    expect(house.kind).toBe('splitPhase');
    expect(house.lineToNeutral['1'].mag).toBeCloseTo(180, 9);
    expect(house.lineToNeutral['2'].mag).toBeCloseTo(60, 9);
    expect(house.lineToLine['12'].mag).toBeCloseTo(240, 9);
    // 180 V on a 120 V leg is far outside ANSI C84.1 Range B (P: flags)
    expect(r.flags.some((f) => f.bus === 'HOUSE' && f.conductor === '1' && f.severity === 'violation' && f.code === 'voltage-high')).toBe(true);
    expect(r.flags.some((f) => f.bus === 'HOUSE' && f.conductor === '2' && f.severity === 'violation' && f.code === 'voltage-low')).toBe(true);
  });
});

describe('centre-tapped transformer (demo "split-phase-120-240")', () => {
  const r = solveChecked(demoCircuits.find((d) => d.key === 'split-phase-120-240')!.circuit);
  const pole = r.buses.find((b) => b.bus === 'POLE7')!;
  it('the legs are in antiphase and near 120 V (P)', () => {
    expect(Math.abs(Math.abs(pole.lineToNeutral['1'].angleDeg - pole.lineToNeutral['2'].angleDeg) - 180)).toBeLessThan(2);
    expect(pole.lineToNeutral['1'].mag).toBeGreaterThan(114);
    expect(pole.lineToNeutral['1'].mag).toBeLessThan(121);
  });
  it('open-circuit ratio: 7.2 kV primary gives 120/240 V at no load (P)', () => {
    const noLoad = solveChecked({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'S', bus: 'P', kvLL: 7.2 * Math.sqrt(3) },
        { type: 'splitPhaseTransformer', id: 'T', from: 'P', primary: ['a', 'n'], to: 'S2', kva: 25, kvHigh: 7.2, percentR: 1, percentX: 2 },
      ],
    });
    const s2 = noLoad.buses.find((b) => b.bus === 'S2')!;
    expect(s2.lineToNeutral['1'].mag).toBeCloseTo(120, 9);
    expect(s2.lineToLine['12'].mag).toBeCloseTo(240, 9);
  });
  it('a 240 V short-circuit test sees the nameplate impedance R + jX (M: Kersting leakage split)', () => {
    // Leg 1 shorted to leg 2 through a tiny resistance: |I| ≈ 240 / |Z_240| with Z_240 = (R + jX) pu on 240 V, 25 kVA.
    const z = { r: 0.011, x: 0.016 };
    const zb = (240 * 240) / 25000;
    const sc = solveChecked({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'S', bus: 'P', kvLL: 7.2 * Math.sqrt(3) },
        { type: 'splitPhaseTransformer', id: 'T', from: 'P', primary: ['a', 'n'], to: 'S2', kva: 25, kvHigh: 7.2, percentR: 1.1, percentX: 1.6 },
        { type: 'load', id: 'SHORT', bus: 'S2', connection: 'single', between: ['1', '2'], each: { ohms: 1e-9 } },
      ],
    });
    const expected = 240 / (Math.hypot(z.r, z.x) * zb);
    expect(sc.elements.SHORT.currents[0].mag / expected).toBeCloseTo(1, 6);
    expect(sc.elements.T.loadingPercent!).toBeGreaterThan(100);
    expect(sc.flags.some((f) => f.code === 'overload' && f.elementId === 'T')).toBe(true);
  });
});
