/**
 * A random radial four-wire feeder for the benchmark, as a primitives-only `wyeward-circuit` file:
 * a solidly earthed wye source behind its impedance, coupled 4×4 line sections (phases a, b, c and
 * neutral; inductive mutual terms) from each bus to a random earlier nearby bus, unbalanced wye loads on the neutral, delta
 * loads and single-phase loads, and the neutral earthed through an electrode every few buses.
 * Seeded, so each size is the same network in every run. Invented data.
 */
import type { Cx, Primitive } from '../../shared/engine/types.ts';
import { prng } from '../shared/engine/spice/random-network.ts';

/** The top level of a circuit file holding only primitives. */
export interface PrimitiveCircuitFile {
  format: 'wyeward-circuit';
  version: 1;
  frequencyHz: number;
  elements: (Primitive & { type: string })[];
}

const pol = (m: number, deg: number): Cx => ({ re: m * Math.cos((deg * Math.PI) / 180), im: m * Math.sin((deg * Math.PI) / 180) });

/** Generate the feeder with `buses` buses (besides the source bus). */
export function radialFeeder(buses: number, seed = 42): PrimitiveCircuitFile {
  const rnd = prng(seed);
  const between = (a: number, b: number) => a + (b - a) * rnd();
  const round = (x: number) => Math.round(x * 1e6) / 1e6;
  const el: Primitive[] = [];
  const vln = 7200; // 12.47 kV class feeder, line-to-neutral
  (['a', 'b', 'c'] as const).forEach((p, k) =>
    el.push({ type: 'voltageSource', id: `src.${p}`, plus: `b0.${p}`, minus: 'b0.n', volts: pol(vln, -120 * k), seriesOhms: { re: 0.05, im: 0.6 } }),
  );
  el.push({ type: 'switch', id: 'src.earth', from: 'b0.n', to: 'earth', closed: true });
  for (let b = 1; b <= buses; b++) {
    // radial: the parent is one of the few previous buses (long laterals, like a real feeder)
    const parent = Math.max(0, b - 1 - Math.floor(rnd() * 4));
    const len = between(0.05, 0.3); // miles
    const self = (r: number, x: number): Cx => ({ re: round(len * r), im: round(len * x) });
    const z: Cx[][] = [];
    for (let i = 0; i < 4; i++) {
      z.push([]);
      // mutual terms purely reactive: a real mutual resistance needs a controlled source per term
      // in SPICE, which made ngspice ~30× slower and would flatter the comparison
      for (let j = 0; j < 4; j++) z[i].push(i === j ? (i < 3 ? self(0.35, 1.05) : self(0.6, 1.2)) : self(0, 0.45));
    }
    el.push({ type: 'coupledBranch', id: `line.${b}`, from: ['a', 'b', 'c', 'n'].map((c) => `b${parent}.${c}`), to: ['a', 'b', 'c', 'n'].map((c) => `b${b}.${c}`), ohms: z });
    const kind = rnd();
    const zl = (): Cx => {
      const r = between(400, 4000);
      return { re: round(r), im: round(r * between(0.1, 0.6)) };
    };
    if (kind < 0.5) {
      for (const p of ['a', 'b', 'c']) if (rnd() < 0.85) el.push({ type: 'impedance', id: `load.${b}.${p}`, from: `b${b}.${p}`, to: `b${b}.n`, ohms: zl() });
    } else if (kind < 0.75) {
      for (const [p, q] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) el.push({ type: 'impedance', id: `load.${b}.${p}${q}`, from: `b${b}.${p}`, to: `b${b}.${q}`, ohms: zl() });
    } else {
      const p = ['a', 'b', 'c'][Math.floor(rnd() * 3)];
      el.push({ type: 'impedance', id: `load.${b}.${p}`, from: `b${b}.${p}`, to: `b${b}.n`, ohms: zl() });
    }
    if (b % 4 === 0) el.push({ type: 'impedance', id: `earth.${b}`, from: `b${b}.n`, to: 'earth', ohms: { re: round(between(5, 25)), im: 0 } });
  }
  return { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: el };
}
