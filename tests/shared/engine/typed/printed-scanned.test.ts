/**
 * The typed path of primitive-only files (shared/engine/typed) against the general path
 * (JSON.parse → prepareCircuit → solvePrimitives → printedPrimitiveResults): the same node
 * names, element ids and types, and every voltage and current the same double (Object.is: to the
 * last bit and the sign of zero), the same totals and flags, on seeded files of every accepted
 * shape; and undefined (the general path takes over) on parts it does not solve.
 */
import { describe, expect, it } from 'vitest';
import { prepareCircuit, printedPrimitiveResultOfText, printedPrimitiveResults, solvePrimitives, type PrintedPrimitiveResult } from '../../../../shared/engine/index.ts';
import { primitiveFeeder } from '../../../bench/primitive-feeder.ts';
import { typedFeeder, typedFeederText } from './typed-feeder.ts';

function general(text: string): PrintedPrimitiveResult {
  const prepared = prepareCircuit(JSON.parse(text));
  const r = printedPrimitiveResults(prepared, solvePrimitives(prepared.primitives));
  if (!r) throw new Error('the general path has no printed result');
  return r;
}

/** The first difference between two printed results, or null. */
function difference(a: PrintedPrimitiveResult, b: PrintedPrimitiveResult): string | null {
  if (JSON.stringify(a.nodeNames) !== JSON.stringify(b.nodeNames)) return 'node names or their order';
  if (JSON.stringify(a.elementIds) !== JSON.stringify(b.elementIds)) return 'element ids';
  if (JSON.stringify(a.elementTypes) !== JSON.stringify(b.elementTypes)) return 'element types';
  for (let i = 0; i < a.nodeNames.length; i++) if (!Object.is(a.vRe[i], b.vRe[i]) || !Object.is(a.vIm[i], b.vIm[i])) return `voltage of ${a.nodeNames[i]}: ${a.vRe[i]} + j${a.vIm[i]} vs ${b.vRe[i]} + j${b.vIm[i]}`;
  for (let k = 0; k < a.elementIds.length; k++) {
    if (a.currentCount[k] !== b.currentCount[k]) return `current count of ${a.elementIds[k]}`;
    for (let c = 0; c < a.currentCount[k]; c++) {
      const [x, y] = [a.currentStart[k] + c, b.currentStart[k] + c];
      if (!Object.is(a.cRe[x], b.cRe[y]) || !Object.is(a.cIm[x], b.cIm[y])) return `current of ${a.elementIds[k]}: ${a.cRe[x]} + j${a.cIm[x]} vs ${b.cRe[y]} + j${b.cIm[y]}`;
    }
  }
  for (const key of ['conventions', 'totals', 'floating', 'flags', 'iterations'] as const) if (JSON.stringify(a[key]) !== JSON.stringify(b[key])) return key;
  // JSON.stringify writes −0 as 0: the totals' own parts bit for bit
  const bt = b.totals as unknown as Record<string, { re: number; im: number }>;
  for (const [name, p] of Object.entries(a.totals)) if (typeof p === 'object' && (!Object.is(p.re, bt[name].re) || !Object.is(p.im, bt[name].im))) return `totals.${name}`;
  return null;
}

describe('typed path of primitive-only files: the general path’s numbers to the last bit', () => {
  it('on the primitive-only benchmark feeder, several sizes and seeds', () => {
    for (const [buses, seed] of [[1, 1], [30, 2], [200, 7], [600, 3]] as const) {
      const text = JSON.stringify(primitiveFeeder(buses, seed));
      const typed = printedPrimitiveResultOfText(text);
      expect(typed, `${buses} buses, seed ${seed}: declined`).toBeDefined();
      expect(difference(typed!, general(text)), `${buses} buses, seed ${seed}`).toBeNull();
    }
  });

  it('on 60 seeded files of every accepted shape (source trees off earth, current sources, complex forms, key orders, number spellings, both sequences)', () => {
    const shapes = new Set<string>();
    for (let seed = 1; seed <= 60; seed++) {
      const file = typedFeeder(seed, { shuffleKeys: seed % 2 === 0 });
      const text = typedFeederText(file, seed);
      const typed = printedPrimitiveResultOfText(text);
      expect(typed, `seed ${seed}: declined`).toBeDefined();
      expect(difference(typed!, general(text)), `seed ${seed}`).toBeNull();
      shapes.add(String(file.sequence));
      if (text.includes('"S.n"')) shapes.add('source neutral off earth');
      if (text.includes('Boost')) shapes.add('source between feeder nodes');
      if (text.includes('currentSource')) shapes.add('current source');
      if (text.includes('angleDeg')) shapes.add('polar value');
      if (/-0[,.}\s]/.test(text)) shapes.add('negative zero');
      if (/\de-?\d/.test(text)) shapes.add('exponent form');
      if (typed!.flags.length > 0) shapes.add('flags');
    }
    // the seeds cover what the title claims (else the test proves less than it says)
    for (const s of ['ABC', 'ACB', 'source neutral off earth', 'source between feeder nodes', 'current source', 'polar value', 'negative zero', 'exponent form', 'flags']) expect(shapes, s).toContain(s);
  });

  it('declines what it does not solve: a loop of ideal sources, a part with no path to earth', () => {
    const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 };
    const v = (id: string, plus: string, volts: number) => ({ type: 'voltageSource', id, plus, minus: 'earth', volts });
    const z = (id: string, from: string, to: string) => ({ type: 'impedance', id, from, to, ohms: 5 });
    const loop = { ...base, elements: [v('V1', 'a', 10), v('V2', 'a', 10), z('R', 'a', 'earth')] };
    const island = { ...base, elements: [v('V1', 'a', 10), z('R', 'a', 'earth'), z('F', 'x', 'y')] };
    const currentOnly = { ...base, elements: [v('V1', 'a', 10), z('R', 'a', 'earth'), { type: 'currentSource', id: 'J', from: 'earth', to: 'x', amps: 1 }] };
    for (const f of [loop, island, currentOnly]) expect(printedPrimitiveResultOfText(JSON.stringify(f))).toBeUndefined();
    // the same files with the offending part removed are taken
    expect(printedPrimitiveResultOfText(JSON.stringify({ ...base, elements: [v('V1', 'a', 10), z('R', 'a', 'earth')] }))).toBeDefined();
  });
});
