/** The demo circuits solve with every invariant holding, and show what each is for. */
import { describe, expect, it } from 'vitest';
import { circuitResults, createNetwork, demoCircuits, prepareCircuit, solveCircuit } from '../../../shared/engine/index.ts';
import { solveChecked } from './solve-checked.ts';

describe('demo circuits', () => {
  it('have stable, distinct keys', () => {
    expect(demoCircuits.map((d) => d.key)).toEqual(['open-neutral-208y120', 'split-phase-120-240', 'delta-wye-bank', 'feeder-earth-fault', 'wrenfold-close-balancing']);
  });
  for (const d of demoCircuits) {
    it(`${d.key} solves with KCL, power balance and rotation invariance`, () => {
      const r = solveChecked(d.circuit);
      expect(r.buses.length).toBeGreaterThan(1);
      expect(Object.keys(r.elements).length).toBe(d.circuit.elements.length);
    });
  }
  it('feeder-earth-fault: the fault current is several times the load current and returns through earth and neutral (P)', () => {
    const r = solveChecked(demoCircuits.find((d) => d.key === 'feeder-earth-fault')!.circuit);
    const f = r.faults[0];
    expect(f.phases).toEqual(['a']);
    const loadI = r.elements['END-LOAD'].currents[1].mag;
    expect(f.phaseCurrents.a.mag).toBeGreaterThan(5 * loadI);
    expect(f.earthCurrent.mag).toBeCloseTo(f.phaseCurrents.a.mag, 6);
    expect(f.sequence.zero.mag).toBeGreaterThan(0);
    // the source sees the fault as a zero-sequence current in its earth bond
    expect(r.elements['KX-SUB'].earthCurrent!.mag).toBeGreaterThan(100);
  });
});

describe('live re-solving through createNetwork', () => {
  it('an updated network gives the same results as a fresh solveCircuit (P)', () => {
    const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
    const prepared = prepareCircuit(demo);
    const net = createNetwork(prepared.primitives);
    net.solve();
    // edit a load value (same topology) and re-solve
    const edited = structuredClone(demo);
    const offices = edited.elements.find((e) => e.id === 'OFFICES') as { phases: { a: { kw: number } } };
    offices.phases.a.kw = 90;
    const again = prepareCircuit(edited);
    net.update(again.primitives);
    const live = circuitResults(again, net.solve());
    const fresh = solveCircuit(edited);
    for (const [node, v] of Object.entries(fresh.nodes)) expect(Math.hypot(live.nodes[node].re - v.re, live.nodes[node].im - v.im)).toBeLessThan(1e-9 * Math.max(1, v.mag));
    expect(live.elements.OFFICES.power.re).toBeCloseTo(fresh.elements.OFFICES.power.re, 6);
  });
});
