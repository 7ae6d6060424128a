/**
 * The single-pass scanner of primitive-only files (shared/engine/typed/scan-primitive-file.ts):
 * numbers read to the same double as JSON.parse (random spellings, long significands, subnormal
 * and huge exponents, negative zero); the elements, node numbering and values of a file; and
 * undefined — so the general path takes over with its own result or message — for every shape
 * it does not accept and every file the general path rejects.
 */
import { describe, expect, it } from 'vitest';
import { parseCircuit, prepareCircuit, solvePrimitives } from '../../../../shared/engine/index.ts';
import { scanPrimitiveFile } from '../../../../shared/engine/typed/scan-primitive-file.ts';
import { prng } from '../spice/random-network.ts';

const base = { format: 'wyeward-circuit', version: 1, frequencyHz: 60 };
const src = { type: 'voltageSource', id: 'V', plus: 'a', minus: 'earth', volts: { re: 230, im: 0 } };
const imp = { type: 'impedance', id: 'R', from: 'a', to: 'b', ohms: { re: 1, im: 2 } };
const load = { type: 'impedance', id: 'L', from: 'b', to: 'earth', ohms: 10 };
const fileText = (elements: unknown[], extra: Record<string, unknown> = {}) => JSON.stringify({ ...base, ...extra, elements });

describe('scanner: numbers', () => {
  it('reads 4 000 random number spellings to the double JSON.parse gives (Object.is)', () => {
    const rnd = prng(2024);
    const digits = (n: number) => Array.from({ length: n }, () => Math.floor(rnd() * 10)).join('');
    const texts: string[] = [];
    for (let i = 0; i < 4000; i++) {
      const sign = rnd() < 0.3 ? '-' : '';
      const intPart = rnd() < 0.3 ? '0' : `${1 + Math.floor(rnd() * 9)}${digits(Math.floor(rnd() * 12))}`;
      const frac = rnd() < 0.6 ? `.${digits(1 + Math.floor(rnd() * (rnd() < 0.2 ? 25 : 10)))}` : '';
      const exp = rnd() < 0.4 ? `${rnd() < 0.5 ? 'e' : 'E'}${['', '+', '-'][Math.floor(rnd() * 3)]}${Math.floor(rnd() * (rnd() < 0.3 ? 330 : 25))}` : '';
      texts.push(`${sign}${intPart}${frac}${exp}`);
    }
    texts.push('0', '-0', '-0.0', '0e5', '-0E-5', '5e-324', '2.2250738585072011e-308', '9007199254740993', '123456789012345678901234567890', '0.1', '0.30000000000000004', '1e22', '1e23', '8.98846567431158e307');
    // as current-source amps (any finite value up to 1e100 is valid there), in a valid file
    const wanted = texts.map((t) => JSON.parse(t) as number).filter((v) => Math.abs(v) <= 1e100);
    const kept = texts.filter((t) => Math.abs(JSON.parse(t)) <= 1e100);
    const els = kept.map((t, k) => `{"type":"currentSource","id":"J${k}","from":"earth","to":"b","amps":{"re":${t},"im":${t}}}`);
    const text = `{"format":"wyeward-circuit","version":1,"frequencyHz":60,"elements":[${JSON.stringify(src)},${JSON.stringify(imp)},${JSON.stringify(load)},${els.join(',')}]}`;
    const f = scanPrimitiveFile(text);
    expect(f).toBeDefined();
    expect(wanted.length).toBeGreaterThan(3500);
    for (let k = 0; k < wanted.length; k++) {
      if (!Object.is(f!.re[3 + k], wanted[k]) || !Object.is(f!.im[3 + k], wanted[k])) expect(`${kept[k]} → ${f!.re[3 + k]}`).toBe(`${kept[k]} → ${wanted[k]}`);
    }
  });
});

describe('scanner: a file', () => {
  it('numbers nodes as the solver does (earth first, then by first use, terminals in order) and converts every complex form', () => {
    const f = scanPrimitiveFile(
      JSON.stringify({
        ...base,
        name: 'n',
        sequence: 'ACB',
        elements: [
          { volts: { mag: 2, angleDeg: 30 }, minus: 'x', plus: 'y', id: 'V', type: 'voltageSource' },
          { type: 'impedance', id: 'R', from: 'y', to: 'earth', ohms: 3 },
          { type: 'impedance', id: 'R2', from: 'x', to: 'earth', ohms: { re: 1, im: -1 } },
          { type: 'currentSource', id: 'J', from: 'earth', to: 'y', amps: { re: 0.5, im: 0 } },
        ],
      }),
    );
    expect(f).toBeDefined();
    expect(f!.sequence).toBe('ACB');
    expect(f!.nodeNames).toEqual(['earth', 'y', 'x']);
    expect([...f!.n1]).toEqual([1, 1, 2, 0]);
    expect([...f!.n2]).toEqual([2, 0, 0, 1]);
    expect([...f!.kind]).toEqual([1, 0, 0, 2]);
    expect(f!.ids).toEqual(['V', 'R', 'R2', 'J']);
    // (C) 2∠30° = √3 + j1, by the format's own conversion (the general path's values)
    const prims = prepareCircuit(JSON.parse(JSON.stringify({ ...base, elements: [{ type: 'voltageSource', id: 'V', plus: 'y', minus: 'x', volts: { mag: 2, angleDeg: 30 } }] }))).primitives;
    expect(prims[0].type === 'voltageSource' && prims[0].volts).toEqual({ re: f!.re[0], im: f!.im[0] });
    expect(f!.re[0]).toBeCloseTo(Math.sqrt(3), 12);
    expect([f!.re[1], f!.im[1], f!.re[2], f!.im[2]]).toEqual([3, 0, 1, -1]);
  });

  it('accepts whitespace of every JSON kind between tokens and an empty element list', () => {
    expect(scanPrimitiveFile(' \n\t{ "format" :"wyeward-circuit" ,\r\n "version":1,"frequencyHz":50,"elements":[ ] }\n ')).toBeDefined();
    expect(scanPrimitiveFile(JSON.stringify({ ...base, elements: [src, imp, load] }, null, '\t'))).toBeDefined();
  });

  // Each case: the text, and whether the general path accepts the file (it must decline both kinds).
  const declined: [string, string][] = [
    ['a building block', fileText([{ type: 'source', id: 'S', bus: 'A', kvLL: 0.4 }, load])],
    ['a switch', fileText([src, imp, load, { type: 'switch', id: 'S', from: 'a', to: 'b', closed: true }])],
    ['a source with series impedance', fileText([{ ...src, seriesOhms: { re: 0.1, im: 0.1 } }, imp, load])],
    ['study cases', fileText([src, imp, load], { cases: [] })],
    ['limits', fileText([src, imp, load], { limits: { set: 'iec-en' } })],
    ['bus data', fileText([src, imp, load], { buses: [{ name: 'A', kvLL: 0.4 }] })],
    ['an escaped character in an id', fileText([src, { ...imp, id: 'R "1"' }, load])],
    ['an escaped character in a node name', fileText([src, { ...imp, to: 'b\\n' }, { ...load, from: 'b\\n' }])],
    ['an index-like id', fileText([src, { ...imp, id: '12' }, load])],
    ['a "__proto__" node name', fileText([src, { ...imp, to: '__proto__' }, { ...load, from: '__proto__' }])],
    ['a repeated key in an element', JSON.stringify({ ...base, elements: [src, imp, load] }).replace('"id":"R",', '"id":"R","id":"R9",')],
    ['a repeated top-level key', JSON.stringify({ ...base, elements: [src, imp, load] }).replace('"version":1,', '"version":1,"version":1,')],
    // what the general path rejects
    ['malformed JSON (trailing comma)', fileText([src, imp, load]).replace(/]}$/, ',]}')],
    ['a byte-order mark', `\ufeff${fileText([src, imp, load])}`],
    ['malformed JSON (cut short)', fileText([src, imp, load]).slice(0, -1)],
    ['text after the object', `${fileText([src, imp, load])} x`],
    ['a leading zero', fileText([src, imp, load]).replace('"ohms":10', '"ohms":010')],
    ['a number beyond double range', fileText([src, imp, load]).replace('"ohms":10', '"ohms":1e999')],
    ['an unknown element key', fileText([src, { ...imp, colour: 'red' }, load])],
    ['an unknown element type', fileText([src, { ...imp, type: 'resistor' }, load])],
    ['a missing field', fileText([src, { type: 'impedance', id: 'R', from: 'a', ohms: 1 }, load])],
    ['a zero impedance', fileText([src, { ...imp, ohms: 0 }, load])],
    ['an impedance too small to invert', fileText([src, { ...imp, ohms: 1e-200 }, load])],
    ['a value out of range', fileText([{ ...src, volts: 1e120 }, imp, load])],
    ['a node joined to itself', fileText([src, { ...imp, to: 'a' }, load])],
    ['an empty id', fileText([src, { ...imp, id: '' }, load])],
    ['an empty node name', fileText([src, { ...imp, to: '' }, load])],
    ['a repeated id', fileText([src, imp, { ...load, id: 'R' }])],
    ['a complex value with three parts', fileText([src, { ...imp, ohms: { re: 1, im: 1, mag: 1 } }, load])],
    ['a negative magnitude', fileText([src, { ...imp, ohms: { mag: -1, angleDeg: 0 } }, load])],
    ['a wrong format name', fileText([src, imp, load], { format: 'other' })],
    ['a wrong version', fileText([src, imp, load], { version: 2 })],
    ['a zero frequency', fileText([src, imp, load], { frequencyHz: 0 })],
    ['an unknown sequence', fileText([src, imp, load], { sequence: 'CBA' })],
    ['a number where a name goes', fileText([src, { ...imp, from: 1 }, load])],
  ];
  for (const [what, text] of declined) {
    it(`declines ${what}`, () => {
      expect(scanPrimitiveFile(text)).toBeUndefined();
    });
  }
  it('the general path agrees on which of the declined files are invalid', () => {
    const invalid = declined.filter(([, text]) => {
      try {
        solvePrimitives(prepareCircuit(parseCircuit(JSON.parse(text))).primitives);
        return false;
      } catch {
        return true;
      }
    });
    // everything from "malformed JSON" on is rejected by the general path (parse, validation or the solver's checks), the shapes before it are valid
    const firstInvalid = declined.findIndex(([w]) => w.startsWith('malformed'));
    expect(invalid.map(([w]) => w)).toEqual(declined.slice(firstInvalid).map(([w]) => w));
  });
});
