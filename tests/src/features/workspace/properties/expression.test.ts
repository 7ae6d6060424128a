/** Unit-aware expressions in the property fields (mathjs units and parsing, complex.js values). */
import { describe, expect, it } from 'vitest';
import { parseComplex } from '../../../../../src/features/workspace/properties/complex-input.ts';
import { parseLength, parseQuantity } from '../../../../../src/features/workspace/properties/unit-input.ts';

describe('unit-aware expressions', () => {
  it('evaluates arithmetic in a quantity field', () => {
    const r = parseQuantity('208/sqrt(3)', 'voltage', 'V');
    expect(r.ok && r.value).toBeCloseTo(120.0889, 4); // (C) 208/√3
    const kv = parseQuantity('2 * 13.8 kV / 2', 'voltage', 'kV');
    expect(kv).toEqual({ ok: true, value: 13.8 });
    expect(parseQuantity('√3 * 120 V', 'voltage', 'kV')).toMatchObject({ ok: true });
  });

  it('converts units and refuses another kind by name', () => {
    expect(parseQuantity('1500 ft', 'length', 'm')).toMatchObject({ ok: true, value: expect.closeTo(457.2, 9) });
    expect(parseQuantity('1500 ft + 1 m', 'voltage', 'kV')).toEqual({ ok: false, message: '“1500 ft + 1 m” is a length; this field takes V or kV.' });
  });

  it('is case-sensitive where case means a factor of 10⁹: MΩ is mega, mW is refused in a kW field', () => {
    expect(parseQuantity('2 MΩ', 'impedance', 'Ω')).toEqual({ ok: true, value: 2e6 });
    expect(parseQuantity('2 mΩ', 'impedance', 'Ω')).toEqual({ ok: true, value: 0.002 });
    expect(parseQuantity('3 mw', 'power', 'kW')).toEqual({ ok: false, message: '“mw” would be milli-; write MW if you mean mega-.' });
    expect(parseQuantity('3 MW', 'power', 'kW')).toEqual({ ok: true, value: 3000 });
    expect(parseQuantity('13.8 kv', 'voltage', 'kV')).toEqual({ ok: true, value: 13.8 });
  });

  it('reads a length expression in the unit it ends with', () => {
    expect(parseLength('1500 ft', 'km')).toEqual({ ok: true, value: { length: 1500, unit: 'ft' } });
    const r = parseLength('0.5 mi + 200 m', 'km');
    expect(r.ok && r.value.unit).toBe('m');
    expect(r.ok && r.value.length).toBeCloseTo(1004.672, 6); // (C) 804.672 m + 200 m
  });

  it('reads complex impedances with expressions and Ω per length', () => {
    expect(parseComplex('208/sqrt(3)∠-30')).toMatchObject({ ok: true, value: { mag: expect.closeTo(120.0889, 4), angleDeg: -30 } });
    expect(parseComplex('120∠-30')).toEqual({ ok: true, value: { mag: 120, angleDeg: -30 } });
    expect(parseComplex('0.19+j0.38')).toEqual({ ok: true, value: { re: 0.19, im: 0.38 } });
    expect(parseComplex('(0.19+j0.38)*2')).toMatchObject({ ok: true, value: { re: expect.closeTo(0.38, 12), im: expect.closeTo(0.76, 12) } });
    // 0.19 Ω/km typed into a field of data per m is 0.00019 Ω/m; per mile it is 0.305775 Ω/mi.
    expect(parseComplex('0.19 ohm/km', 'm')).toMatchObject({ ok: true, value: expect.closeTo(0.00019, 12) });
    expect(parseComplex('0.19+j0.38 Ω/km', 'mi')).toMatchObject({ ok: true, value: { re: expect.closeTo(0.19 * 1.609344, 9), im: expect.closeTo(0.38 * 1.609344, 9) } });
    expect(parseComplex('0.05 Ω/1000 ft', 'km')).toMatchObject({ ok: true, value: expect.closeTo(0.05 / 0.3048, 9) });
    expect(parseComplex('5 mΩ')).toEqual({ ok: true, value: 0.005 });
  });

  it('never reads a volt or an ampere as an ohm, nor a per-length value as an impedance', () => {
    expect(parseComplex('120 V')).toMatchObject({ ok: false, message: expect.stringContaining('is not an impedance') });
    expect(parseComplex('0.19 ohm/km')).toMatchObject({ ok: false, message: expect.stringContaining('per length') });
  });
});
