/**
 * Non-physical values are refused with the element named (issue 8, point 3): a passive impedance
 * with a negative resistance, zero or negative ratings, a zero leakage impedance, and a load with
 * negative kW unless it is marked as generation.
 */
import { describe, expect, it } from 'vitest';
import { InvalidCircuitError, solveCircuit, type CircuitInput } from '../../../../shared/engine/index.ts';

const header = { format: 'wyeward-circuit' as const, version: 1 as const, frequencyHz: 60 };
const load = { type: 'load' as const, id: 'LOAD1', bus: 'B', connection: 'wye' as const, each: { kw: 1, kvar: 0 } };
const src = { type: 'source' as const, id: 'SRC1', bus: 'B', kvLL: 0.208 };

function refusal(elements: unknown[]): InvalidCircuitError {
  try {
    solveCircuit({ ...header, elements });
  } catch (e) {
    expect(e).toBeInstanceOf(InvalidCircuitError);
    return e as InvalidCircuitError;
  }
  throw new Error('expected the circuit to be refused');
}

describe('physical validation', () => {
  it.each<[string, unknown[], RegExp]>([
    ['source impedance −1+j0 Ω (the issue’s 174 V from a 120 V EMF)', [{ ...src, impedance: { ohms: { re: -1, im: 0 } } }, load], /impedance\.ohms: an impedance cannot have a negative resistance.*\(id "SRC1"\)/],
    ['source Z1 given polar at 120°', [{ ...src, impedance: { z1: { mag: 1, angleDeg: 120 } } }, load], /impedance\.z1: an impedance cannot have a negative resistance/],
    ['source earthed through −5 Ω', [{ ...src, earthing: { ohms: -5 } }, load], /earthing/],
    ['negative line resistance', [src, { type: 'line', id: 'L1', from: 'B', to: 'C', length: 1, impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: -0.1, im: 0.3 } } } }], /ohmsPerLength\.a: an impedance cannot have a negative resistance.*\(id "L1"\)/],
    ['negative line Z1', [src, { type: 'line', id: 'L1', from: 'B', to: 'C', length: 1, impedance: { kind: 'sequence', z1PerLength: { re: -0.1, im: 0.3 }, z0PerLength: 1 } }], /z1PerLength/],
    ['negative self impedance in a line matrix', [src, { type: 'line', id: 'L1', from: 'B', to: 'C', length: 1, impedance: { kind: 'matrix', conductors: ['a', 'b'], ohmsPerLength: [[-1, 0.1], [0.1, 1]] } }], /self impedance of conductor a/],
    ['load of −5 Ω', [src, { ...load, each: { ohms: -5 } }], /each\.ohms: an impedance cannot have a negative resistance.*\(id "LOAD1"\)/],
    ['earth electrode of −25 Ω', [src, { type: 'earthing', id: 'ROD1', node: 'B.n', ohms: -25 }], /ohms: an impedance cannot have a negative resistance.*\(id "ROD1"\)/],
    ['fault of −0.5 Ω', [src, { type: 'fault', id: 'F1', bus: 'B', kind: 'lineEarth', ohms: -0.5 }], /\(id "F1"\)/],
    ['negative kW on a load not marked as generation', [src, { ...load, each: { kw: -3, kvar: 0 } }], /each\.kw: a load cannot take negative kW.*generation.*\(id "LOAD1"\)/],
    ['zero kVA bank', [src, { type: 'transformer', id: 'TX1', from: 'B', to: 'C', kva: 0, kvHigh: 0.208, kvLow: 0.208, connection: 'Yg-Yg', percentZ: 5, xOverR: 4 }], /kva.*\(id "TX1"\)/],
    ['%Z of −5', [src, { type: 'transformer', id: 'TX1', from: 'B', to: 'C', kva: 100, kvHigh: 0.208, kvLow: 0.208, connection: 'Yg-Yg', percentZ: -5, xOverR: 4 }], /percentZ/],
    ['%R = %X = 0', [src, { type: 'transformer', id: 'TX1', from: 'B', to: 'C', kva: 100, kvHigh: 0.208, kvLow: 0.208, connection: 'Yg-Yg', percentR: 0, percentX: 0 }], /percentX: the leakage impedance must be above zero/],
    ['zero kvar capacitor bank', [src, { type: 'capacitorBank', id: 'CAP1', bus: 'B', kvar: 0 }], /kvar.*\(id "CAP1"\)/],
  ])('refuses %s', (_, elements, message) => {
    expect(refusal(elements).message).toMatch(message);
  });

  it('accepts a load with negative kW marked as generation, which then delivers power', () => {
    const r = solveCircuit({ ...header, elements: [src, { ...load, generation: true, each: { kw: -3, kvar: 0 } }] } as CircuitInput);
    // (P) load convention: a generator's absorbed power is negative.
    expect(r.elements['LOAD1'].power.re).toBeLessThan(-2000);
  });

  it('accepts a purely reactive impedance written polar at ±90° (rounding is not a negative resistance)', () => {
    expect(() => solveCircuit({ ...header, elements: [{ ...src, impedance: { ohms: { mag: 0.01, angleDeg: 270 } } }, load] } as CircuitInput)).not.toThrow();
    expect(() => solveCircuit({ ...header, elements: [src, { type: 'earthing', id: 'ROD1', node: 'B.n', ohms: { mag: 2, angleDeg: -90 } }, load] } as CircuitInput)).not.toThrow();
  });
});
