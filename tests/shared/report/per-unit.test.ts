/**
 * Per-unit bases against a textbook example and the definitions.
 * Grainger & Stevenson, "Power System Analysis" (McGraw-Hill, 1994), chapter 1, the example on
 * changing the base of a generator reactance: X'' = 0.25 pu on the machine's 18 kV, 500 MVA rating,
 * wanted on a 20 kV, 100 MVA base. Problem statement recalled from memory (M); the answer below is
 * computed from it (C): 0.25 · (18/20)² · (100/500) = 0.0405 pu.
 */
import { describe, expect, it } from 'vitest';
import { baseOfLevel, busBase, changeBase, levelBase, levelKey, ohmsToPu, readPerUnitSettings } from '../../../shared/report/per-unit.ts';

describe('per-unit bases', () => {
  it('moves a reactance to a new base as the textbook example does', () => {
    // (C) from the problem statement of Grainger & Stevenson's change-of-base example (M).
    expect(changeBase(0.25, { kv: 18, mva: 500 }, { kv: 20, mva: 100 })).toBeCloseTo(0.0405, 10);
  });

  it('gives Z_base = kV²/MVA and I_base = MVA/(√3 kV) on a level', () => {
    const b = levelBase(20, 100);
    // (C) 20² / 100 = 4 Ω; 100e6 / (√3 · 20e3) = 2886.75 A.
    expect(b.zOhms).toBeCloseTo(4, 12);
    expect(b.amps).toBeCloseTo(2886.751, 3);
    // The same reactance in ohms on the 20 kV side: 0.0405 pu · 4 Ω = 0.162 Ω, back to 0.0405 pu.
    expect(ohmsToPu(0.162, b)).toBeCloseTo(0.0405, 12);
  });

  it('takes each level from its nominal voltage unless the study sets its base', () => {
    const defaults = readPerUnitSettings(undefined);
    expect(defaults).toEqual({ baseMva: 1, baseKv: {} });
    expect(levelKey(208)).toBe('0.208');
    expect(baseOfLevel(defaults, 208).kvLL).toBeCloseTo(0.208, 12);
    const own = readPerUnitSettings({ perUnit: { baseMva: 0.5, baseKv: { '0.208': 0.24 } } });
    expect(baseOfLevel(own, 208).kvLL).toBe(0.24);
    expect(baseOfLevel(own, 12470).kvLL).toBeCloseTo(12.47, 12);
    // A malformed setting falls back to the defaults rather than failing a report.
    expect(readPerUnitSettings({ perUnit: { baseMva: -1 } })).toEqual({ baseMva: 1, baseKv: {} });
  });

  it('puts a three-phase bus on V_LL/√3 and a split-phase bus on V_LL/2', () => {
    const s = readPerUnitSettings({});
    expect(busBase(s, { nominalVLL: 208, nominalVLN: 208 / Math.sqrt(3) })!.vLN).toBeCloseTo(120.089, 3);
    expect(busBase(s, { nominalVLL: 240, nominalVLN: 120 })!.vLN).toBeCloseTo(120, 12);
    expect(busBase(s, {})).toBeUndefined();
  });
});
