import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { diagramOverlays, samePlain, shareOverlays, worstFlag } from '../../../../../src/features/workspace/results/overlays.ts';

describe('diagramOverlays', () => {
  const result = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
  const o = diagramOverlays(result);

  it('gives each bus its line-to-neutral magnitudes, the neutral shift in V and %, and the worst flag', () => {
    const house = result.buses.find((b) => b.bus === 'HOUSE')!;
    expect(Object.keys(o.buses).sort()).toEqual(['HOUSE', 'PAD']);
    expect(o.buses.HOUSE.neutralShiftV).toBe(house.neutralToEarth!.mag);
    expect(o.buses.HOUSE.neutralShiftPercent).toBe(house.neutralShiftPercent);
    expect(o.buses.HOUSE.vln.c).toBe(house.lineToNeutral.c.mag);
    expect(o.buses.HOUSE.flags).toHaveLength(5); // 3 voltage violations + phase-voltage unbalance + the neutral-shift warning (load flags sit on the loads)
    expect(o.buses.HOUSE.worstFlag?.severity).toBe('violation');
    expect(o.buses.PAD.flags).toHaveLength(0);
    expect(o.buses.PAD.worstFlag).toBeUndefined();
  });

  it('gives each element its currents per conductor; a single-phase load takes in on its phase what it returns on N (C: KCL)', () => {
    const k = o.elements.KITCHEN;
    expect(k.currents.map((c) => c.conductor)).toEqual(['a', 'n']);
    expect(k.currents[0].mag).toBeCloseTo(k.currents[1].mag, 9);
    // Both currents are into the element: I_a + I_n = 0.
    const rad = (d: number) => (d * Math.PI) / 180;
    const sumRe = k.currents.reduce((s, c) => s + c.mag * Math.cos(rad(c.angleDeg)), 0);
    const sumIm = k.currents.reduce((s, c) => s + c.mag * Math.sin(rad(c.angleDeg)), 0);
    expect(Math.hypot(sumRe, sumIm)).toBeLessThan(1e-9 * k.currents[0].mag);
    const drop = o.elements.DROP;
    expect(drop.currents.filter((c) => c.port === 1).map((c) => c.bus)).toEqual(['HOUSE', 'HOUSE', 'HOUSE', 'HOUSE']);
    // The neutral of the service drop is open: no current in it.
    expect(drop.currents.find((c) => c.port === 0 && c.conductor === 'n')!.mag).toBeLessThan(1e-9);
  });

  it('puts element flags (transformer overload) on the element', () => {
    // The delta–wye demo (300 kVA bank) with another 300 kW delta load: loading well above 100 %.
    const deltaWyeBank = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
    const heavy: CircuitInput = {
      ...deltaWyeBank,
      elements: [...deltaWyeBank.elements, { type: 'load', id: 'EXTRA', bus: 'PM208', connection: 'delta', total: { kw: 300, kvar: 0 } }],
    };
    const r = solveCircuit(heavy);
    const ov = diagramOverlays(r);
    expect(ov.elements['PM-BANK'].loadingPercent).toBeGreaterThan(100);
    expect(ov.elements['PM-BANK'].flags.map((f) => f.code)).toContain('overload');
    expect(ov.elements['PM-BANK'].worstFlag?.code).toBe('overload');
  });
});

describe('worstFlag', () => {
  it('ranks violation over warning over info, first one on a tie', () => {
    const f = (severity: 'info' | 'warning' | 'violation', message: string) => ({ severity, code: 'voltage-low' as const, value: 0, unit: 'V', message });
    expect(worstFlag([f('info', '1'), f('warning', '2'), f('warning', '3')])?.message).toBe('2');
    expect(worstFlag([f('warning', '1'), f('violation', '2')])?.message).toBe('2');
    expect(worstFlag([])).toBeUndefined();
  });
});

describe('shareOverlays', () => {
  const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
  const withKw = (kw: number): CircuitInput => ({ ...circuit, elements: circuit.elements.map((e) => (e.id === 'KITCHEN' && e.type === 'load' ? { ...e, each: { kw, kvar: 0 } } : e)) as CircuitInput['elements'] });

  it('keeps the previous object of every overlay whose values are equal, and takes the new one where they changed', () => {
    const before = diagramOverlays(solveCircuit(circuit));
    const same = shareOverlays(before, diagramOverlays(solveCircuit(circuit)));
    for (const k of Object.keys(before.buses)) expect(same.buses[k]).toBe(before.buses[k]);
    for (const k of Object.keys(before.elements)) expect(same.elements[k]).toBe(before.elements[k]);

    const after = diagramOverlays(solveCircuit(withKw(7)));
    const shared = shareOverlays(before, after);
    // the kitchen load's own currents change with its kW
    expect(shared.elements.KITCHEN).toBe(after.elements.KITCHEN);
    expect(shared.elements.KITCHEN.currents[0].mag).not.toBe(before.elements.KITCHEN.currents[0].mag);
    expect(shared).toEqual(after);
  });

  it('compares plain data deeply (arrays, nesting, missing keys, undefined)', () => {
    expect(samePlain({ a: [1, { b: 'x' }] }, { a: [1, { b: 'x' }] })).toBe(true);
    expect(samePlain({ a: [1, { b: 'x' }] }, { a: [1, { b: 'y' }] })).toBe(false);
    expect(samePlain({ a: 1 }, { a: 1, b: undefined })).toBe(false);
    expect(samePlain([1, 2], [1, 2, 3])).toBe(false);
    expect(samePlain({ a: NaN }, { a: NaN })).toBe(true);
    expect(samePlain([1], { 0: 1 })).toBe(false);
  });
});
