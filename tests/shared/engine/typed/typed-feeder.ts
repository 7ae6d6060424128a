/**
 * Seeded primitive-only files of every shape the typed path (shared/engine/typed) accepts, for its
 * tests: wye sources between phase and source-neutral nodes (ideal-source trees whose root is not
 * earth, so supernode offsets move to the right-hand side) or solidly to earth, the source neutral
 * earthed through an impedance, current sources, complex values as numbers, {re, im} and
 * {mag, angleDeg}, keys in shuffled order, ABC or ACB sequence, optional name and description,
 * negative zero and long or exponent-form numbers. Invented data.
 */
import type { Cx } from '../../../../shared/engine/types.ts';
import { prng } from '../spice/random-network.ts';

type Obj = Record<string, unknown>;

/** Options: the number of buses after the source bus, and whether keys are shuffled. */
export interface TypedFeederOptions {
  buses?: number;
  shuffleKeys?: boolean;
}

/** A random primitive-only circuit file (a plain object; write it with JSON.stringify or typedFeederText). */
export function typedFeeder(seed: number, opts: TypedFeederOptions = {}): Obj {
  const rnd = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * rnd();
  const buses = opts.buses ?? 3 + Math.floor(rnd() * 30);
  const sequence = rnd() < 0.5 ? 'ABC' : 'ACB';
  const lag = sequence === 'ABC' ? -120 : 120;
  /** A complex value in one of the three forms of the format. */
  const value = (z: Cx): unknown => {
    const r = rnd();
    if (z.im === 0 && r < 0.3) return z.re;
    if (r < 0.15) return { mag: Math.hypot(z.re, z.im), angleDeg: (Math.atan2(z.im, z.re) * 180) / Math.PI };
    return { re: z.re, im: z.im };
  };
  const shuffle = (o: Obj): Obj => {
    if (!opts.shuffleKeys) return o;
    const keys = Object.keys(o);
    for (let i = keys.length - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [keys[i], keys[j]] = [keys[j], keys[i]];
    }
    return Object.fromEntries(keys.map((k) => [k, o[k]]));
  };
  const el: Obj[] = [];
  const vln = between(120, 8000);
  const earthedSolid = rnd() < 0.4;
  const srcMinus = earthedSolid ? 'earth' : 'S.n';
  ['a', 'b', 'c'].forEach((p, k) => el.push(shuffle({ type: 'voltageSource', id: `E${p}`, plus: `S.${p}`, minus: srcMinus, volts: value({ re: vln * Math.cos(((lag * k) * Math.PI) / 180), im: vln * Math.sin(((lag * k) * Math.PI) / 180) }) })));
  if (!earthedSolid) el.push(shuffle({ type: 'impedance', id: 'Zsn', from: 'S.n', to: 'earth', ohms: value({ re: between(0.5, 5), im: rnd() < 0.5 ? 0 : between(0, 2) }) }));
  // a source between two nodes of the feeder (its tree root is a feeder node: offsets both sides)
  const boost = rnd() < 0.5;
  const name = (b: number) => (b === 0 ? 'S' : `B${b}`);
  for (let b = 1; b <= buses; b++) {
    const parent = Math.floor(rnd() * b);
    for (const c of ['a', 'b', 'c', 'n']) {
      const ohms = { re: between(0.01, 0.5), im: between(0.01, 0.8) };
      // a series booster source on one phase of one section: plus on the child, minus on a midpoint
      if (boost && b === 1 && c === 'a') {
        el.push(shuffle({ type: 'impedance', id: `L${b}${c}`, from: `${name(parent)}.${c}`, to: `M${b}.${c}`, ohms: value(ohms) }));
        el.push(shuffle({ type: 'voltageSource', id: `Boost${b}`, plus: `${name(b)}.${c}`, minus: `M${b}.${c}`, volts: value({ re: between(-5, 5), im: between(-5, 5) }) }));
      } else el.push(shuffle({ type: 'impedance', id: `L${b}${c}`, from: `${name(parent)}.${c}`, to: `${name(b)}.${c}`, ohms: value(ohms) }));
    }
    const zl = (): Cx => {
      const r = between(2, 200);
      const k = rnd();
      return { re: r, im: k < 0.6 ? between(0, r) : k < 0.8 ? -between(0.1, r) : 0 };
    };
    if (rnd() < 0.5) for (const p of ['a', 'b', 'c']) el.push(shuffle({ type: 'impedance', id: `Y${b}${p}`, from: `${name(b)}.${p}`, to: `${name(b)}.n`, ohms: value(zl()) }));
    else for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) el.push(shuffle({ type: 'impedance', id: `D${b}${p}${q}`, from: `${name(b)}.${p}`, to: `${name(b)}.${q}`, ohms: value(zl()) }));
    if (rnd() < 0.3) el.push(shuffle({ type: 'currentSource', id: `J${b}`, from: rnd() < 0.5 ? 'earth' : `${name(b)}.n`, to: `${name(b)}.${['a', 'b', 'c'][Math.floor(rnd() * 3)]}`, amps: value({ re: between(-3, 3), im: between(-3, 3) }) }));
    if (rnd() < 0.5) el.push(shuffle({ type: 'impedance', id: `G${b}`, from: `${name(b)}.n`, to: 'earth', ohms: value({ re: between(5, 50), im: 0 }) }));
  }
  // at least one earth path downstream of an unearthed source neutral
  el.push(shuffle({ type: 'impedance', id: 'Gend', from: `${name(buses)}.n`, to: 'earth', ohms: value({ re: 25, im: 0 }) }));
  const file: Obj = { format: 'wyeward-circuit', version: 1, frequencyHz: rnd() < 0.5 ? 50 : 60, sequence, elements: el };
  if (rnd() < 0.5) file.name = `Typed feeder ${seed} ∠ é`;
  if (rnd() < 0.3) file.description = 'invented data';
  return shuffle(file);
}

/**
 * The JSON text of `file`, pretty-printed or not, with some numbers rewritten in other JSON
 * spellings of the same value (exponent form, trailing zeros), so the scanner's number reading
 * meets them (JSON.parse reads both to the same double), and some zero imaginary parts written as
 * negative zero.
 */
export function typedFeederText(file: Obj, seed: number): string {
  const rnd = prng(seed ^ 0x5bd1e995);
  const text = rnd() < 0.5 ? JSON.stringify(file) : JSON.stringify(file, null, rnd() < 0.5 ? 2 : '\t');
  return text
    .replace(/(?<=[:\[,]\s*)(-?\d+\.\d+)(?=[,}\]\s])/g, (m) => {
      const r = rnd();
      if (r < 0.2) return `${m}000`;
      if (r < 0.4) return Number(m).toExponential();
      if (r < 0.5 && !/^-?0\./.test(m)) return `${m.replace('.', '')}e-${m.split('.')[1].length}`;
      return m;
    })
    .replace(/(?<="im":\s*)0(?=[,}\s])/g, () => (rnd() < 0.5 ? '-0' : '-0.0e3'));
}
