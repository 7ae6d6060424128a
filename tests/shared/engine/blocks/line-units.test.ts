/**
 * A line's length and its per-length data carry their own units (issue 8, point 1): the same line
 * written in m, km, ft or mi, with data per km, per m, per mile or per 1000 ft, solves to the same
 * far-bus voltage; a file without `perLengthUnit` keeps its old meaning (data per `lengthUnit`).
 */
import { describe, expect, it } from 'vitest';
import { demoCircuits, type CircuitInput } from '../../../../shared/engine/index.ts';
import { solveChecked } from '../solve-checked.ts';

const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
type Line = Extract<CircuitInput['elements'][number], { type: 'line' }>;

/** The delta–wye demo with its 0.8 km tap line replaced by `line` (other fields kept). */
function withTap(change: Partial<Line>): CircuitInput {
  return { ...demo, elements: demo.elements.map((e) => (e.type === 'line' && e.id === 'PM-TAP' ? ({ ...e, ...change } as Line) : e)) };
}

function farBusVolts(c: CircuitInput): number {
  return solveChecked(c).buses.find((b) => b.bus === 'PMT')!.lineToNeutral.a.mag;
}

const z = (k: number) => ({ kind: 'sequence' as const, z1PerLength: { re: 0.19 * k, im: 0.38 * k }, z0PerLength: { re: 0.48 * k, im: 1.25 * k } });

describe('line length and per-length units are independent', () => {
  const reference = farBusVolts(demo);

  it('the demo tap is 0.8 km of 0.19+j0.38 Ω/km: the far bus sits near 7.2 kV to neutral', () => {
    // (C) 12.47 kV / √3 = 7.20 kV less a small drop over 0.8 km.
    expect(reference).toBeGreaterThan(7000);
    expect(reference).toBeLessThan(7200);
  });

  it.each<[string, Partial<Line>]>([
    ['800 m, data per km', { length: 800, lengthUnit: 'm', perLengthUnit: 'km' }],
    ['2624.67 ft, data per km', { length: 0.8 / 0.0003048, lengthUnit: 'ft', perLengthUnit: 'km' }],
    ['0.8 km, data per m', { length: 0.8, lengthUnit: 'km', perLengthUnit: 'm', impedance: z(1 / 1000) }],
    ['800 m, data per m (default per-length unit = length unit)', { length: 800, lengthUnit: 'm', impedance: z(1 / 1000) }],
    ['0.8 km, data per mile', { length: 0.8, lengthUnit: 'km', perLengthUnit: 'mi', impedance: z(1.609344) }],
    ['2624.67 ft, data per 1000 ft', { length: 0.8 / 0.0003048, lengthUnit: 'ft', perLengthUnit: 'kft', impedance: z(0.3048) }],
    ['0.497 mi, data per km', { length: 0.8 / 1.609344, lengthUnit: 'mi', perLengthUnit: 'km' }],
  ])('%s: far-bus voltage unchanged to 0.01 %%', (_, change) => {
    const v = farBusVolts(withTap(change));
    expect(Math.abs(v - reference) / reference).toBeLessThan(1e-4);
  });

  it('without perLengthUnit, changing only lengthUnit still means data per that unit (old files keep their meaning)', () => {
    // 800 "m" of 0.19 Ω per m is 1000× the ohms: the far bus drops well below the reference (the symptom).
    const v = farBusVolts(withTap({ length: 800, lengthUnit: 'm' }));
    expect(v).toBeLessThan(reference * 0.9);
  });

  it('shunt data follow perLengthUnit too', () => {
    const shunt = (k: number) => ({ siemensPerLength: [0, 1, 2].map((i) => [0, 1, 2].map((j) => (i === j ? { re: 0, im: 3e-6 * k } : { re: 0, im: -0.5e-6 * k }))) });
    const a = farBusVolts(withTap({ shunt: shunt(1), impedance: { ...z(1) } }));
    const b = farBusVolts(withTap({ length: 800, lengthUnit: 'm', perLengthUnit: 'km', shunt: shunt(1) }));
    const c = farBusVolts(withTap({ length: 800, lengthUnit: 'm', impedance: z(1 / 1000), shunt: shunt(1 / 1000) }));
    expect(Math.abs(b - a) / a).toBeLessThan(1e-9);
    expect(Math.abs(c - a) / a).toBeLessThan(1e-9);
  });

  it('Carson data stay in their own units (ft, Ω/mile) whatever perLengthUnit says', () => {
    const geometry = {
      kind: 'carson' as const,
      conductors: [
        { conductor: 'a' as const, xFt: 0, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'b' as const, xFt: 2.5, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'c' as const, xFt: 7, yFt: 28, gmrFt: 0.0244, rOhmsPerMile: 0.306 },
        { conductor: 'n' as const, xFt: 4, yFt: 24, gmrFt: 0.00814, rOhmsPerMile: 0.592 },
      ],
    };
    const a = farBusVolts(withTap({ impedance: geometry }));
    const b = farBusVolts(withTap({ impedance: geometry, length: 800, lengthUnit: 'm', perLengthUnit: 'kft' }));
    expect(Math.abs(b - a) / a).toBeLessThan(1e-9);
  });
});
