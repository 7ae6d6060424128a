import { describe, expect, it } from 'vitest';
import { formatVolts, formatWait, plural } from '../../../src/lib/format.ts';

describe('formatVolts', () => {
  it('shows volts below 1 kV and kilovolts from 1 kV, always with the unit', () => {
    expect(formatVolts(120)).toBe('120 V');
    expect(formatVolts(208)).toBe('208 V');
    expect(formatVolts(480)).toBe('480 V');
    expect(formatVolts(12470)).toBe('12.47 kV');
    expect(formatVolts(7200)).toBe('7.2 kV');
    // Float noise from kV × 1000 does not leak into the text.
    expect(formatVolts(0.208 * 1000)).toBe('208 V');
    expect(formatVolts(12.47 * 1000)).toBe('12.47 kV');
  });
});

describe('formatWait', () => {
  it('words a retry wait in seconds under a minute and whole minutes (rounded up) above', () => {
    expect(formatWait(0.2)).toBe('1 second');
    expect(formatWait(45)).toBe('45 seconds');
    expect(formatWait(60)).toBe('1 minute');
    expect(formatWait(61)).toBe('2 minutes');
    expect(formatWait(891)).toBe('15 minutes');
    expect(formatWait(900)).toBe('15 minutes');
  });
});

describe('plural', () => {
  it('picks the singular only for exactly one', () => {
    expect(plural(1, 'study', 'studies')).toBe('1 study');
    expect(plural(0, 'study', 'studies')).toBe('0 studies');
    expect(plural(3, 'element')).toBe('3 elements');
  });
});
