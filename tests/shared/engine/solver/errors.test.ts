/**
 * Ill-posed and invalid networks: each gets its typed error, with the exact message naming the
 * elements and nodes a user can fix. None may crash or return non-finite numbers.
 */
import { describe, expect, it } from 'vitest';
import { IllPosedNetworkError, InvalidCircuitError, type EngineError } from '../../../../shared/engine/errors.ts';
import { solvePrimitives } from '../../../../shared/engine/solver/index.ts';
import type { Primitive } from '../../../../shared/engine/types.ts';
import { polar } from '../helpers/invariants.ts';

function failure(prims: unknown[]): EngineError {
  try {
    solvePrimitives(prims as Primitive[]);
  } catch (e) {
    return e as EngineError;
  }
  throw new Error('expected the solve to fail');
}

const V = (id: string, plus: string, minus: string, re: number, im = 0): Primitive => ({ type: 'voltageSource', id, plus, minus, volts: { re, im } });
const R = (id: string, from: string, to: string, re: number, im = 0): Primitive => ({ type: 'impedance', id, from, to, ohms: { re, im } });

describe('ill-posed networks are rejected before factoring', () => {
  it('two ideal sources in parallel with different voltages', () => {
    const e = failure([V('V1', 'a', 'earth', 120), V('V2', 'a', 'earth', 118), R('R', 'a', 'earth', 10)]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.code).toBe('ill-posed-network');
    expect(e.message).toBe(
      "Ideal voltage sources 'V1', 'V2' form a loop with no series impedance: their voltages disagree by 2 V ∠0° around the loop, which no current can satisfy. Give one of them a series impedance or remove one.",
    );
    expect(e.elementIds).toEqual(['V1', 'V2']);
    expect(e.nodes).toEqual(['a', 'earth']);
  });

  it('two equal ideal sources in parallel are still ill-posed, and the message says so', () => {
    const e = failure([V('V1', 'a', 'earth', 120), V('V2', 'a', 'earth', 120), R('R', 'a', 'earth', 10)]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toBe(
      "Ideal voltage sources 'V1', 'V2' form a loop with no series impedance: their voltages agree around the loop, but the current circulating between them is still undetermined. Give one of them a series impedance or remove one.",
    );
  });

  it('a delta of three ideal sources (a loop) is ill-posed even when balanced', () => {
    const e = failure([
      { type: 'voltageSource', id: 'Vab', plus: 'a', minus: 'b', volts: polar(240, 30) },
      { type: 'voltageSource', id: 'Vbc', plus: 'b', minus: 'c', volts: polar(240, -90) },
      { type: 'voltageSource', id: 'Vca', plus: 'c', minus: 'a', volts: polar(240, 150) },
    ]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.elementIds.sort()).toEqual(['Vab', 'Vbc', 'Vca']);
    expect(e.message).toContain('their voltages agree around the loop');
  });

  it('a source shorted by a closed switch', () => {
    const e = failure([V('V1', 'a', 'earth', 120), R('R', 'a', 'earth', 10), { type: 'switch', id: 'S1', from: 'a', to: 'earth', closed: true }]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toBe("Voltage source 'V1' is shorted by closed switch 'S1' (nodes 'a' and 'earth' joined with no impedance).");
    expect(e.elementIds).toEqual(['V1', 'S1']);
  });

  it('a source shorted through two closed switches in series', () => {
    const e = failure([
      V('V1', 'a', 'b', 120),
      { type: 'switch', id: 'S1', from: 'a', to: 'm', closed: true },
      { type: 'switch', id: 'S2', from: 'm', to: 'b', closed: true },
      R('R', 'a', 'earth', 10),
    ]);
    expect(e.message).toBe("Voltage source 'V1' is shorted by closed switches 'S1', 'S2' (nodes 'a' and 'b' joined with no impedance).");
  });

  it('an open switch does not short anything', () => {
    const sol = solvePrimitives([V('V1', 'a', 'earth', 120), R('R', 'a', 'earth', 10), { type: 'switch', id: 'S1', from: 'a', to: 'earth', closed: false }]);
    expect(sol.elementCurrents.get('S1')).toEqual([{ re: 0, im: 0 }]);
  });

  it('closed switches in parallel (a loop with no impedance and no source)', () => {
    const e = failure([
      { ...V('V1', 'a', 'earth', 120), seriesOhms: { re: 1, im: 0 } },
      { type: 'switch', id: 'S1', from: 'a', to: 'b', closed: true },
      { type: 'switch', id: 'S2', from: 'b', to: 'a', closed: true },
      R('R', 'b', 'earth', 10),
    ]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toBe(
      "Closed switches 'S1', 'S2' form a loop with no impedance: the current division between them is undefined (open one of them or give the path an impedance).",
    );
  });

  it('a current source with nowhere to flow (its far end touches nothing else)', () => {
    const e = failure([V('V1', 'a', 'earth', 120), R('R', 'a', 'earth', 10), { type: 'currentSource', id: 'J1', from: 'a', to: 'x', amps: { re: 1, im: 0 } }]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toBe("Current source 'J1' drives a net 1 A into node 'x', which has no other connection to the network: the current has nowhere to flow.");
    expect(e.elementIds).toEqual(['J1']);
    expect(e.nodes).toEqual(['x']);
  });

  it('a current source feeding a floating part whose only other link is an open switch', () => {
    const e = failure([
      V('V1', 'a', 'earth', 120),
      R('R', 'a', 'earth', 10),
      { type: 'currentSource', id: 'J1', from: 'earth', to: 'x', amps: { re: 0, im: 2 } },
      R('Rx', 'x', 'y', 5),
      { type: 'switch', id: 'S', from: 'y', to: 'a', closed: false },
    ]);
    expect(e.message).toBe("Current source 'J1' drives a net 2 A into nodes 'x', 'y', which have no other connection to the network: the current has nowhere to flow.");
  });

  it('a current source into a part that floats behind a transformer stamp (found numerically)', () => {
    const a = 0.5;
    const w = [1, -1, -a, a];
    const e = failure([
      V('V1', 'p', 'earth', 230),
      { type: 'admittanceMatrix', id: 'T', nodes: ['p', 'earth', 's1', 's2'], siemens: w.map((x) => w.map((y) => ({ re: x * y, im: -5 * x * y }))) },
      R('RL', 's1', 's2', 10),
      { type: 'currentSource', id: 'J', from: 'earth', to: 's1', amps: { re: 2, im: 0 } },
    ]);
    expect(e).toBeInstanceOf(IllPosedNetworkError);
    expect(e.message).toBe(
      "A net current of 2 A is driven into the floating part 's1', 's2', which is coupled to the rest only magnetically (admittance stamps): the current has nowhere to flow.",
    );
    expect(e.nodes).toEqual(['s1', 's2']);
  });

  it('two current sources in a cut set that balance each other are accepted (the island floats)', () => {
    const sol = solvePrimitives([
      V('V1', 'a', 'earth', 120),
      R('R', 'a', 'earth', 10),
      { type: 'currentSource', id: 'J1', from: 'a', to: 'x', amps: { re: 1, im: 0 } },
      { type: 'currentSource', id: 'J2', from: 'x', to: 'a', amps: { re: 1, im: 0 } },
      R('Rx', 'x', 'x.n', 5),
    ]);
    // the documented rule: a node whose last name segment is "n" is preferred as the reference
    expect(sol.floating).toEqual([{ nodes: ['x', 'x.n'], referenceNode: 'x.n' }]);
  });
});

describe('invalid primitives get an InvalidCircuitError naming the element and field', () => {
  const cases: [string, unknown[], string, string][] = [
    ['NaN impedance', [{ type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: NaN, im: 0 } }], "Invalid circuit: element 'R': impedance 'ohms' must be finite (got NaN + j0)", 'elements[0].ohms'],
    ['infinite voltage', [{ type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: Infinity, im: 0 } }], "Invalid circuit: element 'V': 'volts' must be finite (got Infinity + j0)", 'elements[0].volts'],
    ['zero impedance', [{ type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: 0, im: 0 } }], "Invalid circuit: element 'R' has zero impedance (use a closed switch for a direct connection)", 'elements[0].ohms'],
    [
      'duplicate id',
      [
        { type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: 1, im: 0 } },
        { type: 'impedance', id: 'R', from: 'a', to: 'b', ohms: { re: 1, im: 0 } },
      ],
      "Invalid circuit: duplicate element id 'R'",
      'elements[1].id',
    ],
    ['unknown type', [{ type: 'resistor', id: 'R', from: 'a', to: 'earth' }], "Invalid circuit: element 'R' has unknown type 'resistor'", 'elements[0].type'],
    ['missing node in a switch', [{ type: 'switch', id: 'S', from: '', to: 'earth', closed: true }], "Invalid circuit: element 'S': 'from' must be a non-empty node name", 'elements[0].from'],
    ['element tied to itself', [{ type: 'impedance', id: 'R', from: 'a', to: 'a', ohms: { re: 1, im: 0 } }], "Invalid circuit: element 'R' connects node 'a' to itself", 'elements[0].to'],
    [
      'an impedance too small to invert',
      [{ type: 'impedance', id: 'R', from: 'a', to: 'earth', ohms: { re: 1e-320, im: 0 } }],
      "Invalid circuit: element 'R': impedance 'ohms' is too small to invert (got 1e-320 + j0; use a closed switch for a direct connection)",
      'elements[0].ohms',
    ],
    [
      'a value out of range',
      [{ type: 'currentSource', id: 'J', from: 'earth', to: 'a', amps: { re: 1e300, im: 0 } }],
      "Invalid circuit: element 'J': 'amps' is out of range (got 1e+300 + j0; at most 1e100 in magnitude)",
      'elements[0].amps',
    ],
    [
      'coupled branch of the wrong size',
      [{ type: 'coupledBranch', id: 'K', from: ['a', 'b'], to: ['c', 'd'], ohms: [[{ re: 1, im: 1 }]] }],
      "Invalid circuit: element 'K': 'ohms' must be a 2×2 matrix",
      'elements[0].ohms',
    ],
    [
      'zip fractions not summing to 1',
      [{ type: 'zipLoad', id: 'L', from: 'a', to: 'earth', ratedVolts: 230, ratedVA: { re: 1000, im: 0 }, zip: { z: 0.5, i: 0.2, p: 0.2 } }],
      "Invalid circuit: element 'L': zip fractions must sum to 1 (got 0.9)",
      'elements[0].zip',
    ],
    [
      'non-positive rated voltage',
      [{ type: 'zipLoad', id: 'L', from: 'a', to: 'earth', ratedVolts: 0, ratedVA: { re: 1000, im: 0 }, zip: { z: 1, i: 0, p: 0 } }],
      "Invalid circuit: element 'L': 'ratedVolts' must be a positive finite number of volts",
      'elements[0].ratedVolts',
    ],
  ];
  for (const [title, prims, message, path] of cases) {
    it(title, () => {
      const e = failure(prims);
      expect(e).toBeInstanceOf(InvalidCircuitError);
      expect(e.code).toBe('invalid-circuit');
      expect(e.message).toBe(message);
      expect((e as InvalidCircuitError).issues[0].path).toBe(path);
    });
  }

  it('a coupled branch with a singular impedance matrix', () => {
    const z = { re: 1, im: 1 };
    const e = failure([
      { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: 1, im: 0 } },
      { type: 'coupledBranch', id: 'K', from: ['a', 'b'], to: ['c', 'd'], ohms: [[z, z], [z, z]] },
    ]);
    expect(e).toBeInstanceOf(InvalidCircuitError);
    expect(e.message).toBe("Invalid circuit: coupled branch 'K' has a singular impedance matrix (a conductor with zero impedance?); use switches for direct connections");
    expect(e.elementIds).toEqual(['K']);
  });

  it('several problems: the first is in the message and all are listed', () => {
    const e = failure([
      { type: 'impedance', id: 'R1', from: 'a', to: 'earth', ohms: { re: NaN, im: 0 } },
      { type: 'impedance', id: 'R2', from: 'a', to: 'earth', ohms: { re: 1, im: Infinity } },
    ]) as InvalidCircuitError;
    expect(e.message).toBe("Invalid circuit: element 'R1': impedance 'ohms' must be finite (got NaN + j0) (and 1 more problem)");
    expect(e.issues.map((i) => i.path)).toEqual(['elements[0].ohms', 'elements[1].ohms']);
    expect(e.elementIds).toEqual(['R1', 'R2']);
  });

  it('not an array / not an object never crashes', () => {
    expect(failure([null])).toBeInstanceOf(InvalidCircuitError);
    expect(failure([42])).toBeInstanceOf(InvalidCircuitError);
    expect(() => solvePrimitives('x' as unknown as Primitive[])).toThrow(InvalidCircuitError);
  });
});
