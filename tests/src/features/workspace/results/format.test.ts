import { describe, expect, it } from 'vitest';
import { formatAngle, formatMagnitude, formatPhasor, formatPowerFactor, formatTick } from '../../../../../src/features/workspace/results/format.ts';

describe('results formatting', () => {
  it('shows magnitudes to a tenth above 10 and to three or four figures below', () => {
    expect(formatMagnitude(56.8412)).toBe('56.8');
    expect(formatMagnitude(7199.56)).toBe('7199.6');
    expect(formatMagnitude(123456.7)).toBe('123457');
    expect(formatMagnitude(3.456)).toBe('3.46');
    expect(formatMagnitude(0.01234)).toBe('0.012');
    expect(formatMagnitude(0)).toBe('0');
    expect(formatMagnitude(4.13e-12)).toBe('0'); // solver rounding noise, not a current
  });
  it('writes axis ticks in their shortest exact form', () => {
    expect([50, 2.5, 0.25, 8000, 0.1 + 0.2].map(formatTick)).toEqual(['50', '2.5', '0.25', '8000', '0.3']);
  });
  it('writes angles with a true minus sign and no negative zero', () => {
    expect(formatAngle(-2.14)).toBe('−2.1°');
    expect(formatAngle(-0.01)).toBe('0.0°');
    expect(formatAngle(150)).toBe('150.0°');
  });
  it('writes a phasor as RMS magnitude, unit, ∠degrees', () => {
    expect(formatPhasor({ re: 0, im: 0, mag: 141.58, angleDeg: -2.14 }, 'V')).toBe('141.6 V∠−2.1°');
    expect(formatPhasor(undefined, 'A')).toBe('—');
    expect(formatPhasor({ re: 1e-13, im: 0, mag: 1e-13, angleDeg: 52.1 }, 'A')).toBe('0 A');
  });
  it('gives the power factor with its sense in load convention (Q > 0 lagging)', () => {
    expect(formatPowerFactor({ re: 800, im: 600, mag: 1000, angleDeg: 36.87 })).toBe('0.800 lagging');
    expect(formatPowerFactor({ re: 800, im: -600, mag: 1000, angleDeg: -36.87 })).toBe('0.800 leading');
    expect(formatPowerFactor({ re: 1000, im: 0, mag: 1000, angleDeg: 0 })).toBe('1.000');
  });
});
