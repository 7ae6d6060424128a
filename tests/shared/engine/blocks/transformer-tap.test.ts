/**
 * Off-load tap on a bank's HV winding: (P) common practice, the tap changes the turns ratio by
 * (1 + tap%/100). Hand calculation (C): a 12.47 kV – 208Y/120 V Yg-Yg bank at no load passes
 * V_LV = V_HV / (n·(1 + tap%/100)), n = 12 470 / 208.
 */
import { describe, expect, it } from 'vitest';
import type { CircuitInput } from '../../../../shared/engine/index.ts';
import { parseCircuit } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const bank = (tap?: { steps: number; stepPercent?: number }): CircuitInput => ({
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 60,
  elements: [
    { type: 'source', id: 'S', bus: 'HV', kvLL: 12.47 },
    { type: 'transformer', id: 'T', from: 'HV', to: 'LV', kva: 150, kvHigh: 12.47, kvLow: 0.208, connection: 'Yg-Yg', percentR: 1, percentX: 2, ...(tap ? { tap } : {}) },
    // 1 MΩ per phase: a no-load probe (its current is microamperes)
    { type: 'load', id: 'PROBE', bus: 'LV', connection: 'wye', each: { ohms: 1e6 } },
  ],
});

const vLV = (c: CircuitInput) => solveChecked(c).buses.find((b) => b.bus === 'LV')!.lineToNeutral.a.mag;

describe('transformer tap (HV winding)', () => {
  const nominal = 208 / Math.sqrt(3); // 120.09 V (C)
  it('no tap: the rated secondary voltage', () => {
    expect(vLV(bank())).toBeCloseTo(nominal, 3);
  });
  it('+2 steps of 2.5 % (+5 %): 120.09 / 1.05 = 114.37 V (C)', () => {
    expect(vLV(bank({ steps: 2, stepPercent: 2.5 }))).toBeCloseTo(nominal / 1.05, 3);
    expect(nominal / 1.05).toBeCloseTo(114.37, 2);
  });
  it('−2 steps of 2.5 % (−5 %): 120.09 / 0.95 = 126.41 V (C); the step size defaults to 2.5 %', () => {
    expect(vLV(bank({ steps: -2 }))).toBeCloseTo(nominal / 0.95, 3);
    expect(solveChecked(bank({ steps: -2 })).elements.T.tapPercent).toBe(-5);
  });
  it('refuses a fractional step or a tap past ±50 %', () => {
    const bad = (tap: unknown) => {
      const c = bank() as { elements: Record<string, unknown>[] };
      c.elements[1].tap = tap;
      return () => parseCircuit(c);
    };
    expect(bad({ steps: 1.5 })).toThrow(/tap steps must be a whole number/);
    expect(bad({ steps: 30, stepPercent: 2 })).toThrow(/within ±50 %/);
  });
});
