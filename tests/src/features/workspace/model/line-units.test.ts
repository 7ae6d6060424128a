/** A line's two units convert independently (pure functions). */
import { describe, expect, it } from 'vitest';
import { withLength, withLengthUnit, withPerLengthUnit, type LineInput } from '../../../../../src/features/workspace/model/line-units.ts';

const line: LineInput = { type: 'line', id: 'L1', from: 'A', to: 'B', length: 0.8, lengthUnit: 'km', impedance: { kind: 'perConductor', ohmsPerLength: { a: { re: 0.19, im: 0.38 }, n: { mag: 0.5, angleDeg: 60 } } } };

describe('line units', () => {
  it('length unit: 0.8 km ↔ 800 m ↔ 2624.67 ft, per-length data untouched and stated per km', () => {
    const m = withLengthUnit(line, 'm');
    expect(m.length).toBeCloseTo(800, 9);
    expect(m).toMatchObject({ lengthUnit: 'm', perLengthUnit: 'km', impedance: line.impedance });
    const ft = withLengthUnit(m, 'ft');
    expect(ft.length).toBeCloseTo(2624.671916, 5); // (C) 800 / 0.3048
    expect(withLengthUnit(ft, 'km').length).toBeCloseTo(0.8, 12);
  });
  it('typing a length in another unit keeps the data’s unit', () => {
    expect(withLength(line, 800, 'm')).toMatchObject({ length: 800, lengthUnit: 'm', perLengthUnit: 'km' });
  });
  it('per-length unit: Ω/km → Ω/1000 ft scales rectangular and polar values', () => {
    const k = withPerLengthUnit(line, 'kft');
    expect(k.perLengthUnit).toBe('kft');
    const imp = k.impedance as Extract<LineInput['impedance'], { kind: 'perConductor' }>;
    expect((imp.ohmsPerLength.a as { re: number }).re).toBeCloseTo(0.19 * 0.3048, 12);
    expect(imp.ohmsPerLength.n).toEqual({ mag: 0.5 * 0.3048, angleDeg: 60 });
    expect(k.length).toBe(0.8);
  });
});
