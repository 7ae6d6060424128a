/** Bad input gets a typed error with a plain message naming the element, field or node. */
import { describe, expect, it } from 'vitest';
import { IllPosedNetworkError, InvalidCircuitError, solveCircuit, type EngineError } from '../../../../shared/engine/index.ts';

const header = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 };
const src = { type: 'source', id: 'S', bus: 'B', kvLL: 0.208 };

function errorOf(input: unknown): EngineError {
  try {
    solveCircuit(input);
  } catch (e) {
    return e as EngineError;
  }
  throw new Error('expected an error');
}

describe('invalid circuits', () => {
  it('rejects a non-object', () => {
    const e = errorOf('hello');
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toBe('a circuit must be a JSON object with "format": "wyeward-circuit"');
  });
  it('rejects a wrong format tag and version', () => {
    const e = errorOf({ ...header, format: 'other', version: 2, elements: [] }) as InvalidCircuitError;
    expect(e.issues.map((i) => i.path)).toEqual(['format', 'version']);
    expect(e.message).toMatch(/^invalid circuit: format: Invalid input: expected "wyeward-circuit" \(and 1 more problem\)$/);
  });
  it('names an unknown element type and lists the known ones', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'flux-capacitor', id: 'X' }] }) as InvalidCircuitError;
    expect(e.code).toBe('invalid-circuit');
    expect(e.issues[0].path).toBe('elements[1].type');
    expect(e.issues[0].message).toMatch(/^unknown element type "flux-capacitor" \(id "X"\); known types: impedance, voltageSource, .*earthing$/);
  });
  it('rejects NaN and Infinity with the path of the number', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'impedance', id: 'Z', from: 'B.a', to: 'earth', ohms: { re: NaN, im: 1 } }, { type: 'load', id: 'L', bus: 'B', connection: 'wye', each: { ohms: Infinity } }] }) as InvalidCircuitError;
    expect(e.issues).toEqual([
      { path: 'elements[1].ohms.re', message: 'must be a finite number (got NaN)' },
      { path: 'elements[2].each.ohms', message: 'must be a finite number (got Infinity)' },
    ]);
  });
  it('rejects duplicate ids', () => {
    const e = errorOf({ ...header, elements: [src, { ...src, bus: 'C' }] }) as InvalidCircuitError;
    expect(e.message).toBe('invalid circuit: elements: duplicate element id "S"');
  });
  it('reports a bad field with its path and the element id', () => {
    const e = errorOf({ ...header, elements: [{ ...src, kvLL: -1 }] }) as InvalidCircuitError;
    expect(e.issues[0]).toEqual({ path: 'elements[0].kvLL', message: 'Too small: expected number to be >0 (id "S")' });
  });
  it('rejects a bad complex value in plain words', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'impedance', id: 'Z', from: 'B.a', to: 'earth', ohms: { r: 1 } }] }) as InvalidCircuitError;
    expect(e.issues[0].message).toBe('expected a complex value: a number, { "re", "im" } or { "mag", "angleDeg" } with finite numbers (id "Z")');
  });
  it('rejects a zero-impedance load', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'load', id: 'L', bus: 'B', connection: 'wye', each: { ohms: 0 } }] });
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toBe('load L: zero impedance (a short circuit): use a fault or a switch for that');
    expect(e.elementIds).toEqual(['L']);
  });
  it('rejects a zero-impedance impedance primitive', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'impedance', id: 'Z', from: 'B.a', to: 'B.b', ohms: 0 }] });
    expect(e.message).toBe('impedance Z: zero impedance: use a closed switch for an ideal connection');
  });
  it('rejects a switch whose node nothing else uses (a typo)', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'load', id: 'L', bus: 'B', connection: 'wye', each: { ohms: 10 } }, { type: 'switch', id: 'SW', from: 'B.a', to: 'B.x', closed: true }] });
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toBe('switch SW: node "B.x" is not connected to anything else (check the node name)');
    expect(e.nodes).toEqual(['B.x']);
  });
  it('a zero-impedance loop of switches is an ill-posed network naming the switches', () => {
    const e = errorOf({
      ...header,
      elements: [
        src,
        { type: 'load', id: 'L', bus: 'C', connection: 'wye', each: { ohms: 10 } },
        { type: 'switch', id: 'SW1', from: 'B.a', to: 'C.a', closed: true },
        { type: 'switch', id: 'SW2', from: 'B.a', to: 'C.a', closed: true },
      ],
    });
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toMatch(/SW1.*SW2|SW2.*SW1/);
  });
  it('a source shorted by a closed switch is an ill-posed network', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'switch', id: 'SHORT', from: 'B.a', to: 'B.b', closed: true }] });
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.elementIds).toContain('SHORT');
  });
  it('rejects a transformer with both vectorGroup and connection', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'transformer', id: 'T', from: 'B', to: 'C', kva: 100, kvHigh: 0.208, kvLow: 0.48, vectorGroup: 'Dyn11', connection: 'D-Yg', percentX: 5 }] }) as InvalidCircuitError;
    expect(e.issues[0].message).toBe('give exactly one of "vectorGroup" (IEC clock notation) or "connection" (North American rule) (id "T")');
  });
  it('rejects an unrealisable vector group', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'transformer', id: 'T', from: 'B', to: 'C', kva: 100, kvHigh: 0.208, kvLow: 0.12, vectorGroup: 'Dyn0', percentX: 5 }] });
    expect(e.message).toMatch(/^transformer T: vector group Dyn0 is not realisable/);
  });
  it('rejects a bank whose "from" side is the low-voltage side', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'transformer', id: 'T', from: 'B', to: 'C', kva: 100, kvHigh: 0.208, kvLow: 0.48, connection: 'D-Yg', percentX: 5 }] });
    expect(e.message).toBe('transformer T: kvHigh (0.208 kV) is below kvLow (0.48 kV); "from" is the high-voltage side (the phase shift is stated HV to LV)');
  });
  it('rejects kW loads on a bus with no known voltage', () => {
    const e = errorOf({ ...header, elements: [{ type: 'voltageSource', id: 'V', plus: 'X.a', minus: 'earth', volts: 120 }, { type: 'load', id: 'L', bus: 'X', connection: 'single', between: ['a', 'n'], each: { kw: 1 } }] });
    expect(e.message).toBe('load L: kW/kvar need a rated voltage: give "kvLL" (or "ratedVolts"), or the bus nominal voltage');
  });
  it('rejects opening a conductor the line does not have', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'line', id: 'LN', from: 'B', to: 'C', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: 1, b: 1, c: 1 } }, open: ['n'] }] });
    expect(e.message).toBe('line LN: cannot open conductor "n": the line has conductors a, b, c');
  });
  it('rejects a generated id that clashes with a user id', () => {
    const e = errorOf({ ...header, elements: [src, { type: 'impedance', id: 'S/emf-a', from: 'B.a', to: 'earth', ohms: 5 }] });
    expect(e.message).toBe('element ids clash: "S/emf-a" (from S/emf-a) is also used by S; rename one of them');
  });
});
