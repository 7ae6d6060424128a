/**
 * Test fixture: a 208Y/120 V service with three single-phase loads on a drop whose neutral is open,
 * and Millman's theorem evaluated independently of the engine (J. Millman, "A useful network
 * theorem", Proc. IRE 28 (1940) 413–417): the voltage of a node joined to sources E_k through
 * admittances Y_k is Σ E_k·Y_k / Σ Y_k. Earth (0 V) is one more source, through the rod's 1/R.
 */
import type { CircuitInput } from '../../../../shared/engine/index.ts';

export interface C {
  re: number;
  im: number;
}
const add = (a: C, b: C): C => ({ re: a.re + b.re, im: a.im + b.im });
const sub = (a: C, b: C): C => ({ re: a.re - b.re, im: a.im - b.im });
const mul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const div = (a: C, b: C): C => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
export const cabs = (a: C) => Math.hypot(a.re, a.im);
const polar = (m: number, deg: number): C => ({ re: m * Math.cos((deg * Math.PI) / 180), im: m * Math.sin((deg * Math.PI) / 180) });

/** Per conductor, per metre, and the drop's length (invented data). */
export const LINE_OHMS_PER_M: C = { re: 0.00054, im: 0.0003 };
export const DROP_M = 30;
export const VLN = 120;

/** Loads as kW/kvar per phase at 120 V (constant impedance). */
export interface Loads {
  a: { kw: number; kvar: number };
  b: { kw: number; kvar: number };
  c: { kw: number; kvar: number };
}
export const LOADS: Loads = { a: { kw: 1.5, kvar: 0.2 }, b: { kw: 4, kvar: 0 }, c: { kw: 0.6, kvar: 0.1 } };

/** The circuit: ideal source, drop with `open`, loads, and an earth rod of `rodOhms` (none when null). */
export function serviceCircuit(loads: Loads = LOADS, rodOhms: number | null = 25, open: ('a' | 'b' | 'c' | 'n')[] = ['n']): CircuitInput {
  const z = LINE_OHMS_PER_M;
  return {
    format: 'wyeward-circuit',
    version: 1,
    frequencyHz: 60,
    elements: [
      { type: 'source', id: 'SRC', bus: 'PAD', kvLL: (VLN * Math.sqrt(3)) / 1000 },
      { type: 'line', id: 'DROP', from: 'PAD', to: 'HOUSE', length: DROP_M, lengthUnit: 'm', impedance: { kind: 'perConductor', ohmsPerLength: { a: z, b: z, c: z, n: z } }, open },
      { type: 'load', id: 'KITCHEN', bus: 'HOUSE', connection: 'single', between: ['a', 'n'], each: loads.a },
      { type: 'load', id: 'HEATER', bus: 'HOUSE', connection: 'single', between: ['b', 'n'], each: loads.b },
      { type: 'load', id: 'ELECTRONICS', bus: 'HOUSE', connection: 'single', between: ['c', 'n'], each: loads.c },
      ...(rodOhms === null ? [] : [{ type: 'earthing' as const, id: 'ROD', node: 'HOUSE.n', ohms: rodOhms }]),
    ],
  };
}

/**
 * Millman with the neutral open: house star-point voltage and each phase's house voltage to earth.
 * Branch k: EMF E_k in series with the drop conductor and the load Z_k = V²/S* (S = P + jQ).
 * `rodOhms` null: no rod; 0: the star point is held at earth (the solid-neutral answer).
 */
export function millman(loads: Loads, rodOhms: number | null): { star: C; house: Record<'a' | 'b' | 'c', C> } {
  const zLine: C = { re: LINE_OHMS_PER_M.re * DROP_M, im: LINE_OHMS_PER_M.im * DROP_M };
  const emf = { a: polar(VLN, 0), b: polar(VLN, -120), c: polar(VLN, 120) };
  const y = {} as Record<'a' | 'b' | 'c', C>;
  for (const k of ['a', 'b', 'c'] as const) {
    const sConj: C = { re: loads[k].kw * 1000, im: -loads[k].kvar * 1000 };
    const zLoad = div({ re: VLN * VLN, im: 0 }, sConj);
    y[k] = div({ re: 1, im: 0 }, add(zLine, zLoad));
  }
  let num: C = { re: 0, im: 0 };
  let den: C = { re: 0, im: 0 };
  for (const k of ['a', 'b', 'c'] as const) {
    num = add(num, mul(emf[k], y[k]));
    den = add(den, y[k]);
  }
  const star: C = rodOhms === 0 ? { re: 0, im: 0 } : div(num, rodOhms === null ? den : add(den, { re: 1 / rodOhms, im: 0 }));
  const house = {} as Record<'a' | 'b' | 'c', C>;
  for (const k of ['a', 'b', 'c'] as const) {
    const i = mul(sub(emf[k], star), y[k]);
    house[k] = sub(emf[k], mul(i, zLine));
  }
  return { star, house };
}
