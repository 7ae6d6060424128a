/**
 * A ZIP load solved below the low-voltage threshold is flagged: its constant-current and
 * constant-power parts were converted to constant impedance there (common practice (P), default
 * 0.7 pu), so it draws less than its rating; the flag names the load, the branch and the voltage.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_LOW_VOLTAGE_PU, solveCircuit, type CircuitInput } from '../../../../shared/engine/index.ts';

const circuit = (kwEach: number, model: 'power' | 'current' | 'impedance'): CircuitInput => ({
  format: 'wyeward-circuit',
  version: 1,
  frequencyHz: 50,
  elements: [
    // a weak 400 V source: Zsc = 0.4² / 0.1 = 1.6 Ω (invented data)
    { type: 'source', id: 'WEAK', bus: 'B', kvLL: 0.4, impedance: { shortCircuitMva: 0.1, xOverR: 5 } },
    { type: 'load', id: 'SHOP', bus: 'B', connection: 'wye', each: { kw: kwEach, kvar: 0, model } },
  ],
});

describe('low-voltage flag of ZIP loads', () => {
  it('exports the solver defaults', () => {
    expect(DEFAULT_LOW_VOLTAGE_PU).toBe(0.7);
  });

  it('a constant-power load pulled below 0.7 pu gets one warning per converted branch naming the load and its voltage', () => {
    const r = solveCircuit(circuit(40, 'power'));
    const flags = r.flags.filter((f) => f.code === 'load-low-voltage');
    expect(flags.map((f) => f.conductor).sort()).toEqual(['a', 'b', 'c']);
    const vln = 400 / Math.sqrt(3);
    for (const f of flags) {
      expect(f.severity).toBe('warning');
      expect(f.elementId).toBe('SHOP');
      expect(f.limit).toBe(0.7);
      expect(f.unit).toBe('pu');
      expect(f.value).toBeLessThan(0.7);
      // the reported per-unit value is the branch's line-to-neutral voltage over its rating
      const ln = r.buses.find((b) => b.bus === 'B')!.lineToNeutral[f.conductor!].mag;
      expect(f.value).toBeCloseTo(ln / vln, 9);
      expect(f.message).toMatch(/^load SHOP \([abc]\) sees [\d.]+ V = 0\.\d{3} pu of its rated voltage, below 0\.7 pu: its constant-current and constant-power parts were converted to constant impedance/);
    }
  });

  it('no flag when the voltage holds, or for a constant-impedance load at any voltage', () => {
    expect(solveCircuit(circuit(2, 'power')).flags.filter((f) => f.code === 'load-low-voltage')).toEqual([]);
    const z = solveCircuit(circuit(40, 'impedance'));
    expect(z.buses[0].lineToNeutral.a.mag / (400 / Math.sqrt(3))).toBeLessThan(0.7);
    expect(z.flags.filter((f) => f.code === 'load-low-voltage')).toEqual([]);
  });
});
