/** What a sweep may record: outputs in the user's words with their units and the limit set's bands. */
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../shared/engine/index.ts';
import { availableOutputs, breaksLimit } from '../../../shared/review/sweep-outputs.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
const outputs = availableOutputs(solveCircuit(openNeutral));

describe('availableOutputs', () => {
  it('offers load, bus, shift and unbalance outputs in words with their limit bands', () => {
    const labels = outputs.map((o) => `${o.label} (${o.unit})`);
    expect(labels).toContain('KITCHEN terminal voltage (pu)');
    expect(labels).toContain('HOUSE neutral shift (V)');
    const kitchen = outputs.find((o) => o.label === 'KITCHEN terminal voltage')!;
    // ANSI C84.1 Range B as the violation band (M; see the limit sets)
    expect(kitchen.violation[0]).toBeCloseTo(110 / 120, 12);
    expect(breaksLimit(kitchen, 1.2)).toBe(true);
    expect(breaksLimit(kitchen, 1.0)).toBe(false);
  });


  it('never offers a generated name', () => {
    const withSwitch = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'KITCHEN' ? { ...e, bus: 'KITCHEN~bus' } : e)).concat([{ type: 'switch3', id: 'KITCHEN~bus~sw', from: 'HOUSE', to: 'KITCHEN~bus', open: ['n'] } as never]) } as CircuitInput;
    for (const o of availableOutputs(solveCircuit(withSwitch))) expect(o.label).not.toMatch(/~/);
  });
});
