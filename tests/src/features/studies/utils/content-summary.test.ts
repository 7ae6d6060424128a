import { describe, expect, it } from 'vitest';
import { demoCircuits, deltaWyeBank } from '../../../../../shared/engine/examples/index.ts';
import { busOfNode, summarizeCircuit } from '../../../../../src/features/studies/utils/content-summary.ts';

describe('summarizeCircuit', () => {
  it('reports an empty 60 Hz circuit as empty, with its frequency', () => {
    const s = summarizeCircuit({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [] });
    expect(s).toEqual({ frequencyHz: 60, elementCount: 0, byType: [], buses: [], nominalVolts: [], sequence: null, limitSet: null, problems: [] });
  });

  it('finds buses from conductor node names of primitives and leaves earth out', () => {
    const s = summarizeCircuit({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 50,
      elements: [
        { type: 'voltageSource', id: 'E1', plus: 'S.a', minus: 'earth', volts: { re: 230, im: 0 } },
        { type: 'impedance', id: 'Z1', from: 'S.a', to: 'L1.a', ohms: { re: 0.1, im: 0.05 } },
        { type: 'impedance', id: 'Z2', from: 'L1.n', to: 'earth', ohms: { re: 5, im: 0 } },
        { type: 'zipLoad', id: 'P1', from: 'L1.a', to: 'L1.n', ratedVolts: 230, ratedVA: { re: 2000, im: 500 }, zip: { z: 1, i: 0, p: 0 } },
        { type: 'admittanceMatrix', id: 'Y1', nodes: ['T.1', 'T.2'], siemens: [[{ re: 1, im: 0 }]] },
      ],
    });
    expect(s.frequencyHz).toBe(50);
    expect(s.elementCount).toBe(5);
    // Types in words, never the engine's primitive names.
    expect(s.byType).toEqual([
      { type: 'impedance branch', count: 2 },
      { type: 'admittance block', count: 1 },
      { type: 'voltage source', count: 1 },
      { type: 'ZIP load', count: 1 },
    ]);
    expect(s.buses).toEqual(['L1', 'S', 'T']);
    // The complex source EMF is not a rating; only the load's ratedVolts counts.
    expect(s.nominalVolts).toEqual([230]);
    expect(s.problems).toEqual([]);
  });

  it('reads bus fields and kV ratings of building blocks, ignoring kVA and kvar, and orders buses naturally', () => {
    const s = summarizeCircuit({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'SRC', bus: 'B1', kvLL: 12.47, connection: 'wye' },
        { type: 'transformer', id: 'T1', ratedKva: 500, hv: { bus: 'B1', kv: 12.47 }, lv: { bus: 'B2', kv: 0.208 } },
        { type: 'line', id: 'L1', fromBus: 'B2', toBus: 'B10', lengthFeet: 150 },
        { type: 'load', id: 'LD1', bus: 'B10', ratedKvar: 20, ratedVolts: 120 },
        { type: 'load', id: 'LD2', bus: 'B10', ratedKva: 15 },
        { type: 'capacitorBank', id: 'C1', bus: 'B2', kvar: 50, kvLL: 0.208 },
      ],
    });
    expect(s.byType[0]).toEqual({ type: 'load', count: 2 });
    expect(s.byType.map((t) => t.type)).toEqual(['load', 'capacitor bank', 'line', 'source', 'transformer bank']);
    expect(s.buses).toEqual(['B1', 'B2', 'B10']);
    expect(s.nominalVolts).toEqual([120, 208, 12470]);
  });

  it('counts what the user drew: the hidden switch of an opened neutral is neither an element nor its private bus a bus', () => {
    const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
    const opened = {
      ...demo,
      elements: [
        ...demo.elements.map((e) => (e.id === 'XFMR-SEC' ? { ...e, bus: 'XFMR-SEC~bus' } : e)),
        { type: 'switch3', id: 'XFMR-SEC~bus~sw', from: 'PAD', to: 'XFMR-SEC~bus', conductors: ['a', 'b', 'c', 'n'], closed: true, open: ['n'] },
      ],
    };
    const s = summarizeCircuit(opened);
    // (P) The demo draws 6 elements (source, drop, three loads, rod) on 2 buses; 7 are stored.
    expect(opened.elements).toHaveLength(7);
    expect(s.elementCount).toBe(6);
    expect(s.byType.map((t) => t.type)).not.toContain('switch');
    expect(s.buses).toEqual(['HOUSE', 'PAD']);
  });

  it('uses a circuit-level bus list when there is one', () => {
    const s = summarizeCircuit({
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      buses: [{ id: 'Main', nominalKv: 0.48 }, { name: 'Aux', kvLL: 4.16 }, 'Spare'],
      elements: [],
    });
    expect(s.buses).toEqual(['Aux', 'Main', 'Spare']);
    expect(s.nominalVolts).toEqual([480, 4160]);
  });

  it('reports the stated phase sequence and limit set, and null when the circuit states none', () => {
    const stated = summarizeCircuit({ format: 'wyeward-circuit', version: 1, frequencyHz: 50, sequence: 'ACB', limits: { set: 'iec-en' }, elements: [] });
    expect(stated.sequence).toBe('ACB');
    expect(stated.limitSet).toBe('iec-en');
    const unstated = summarizeCircuit({ format: 'wyeward-circuit', version: 1, frequencyHz: 50, sequence: 'CBA', elements: [] });
    expect(unstated.sequence).toBeNull();
    expect(unstated.limitSet).toBeNull();
  });

  it('says what it cannot read instead of throwing', () => {
    expect(summarizeCircuit(null).problems).toEqual(['The study holds no circuit object.']);
    const s = summarizeCircuit({ frequencyHz: 'sixty', elements: [3, { id: 'x' }, null] });
    expect(s.frequencyHz).toBeNull();
    expect(s.elementCount).toBe(3);
    expect(s.byType).toEqual([{ type: 'untyped', count: 1 }]);
    expect(s.problems).toEqual(['The circuit has no valid frequency.', '2 elements are not objects and were skipped.']);
    expect(summarizeCircuit({ frequencyHz: 60 }).problems).toEqual(['The circuit has no element list.']);
  });
});

describe('busOfNode', () => {
  it('strips the conductor suffix and keeps plain node names', () => {
    expect(busOfNode('B1.a')).toBe('B1');
    expect(busOfNode('Feeder.7.n')).toBe('Feeder.7');
    expect(busOfNode('N4')).toBe('N4');
  });
});

describe('summarizeCircuit on the engine’s demo circuits', () => {
  it.each(demoCircuits.map((d) => [d.key, d.circuit] as const))('%s: every element counted, every bus it names listed, nothing unreadable', (_key, circuit) => {
    const s = summarizeCircuit(circuit);
    expect(s.problems).toEqual([]);
    expect(s.frequencyHz).toBe(circuit.frequencyHz);
    expect(s.elementCount).toBe(circuit.elements.length);
    expect(s.byType.reduce((n, t) => n + t.count, 0)).toBe(circuit.elements.length);
    for (const element of circuit.elements as Record<string, unknown>[]) {
      for (const key of ['bus', 'from', 'to'] as const) {
        const v = element[key];
        if (typeof v === 'string' && v !== 'earth') expect(s.buses).toContain(busOfNode(v));
      }
    }
    expect(s.nominalVolts.length).toBeGreaterThan(0);
  });

  it('reads the delta–wye bank as 12.47 kV and 208 V (the ratings written in the demo file)', () => {
    const s = summarizeCircuit(deltaWyeBank);
    expect(s.nominalVolts).toEqual([208, 12470]);
    expect(s.byType.find((t) => t.type === 'load')?.count).toBe(2);
    expect(s.byType.find((t) => t.type === 'transformer bank')?.count).toBe(1);
  });
});
