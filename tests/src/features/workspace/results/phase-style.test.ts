import { describe, expect, it } from 'vitest';
import { lnLabel, phaseStyle } from '../../../../../src/features/workspace/results/phase-style.ts';

describe('phaseStyle', () => {
  it('IEC 60445: L1 brown, L2 black, L3 grey, N blue (V: IEC 60445 colour list)', () => {
    expect(['a', 'b', 'c', 'n'].map((p) => [phaseStyle(p, 'iec-60445').label, phaseStyle(p, 'iec-60445').colorName])).toEqual([
      ['L1', 'brown'],
      ['L2', 'black'],
      ['L3', 'grey'],
      ['N', 'blue'],
    ]);
  });
  it('North American practice: A black, B red, C blue, N white/grey (P)', () => {
    expect(['a', 'b', 'c', 'n'].map((p) => [phaseStyle(p, 'north-american').label, phaseStyle(p, 'north-american').colorName])).toEqual([
      ['A', 'black'],
      ['B', 'red'],
      ['C', 'blue'],
      ['N', 'white/grey'],
    ]);
  });
  it('never relies on colour alone: the four conductors have four different dash patterns and labels', () => {
    for (const std of ['iec-60445', 'north-american'] as const) {
      const s = ['a', 'b', 'c', 'n'].map((p) => phaseStyle(p, std));
      expect(new Set(s.map((x) => x.dash)).size).toBe(4);
      expect(new Set(s.map((x) => x.label)).size).toBe(4);
    }
  });
  it('labels split-phase legs and line-to-line pairs', () => {
    expect(phaseStyle('1', 'north-american').label).toBe('L1');
    expect(phaseStyle('2', 'iec-60445').color).toBe(phaseStyle('b', 'iec-60445').color);
    expect(phaseStyle('ab', 'iec-60445').label).toBe('L1–L2');
    expect(phaseStyle('ca', 'north-american').label).toBe('C–A');
    expect(phaseStyle('12', 'north-american').label).toBe('L1–L2');
    expect(lnLabel('c', 'north-american')).toBe('C–N');
    expect(lnLabel('a', 'iec-60445', 'earth')).toBe('L1–E');
  });
  it('gives an unknown conductor its own name rather than a phase colour', () => {
    expect(phaseStyle('x', 'iec-60445')).toMatchObject({ label: 'x', dash: '' });
  });
});
