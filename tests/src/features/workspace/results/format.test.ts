import { describe, expect, it } from 'vitest';
import { formatAngle, formatMagnitude, formatPhasor, formatPowerFactor } from '../../../../../src/features/workspace/results/format.ts';

describe('results formatting', () => {
  it('shows magnitudes to a tenth above 10 and to three or four figures below', () => {
    expect(formatMagnitude(56.8412)).toBe('56.8');
    expect(formatMagnitude(7199.56)).toBe('7199.6');
    expect(formatMagnitude(123456.7)).toBe('123457');
    expect(formatMagnitude(3.456)).toBe('3.46');
    expect(formatMagnitude(0.01234)).toBe('0.012');
    expect(formatMagnitude(0)).toBe('0');
  });
  it('writes angles with a true minus sign and no negative zero', () => {
    expect(formatAngle(-2.14)).toBe('−2.1°');
    expect(formatAngle(-0.01)).toBe('0.0°');
    expect(formatAngle(150)).toBe('150.0°');
  });
  it('writes a phasor as RMS magnitude, unit, ∠degrees', () => {
    expect(formatPhasor({ re: 0, im: 0, mag: 141.58, angleDeg: -2.14 }, 'V')).toBe('141.6 V∠−2.1°');
    expect(formatPhasor(undefined, 'A')).toBe('—');
  });
  it('gives the power factor with its sense in load convention (Q > 0 lagging)', () => {
    expect(formatPowerFactor({ re: 800, im: 600, mag: 1000, angleDeg: 36.87 })).toBe('0.800 lagging');
    expect(formatPowerFactor({ re: 800, im: -600, mag: 1000, angleDeg: -36.87 })).toBe('0.800 leading');
    expect(formatPowerFactor({ re: 1000, im: 0, mag: 1000, angleDeg: 0 })).toBe('1.000');
  });
});
