/** The primitives' fast validation path agrees with the zod schemas: same value (keys in the same order) when valid, never accepts what zod rejects. */
import { describe, expect, it } from 'vitest';
import { fastParsePrimitive } from '../../../../shared/engine/schema/fast-primitives.ts';
import { primitiveSchemas } from '../../../../shared/engine/schema/primitives.ts';
import { parseCircuit } from '../../../../shared/engine/schema/parse-circuit.ts';
import { radialFeeder } from '../../../bench/feeder.ts';

type El = Record<string, unknown>;
const zodParse = (el: El) => primitiveSchemas[el.type as keyof typeof primitiveSchemas].safeParse(el);

const VALID: El[] = [
  { type: 'impedance', id: 'z1', from: 'a', to: 'earth', ohms: { re: 1, im: 2 } },
  { to: 'b', ohms: 5, type: 'impedance', from: 'a', id: 'z2' }, // keys in another order, a plain number
  { type: 'impedance', id: 'z3', from: 'a', to: 'b', ohms: { mag: 3, angleDeg: -30 } },
  { type: 'voltageSource', id: 'v1', plus: 'a', minus: 'n', volts: { mag: 7200, angleDeg: 0 } },
  { type: 'voltageSource', id: 'v2', plus: 'a', minus: 'n', volts: 230, seriesOhms: { re: 0.1, im: 0.5 } },
  { type: 'currentSource', id: 'i1', from: 'a', to: 'b', amps: { re: -1, im: 0 } },
  { type: 'coupledBranch', id: 'c1', from: ['a', 'b'], to: ['c', 'd'], ohms: [[{ re: 1, im: 1 }, 0.5], [0.5, { mag: 1, angleDeg: 90 }]] },
  { type: 'coupledBranch', id: 'c2', from: ['a'], to: ['b', 'c'], ohms: [] }, // sizes are checked later, not by the schema
  { type: 'switch', id: 's1', from: 'a', to: 'b', closed: false },
  { type: 'admittanceMatrix', id: 'y1', nodes: ['a', 'b'], siemens: [[1, -1], [-1, { re: 1, im: 0 }]] },
  { type: 'zipLoad', id: 'l1', from: 'a', to: 'n', ratedVolts: 230, ratedVA: { re: 1000, im: 300 } },
  { type: 'zipLoad', id: 'l2', from: 'a', to: 'n', ratedVolts: 230, ratedVA: 500, zip: { p: 0.5, z: 0.2, i: 0.3 } },
];

const INVALID: El[] = [
  { type: 'impedance', id: '', from: 'a', to: 'b', ohms: 1 }, // empty id
  { type: 'impedance', id: 'z', from: '', to: 'b', ohms: 1 }, // empty node
  { type: 'impedance', id: 'z', from: 'a', to: 'b', ohms: 1, extra: true }, // unknown key
  { type: 'impedance', id: 'z', from: 'a', to: 'b' }, // missing value
  { type: 'impedance', id: 'z', from: 'a', to: 'b', ohms: { re: 1 } },
  { type: 'impedance', id: 'z', from: 'a', to: 'b', ohms: { re: 1, im: 2, mag: 3 } },
  { type: 'impedance', id: 'z', from: 'a', to: 'b', ohms: { mag: -1, angleDeg: 0 } },
  { type: 'impedance', id: 'z', from: 'a', to: 'b', ohms: '1' },
  { type: 'impedance', id: 7, from: 'a', to: 'b', ohms: 1 },
  { type: 'voltageSource', id: 'v', plus: 'a', minus: 'n', volts: 1, seriesOhms: null },
  { type: 'voltageSource', id: 'v', plus: 'a', volts: 1 },
  { type: 'currentSource', id: 'i', from: 'a', to: 'b', ohms: 1 },
  { type: 'coupledBranch', id: 'c', from: [], to: ['b'], ohms: [[1]] },
  { type: 'coupledBranch', id: 'c', from: ['a'], to: ['b'], ohms: [1] },
  { type: 'coupledBranch', id: 'c', from: ['a'], to: [''], ohms: [[1]] },
  { type: 'switch', id: 's', from: 'a', to: 'b', closed: 'yes' },
  { type: 'admittanceMatrix', id: 'y', nodes: ['a'], siemens: [[{ re: 1, im: 'x' }]] },
  { type: 'zipLoad', id: 'l', from: 'a', to: 'n', ratedVolts: 0, ratedVA: 1 },
  { type: 'zipLoad', id: 'l', from: 'a', to: 'n', ratedVolts: 230, ratedVA: 1, zip: { z: 1, i: 0 } },
  { type: 'zipLoad', id: 'l', from: 'a', to: 'n', ratedVolts: 230, ratedVA: 1, zip: { z: 1, i: 0, p: -0.1 } },
  { type: 'zipLoad', id: 'l', from: 'a', to: 'n', ratedVolts: 230, ratedVA: 1, zip: { z: 1, i: 0, p: 0, q: 0 } },
];

describe('fastParsePrimitive', () => {
  it('returns what the zod schema returns for valid primitives, keys in the same order', () => {
    for (const el of VALID) {
      const z = zodParse(el);
      expect(z.success, JSON.stringify(el)).toBe(true);
      const fast = fastParsePrimitive(el);
      expect(fast, JSON.stringify(el)).toStrictEqual(z.data);
      expect(JSON.stringify(fast)).toBe(JSON.stringify(z.data));
      expect(fast).not.toBe(el); // a copy, as zod's
    }
  });

  it('accepts nothing that the zod schema rejects', () => {
    for (const el of INVALID) {
      expect(zodParse(el).success, JSON.stringify(el)).toBe(false);
      expect(fastParsePrimitive(el), JSON.stringify(el)).toBeUndefined();
    }
  });

  it('leaves the plainly worded messages to zod (parseCircuit still reports the element)', () => {
    const bad = { format: 'wyeward-circuit', version: 1, frequencyHz: 50, elements: [{ type: 'impedance', id: 'z9', from: 'a', to: 'earth', ohms: { re: 1 } }] };
    expect(() => parseCircuit(bad)).toThrow(/elements\[0\]\.ohms.*z9/);
  });

  it('gives parseCircuit the same circuit as the zod schemas on a generated feeder', () => {
    const file = radialFeeder(40);
    const parsed = parseCircuit(file);
    expect(JSON.stringify(parsed.elements)).toBe(JSON.stringify(file.elements.map((el) => zodParse(el as unknown as El).data)));
  });
});
