/**
 * The primitive-only benchmark feeder: a random radial four-wire feeder written entirely in
 * `impedance` elements and three ideal `voltageSource`s (no coupled branches, no blocks), as
 * issue 14 describes it: per bus, one impedance per conductor (a, b, c, n) from a random earlier
 * bus, unbalanced wye loads on the neutral or delta loads (one impedance per branch), a single-phase
 * service load, and
 * the neutral earthed through an electrode every few buses. About 8.4 elements per bus: ~42 000
 * impedances and ~20 000 nodes at 5 000 buses. Seeded (same network every run); invented data.
 */
import type { Cx, Primitive } from '../../shared/engine/types.ts';
import { prng } from '../shared/engine/spice/random-network.ts';
import type { PrimitiveCircuitFile } from './feeder.ts';

const pol = (m: number, deg: number): Cx => ({ re: m * Math.cos((deg * Math.PI) / 180), im: m * Math.sin((deg * Math.PI) / 180) });

/** Generate the feeder with `buses` buses besides the source bus. */
export function primitiveFeeder(buses: number, seed = 7): PrimitiveCircuitFile {
  const rnd = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * rnd();
  const round = (x: number) => Math.round(x * 1e6) / 1e6;
  const el: Primitive[] = [];
  const vln = 7200;
  (['a', 'b', 'c'] as const).forEach((p, k) => el.push({ type: 'voltageSource', id: `src.${p}`, plus: `b0.${p}`, minus: 'earth', volts: pol(vln, -120 * k) }));
  el.push({ type: 'impedance', id: 'src.n', from: 'b0.n', to: 'earth', ohms: { re: 0.5, im: 0 } });
  for (let b = 1; b <= buses; b++) {
    // a random recursive tree: the parent is any earlier bus (depth ~ e·ln n, a few miles of line)
    const parent = Math.floor(rnd() * b);
    const len = between(0.05, 0.3);
    for (const c of ['a', 'b', 'c', 'n']) {
      const r = c === 'n' ? 0.6 : 0.35;
      el.push({ type: 'impedance', id: `line.${b}.${c}`, from: `b${parent}.${c}`, to: `b${b}.${c}`, ohms: { re: round(len * r), im: round(len * 1.05) } });
    }
    const zl = (): Cx => {
      const r = between(400, 4000);
      return { re: round(r), im: round(r * between(0.1, 0.6)) };
    };
    if (rnd() < 0.6) {
      for (const p of ['a', 'b', 'c']) if (rnd() < 0.9) el.push({ type: 'impedance', id: `load.${b}.${p}`, from: `b${b}.${p}`, to: `b${b}.n`, ohms: zl() });
    } else {
      for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) el.push({ type: 'impedance', id: `load.${b}.${p}${q}`, from: `b${b}.${p}`, to: `b${b}.${q}`, ohms: zl() });
    }
    if (rnd() < 0.9) {
      const p = ['a', 'b', 'c'][Math.floor(rnd() * 3)];
      el.push({ type: 'impedance', id: `service.${b}.${p}`, from: `b${b}.${p}`, to: `b${b}.n`, ohms: zl() });
    }
    if (rnd() < 0.7) el.push({ type: 'impedance', id: `earth.${b}`, from: `b${b}.n`, to: 'earth', ohms: { re: round(between(5, 25)), im: 0 } });
  }
  return { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: el };
}
