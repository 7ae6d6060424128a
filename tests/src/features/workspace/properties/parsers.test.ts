import { describe, expect, it } from 'vitest';
import { formatComplex, parseComplex } from '../../../../../src/features/workspace/properties/complex-input.ts';
import { formatQuantity, parseLength, parseQuantity } from '../../../../../src/features/workspace/properties/unit-input.ts';

describe('parseComplex', () => {
  it.each([
    ['0.8+j1.5', { re: 0.8, im: 1.5 }],
    ['3-j4', { re: 3, im: -4 }],
    ['3 - j4 Ω', { re: 3, im: -4 }],
    ['1.2 - 0.4j', { re: 1.2, im: -0.4 }],
    ['j2', { re: 0, im: 2 }],
    ['-j0.5', { re: 0, im: -0.5 }],
    ['2+j', { re: 2, im: 1 }],
    ['1e-3+j2e-3', { re: 0.001, im: 0.002 }],
  ])('reads %s as rectangular', (text, value) => {
    expect(parseComplex(text)).toEqual({ ok: true, value });
  });

  it.each([
    ['120∠-30', { mag: 120, angleDeg: -30 }],
    ['120@-30', { mag: 120, angleDeg: -30 }],
    ['120 ∠ 30°', { mag: 120, angleDeg: 30 }],
    ['69.3/_90', { mag: 69.3, angleDeg: 90 }],
  ])('reads %s as polar in degrees', (text, value) => {
    expect(parseComplex(text)).toEqual({ ok: true, value });
  });

  it('reads a plain number as a real value', () => {
    expect(parseComplex('14.4')).toEqual({ ok: true, value: 14.4 });
    expect(parseComplex('−2')).toEqual({ ok: true, value: -2 });
  });

  it('refuses nonsense and negative magnitudes in plain words', () => {
    expect(parseComplex('abc')).toEqual({ ok: false, message: '“abc” is not a complex value. Write it as R+jX (e.g. 0.8+j1.5, 3-j4) or magnitude∠angle in degrees (e.g. 120∠-30 or 120@-30), optionally with Ω.' });
    expect(parseComplex('3+4')).toMatchObject({ ok: false });
    expect(parseComplex('-5∠10')).toEqual({ ok: false, message: 'A magnitude cannot be negative; add 180° to the angle instead.' });
    expect(parseComplex('  ')).toMatchObject({ ok: false });
  });

  it('formats back in the form it was stored', () => {
    expect(formatComplex({ re: 3, im: -4 })).toBe('3-j4');
    expect(formatComplex({ mag: 120, angleDeg: -30 })).toBe('120∠-30');
    expect(formatComplex(0.00054)).toBe('0.00054');
    for (const t of ['0.8+j1.5', '3-j4', '120∠-30']) {
      const p = parseComplex(t);
      expect(p.ok && formatComplex(p.value)).toBe(t);
    }
  });
});

describe('parseQuantity', () => {
  it('converts typed units to the field’s base unit', () => {
    expect(parseQuantity('13800 V', 'voltage', 'kV')).toEqual({ ok: true, value: 13.8 });
    expect(parseQuantity('13.8 kV', 'voltage', 'kV')).toEqual({ ok: true, value: 13.8 });
    expect(parseQuantity('208', 'voltage', 'kV')).toEqual({ ok: true, value: 208 });
    expect(parseQuantity('1.2 MVA', 'apparent', 'kVA')).toEqual({ ok: true, value: 1200 });
    expect(parseQuantity('500 W', 'power', 'kW')).toEqual({ ok: true, value: 0.5 });
    expect(parseQuantity('-20 kvar', 'reactive', 'kvar')).toEqual({ ok: true, value: -20 });
    expect(parseQuantity('5 %', 'percent', '%')).toEqual({ ok: true, value: 5 });
    expect(parseQuantity('25 Ω', 'impedance', 'Ω')).toEqual({ ok: true, value: 25 });
    expect(parseQuantity('250 mΩ', 'impedance', 'Ω')).toEqual({ ok: true, value: 0.25 });
    const ft = parseQuantity('1000 ft', 'length', 'm');
    expect(ft.ok && ft.value).toBeCloseTo(304.8, 9); // 1 ft = 0.3048 m exactly (P)
  });

  it('refuses a unit of another dimension by name', () => {
    expect(parseQuantity('4 kvar', 'power', 'kW')).toEqual({ ok: false, message: '“kvar” is not a unit of power; use W, kW or MW.' });
    expect(parseQuantity('four', 'power', 'kW')).toEqual({ ok: false, message: '“four” is not a number or an expression with units (W, kW or MW), e.g. 208/sqrt(3) or 13.8 kV.' });
  });

  it('keeps a line’s length with the unit typed', () => {
    expect(parseLength('30 m', 'km')).toEqual({ ok: true, value: { length: 30, unit: 'm' } });
    expect(parseLength('1.2 mile', 'km')).toEqual({ ok: true, value: { length: 1.2, unit: 'mi' } });
    expect(parseLength('150ft', 'km')).toEqual({ ok: true, value: { length: 150, unit: 'ft' } });
    expect(parseLength('0.8', 'km')).toEqual({ ok: true, value: { length: 0.8, unit: 'km' } });
    expect(parseLength('3 furlongs', 'km')).toMatchObject({ ok: false });
  });

  it('formats a value with its unit', () => {
    expect(formatQuantity(0.208, 'kV')).toBe('0.208 kV');
    expect(formatQuantity(5, '%')).toBe('5 %');
  });
});

describe('setPath', () => {
  it('clears an optional nested value without leaving an empty object behind', async () => {
    const { setPath } = await import('../../../../../src/features/workspace/properties/fields.ts');
    const a: Record<string, unknown> = { kvLL: 1 };
    setPath(a, 'impedance.ohms', undefined);
    expect(a).toEqual({ kvLL: 1 });
    const b: Record<string, unknown> = { impedance: { ohms: 2 } };
    setPath(b, 'impedance.ohms', undefined);
    expect(b).toEqual({});
    setPath(b, 'phases.a.kw', 3);
    expect(b).toEqual({ phases: { a: { kw: 3 } } });
  });
});
