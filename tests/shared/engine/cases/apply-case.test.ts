/** Study cases: applying a case equals editing the circuit by hand; bad changes name the case and the element. */
import { describe, expect, it } from 'vitest';
import { applyCase, EngineError, InvalidCircuitError, parseCircuit, solveCircuit, type CircuitInput } from '../../../../shared/engine/index.ts';
import { serviceCircuit, LOADS } from './lost-neutral-fixture.ts';

const withCases = (cases: unknown[]): CircuitInput => ({ ...serviceCircuit(LOADS, 25, []), cases } as CircuitInput);

const lostN = {
  id: 'lost-n',
  name: 'Neutral lost at the drop',
  changes: [
    { element: 'DROP', set: { open: ['n'] } },
    { element: 'KITCHEN', set: { each: { kw: 3 } } },
    { add: { type: 'fault', id: 'F1', bus: 'HOUSE', kind: 'lineEarth', phases: ['a'], ohms: 2 } },
    { remove: 'ROD' },
  ],
};

function thrown(f: () => unknown): EngineError {
  try {
    f();
  } catch (e) {
    if (e instanceof EngineError) return e;
    throw e;
  }
  throw new Error('expected an engine error');
}

describe('applyCase', () => {
  it('the case result equals solving the hand-edited circuit (P: a case is only a list of edits)', () => {
    const circuit = withCases([lostN]);
    const edited = serviceCircuit({ ...LOADS, a: { kw: 3, kvar: 0 } }, null, ['n']);
    // the same edits by hand: KITCHEN's "each" replaced whole (kvar back to its default), fault added at the end
    const byHand = { ...edited, elements: [...edited.elements.filter((e) => e.id !== 'KITCHEN').slice(0, 2), { type: 'load', id: 'KITCHEN', bus: 'HOUSE', connection: 'single', between: ['a', 'n'], each: { kw: 3 } }, ...edited.elements.slice(3), { type: 'fault', id: 'F1', bus: 'HOUSE', kind: 'lineEarth', phases: ['a'], ohms: 2 }] } as CircuitInput;
    const viaCase = solveCircuit(applyCase(circuit, 'lost-n'));
    const direct = solveCircuit(byHand);
    expect(viaCase.nodes).toEqual(direct.nodes);
    expect(viaCase.elements).toEqual(direct.elements);
    expect(viaCase.flags).toEqual(direct.flags);
    // and the case really changed something: the base has an intact neutral
    const base = solveCircuit(applyCase(circuit, 'base'));
    expect(base.nodes['HOUSE.n'].mag).toBeLessThan(1);
    expect(viaCase.nodes['HOUSE.n'].mag).toBeGreaterThan(5);
  });

  it('the base solves exactly as the file without cases, and the input is not modified (P)', () => {
    const circuit = withCases([lostN]);
    const before = JSON.stringify(circuit);
    const a = solveCircuit(circuit);
    const b = solveCircuit(serviceCircuit(LOADS, 25, []));
    expect(a.nodes).toEqual(b.nodes);
    applyCase(circuit, 'lost-n');
    expect(JSON.stringify(circuit)).toBe(before);
    expect(applyCase(circuit, 'base')).not.toHaveProperty('cases');
  });

  it('changes apply in order: a removed element cannot be set afterwards', () => {
    const e = thrown(() => applyCase(withCases([{ id: 'x', name: 'Rod gone', changes: [{ remove: 'ROD' }, { element: 'ROD', set: { ohms: 5 } }] }]), 'x'));
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toBe('case "Rod gone": element "ROD": no such element in the circuit');
  });

  it('an unknown element is an invalid-circuit error naming the case and the element', () => {
    const e = thrown(() => applyCase(withCases([{ id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DORP', set: { open: ['n'] } }] }]), 'lost-n'));
    expect(e.code).toBe('invalid-circuit');
    expect(e.message).toContain('case "Neutral lost"');
    expect(e.message).toContain('element "DORP"');
    expect(e.elementIds).toEqual(['DORP']);
    const r = thrown(() => applyCase(withCases([{ id: 'r', changes: [{ remove: 'NOPE' }] }]), 'r'));
    expect(r.message).toBe('case "r": element "NOPE": no such element in the circuit');
  });

  it('an invalid resulting element is an error naming the case, the element and the field', () => {
    const e = thrown(() => applyCase(withCases([{ id: 'bad', name: 'Broken drop', changes: [{ element: 'DROP', set: { open: ['x'] } }] }]), 'bad'));
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toMatch(/^case "Broken drop": element "DROP": open\[0\]: /);
    const k = thrown(() => applyCase(withCases([{ id: 'k', name: 'Both', changes: [{ element: 'KITCHEN', set: { phases: { a: { kw: 1 } } } }] }]), 'k'));
    expect(k.message).toContain('case "Both": element "KITCHEN": give exactly one of "each", "phases" or "total"');
    const add = thrown(() => applyCase(withCases([{ id: 'f', name: 'Fault', changes: [{ add: { type: 'fault', id: 'F9', bus: 'HOUSE', kind: 'sideways' } }] }]), 'f'));
    expect(add.message).toMatch(/^case "Fault": element "F9": kind: /);
    const unknownType = thrown(() => applyCase(withCases([{ id: 'u', changes: [{ add: { type: 'gizmo', id: 'G' } }] }]), 'u'));
    expect(unknownType.message).toContain('case "u": element "G": unknown element type "gizmo"');
  });

  it('refuses changing an id or a type, a duplicate added id, and an unknown case', () => {
    expect(thrown(() => applyCase(withCases([{ id: 'i', changes: [{ element: 'ROD', set: { id: 'ROD2' } }] }]), 'i')).message).toBe('case "i": element "ROD": its id cannot be changed by a case (remove it and add another)');
    expect(thrown(() => applyCase(withCases([{ id: 'd', changes: [{ add: { type: 'earthing', id: 'ROD', node: 'HOUSE.n', ohms: 1 } }] }]), 'd')).message).toBe('case "d": element "ROD": an element with this id already exists');
    expect(thrown(() => applyCase(withCases([lostN]), 'peak')).message).toBe('no case "peak" in this circuit; the cases are: lost-n');
  });

  it('the file format: cases are optional, ids unique, "base" reserved, changes of one of three forms', () => {
    expect(() => parseCircuit(serviceCircuit())).not.toThrow();
    expect(parseCircuit(withCases([lostN])).cases).toHaveLength(1);
    expect(() => parseCircuit(withCases([lostN, lostN]))).toThrow(/cases\.1\.id|cases\[1\]\.id: duplicate case id "lost-n"/);
    expect(() => parseCircuit(withCases([{ id: 'base', changes: [] }]))).toThrow(/"base" is reserved/);
    expect(() => parseCircuit(withCases([{ id: 'x', changes: [{ element: 'ROD' }] }]))).toThrow(InvalidCircuitError);
    expect(() => parseCircuit(withCases([{ id: 'x', changes: [{ element: 'ROD', set: {}, remove: 'ROD' }] }]))).toThrow(InvalidCircuitError);
  });
});
