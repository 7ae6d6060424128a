/** The one number format of results: per-unit values keep three significant figures when small. */
import { describe, expect, it } from 'vitest';
import { formatPu } from '../../../shared/report/format.ts';

describe('formatPu', () => {
  it('writes values near 1 pu to three decimals', () => {
    expect(formatPu(1.3932)).toBe('1.393');
    expect(formatPu(0.57294)).toBe('0.573');
    expect(formatPu(-0.25)).toBe('-0.250');
    expect(formatPu(0.1)).toBe('0.100');
  });

  it('keeps three significant figures of a small value instead of rounding it to 0.000', () => {
    // 14.9 A on I_base = 1 MVA / (√3 · 0.208 kV) = 2775.7 A (C)
    expect(formatPu(14.9 / (1e6 / (Math.sqrt(3) * 208)))).toBe('0.00537');
    // 0.485 kvar on 1 MVA (C)
    expect(formatPu(0.485 / 1000)).toBe('0.000485');
    expect(formatPu(-0.0034)).toBe('-0.00340');
    expect(formatPu(0.09996)).toBe('0.100'); // rounds up into the three-decimal range
    expect(formatPu(0.0999)).toBe('0.0999');
  });

  it('writes rounding noise of the solve as zero', () => {
    expect(formatPu(4e-7)).toBe('0.000');
    expect(formatPu(0)).toBe('0.000');
  });
});
