/**
 * Small complex-arithmetic helpers on the plain `Cx` shape, used by the building blocks and the
 * results. Plain functions on `{ re, im }` (not a class) so that values stay serialisable and the
 * hot paths allocate little; complex.js stays available for callers at the edges.
 */
import type { Cx } from './types.ts';

/** A phasor in both rectangular and polar form (RMS; angle in degrees). */
export interface Phasor {
  re: number;
  im: number;
  mag: number;
  angleDeg: number;
}

export const ZERO: Cx = { re: 0, im: 0 };
export const ONE: Cx = { re: 1, im: 0 };
const DEG = Math.PI / 180;

/** Complex number from rectangular parts. */
export const cx = (re: number, im = 0): Cx => ({ re, im });
/** Complex number from magnitude and angle in degrees. */
export const polar = (mag: number, angleDeg: number): Cx => ({ re: mag * Math.cos(angleDeg * DEG), im: mag * Math.sin(angleDeg * DEG) });
export const add = (a: Cx, b: Cx): Cx => ({ re: a.re + b.re, im: a.im + b.im });
export const sub = (a: Cx, b: Cx): Cx => ({ re: a.re - b.re, im: a.im - b.im });
export const mul = (a: Cx, b: Cx): Cx => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export const scale = (a: Cx, k: number): Cx => ({ re: a.re * k, im: a.im * k });
export const conj = (a: Cx): Cx => ({ re: a.re, im: -a.im });
export const neg = (a: Cx): Cx => ({ re: -a.re, im: -a.im });
// sqrt rather than Math.hypot: several times faster in V8, and RMS phasors never come near overflow.
export const abs = (a: Cx): number => Math.sqrt(a.re * a.re + a.im * a.im);
/** Angle in degrees, in (−180, 180]. */
export const angleDeg = (a: Cx): number => (a.re === 0 && a.im === 0 ? 0 : Math.atan2(a.im, a.re) / DEG);
export const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
};
export const inv = (a: Cx): Cx => div(ONE, a);
export const isZero = (a: Cx): boolean => a.re === 0 && a.im === 0;
/** Sum of a list of complex values. */
export const sum = (xs: readonly Cx[]): Cx => xs.reduce((s, x) => add(s, x), ZERO);
/** Rectangular + polar view of a complex value. */
export const toPhasor = (a: Cx): Phasor => ({ re: a.re, im: a.im, mag: abs(a), angleDeg: angleDeg(a) });
/** Rotate a complex value by an angle in degrees. */
export const rotate = (a: Cx, deg: number): Cx => mul(a, polar(1, deg));

/** Product of two complex matrices. */
export function matMul(a: Cx[][], b: Cx[][]): Cx[][] {
  return a.map((row) => b[0].map((_, j) => row.reduce((s, aik, k) => add(s, mul(aik, b[k][j])), ZERO)));
}

/** Inverse of a small dense complex matrix by Gauss–Jordan with partial pivoting; null if singular. */
export function matInverse(m: Cx[][]): Cx[][] | null {
  const n = m.length;
  const a = m.map((row, i) => [...row.map((x) => ({ ...x })), ...Array.from({ length: n }, (_, j) => (i === j ? ONE : ZERO))]);
  const norm = Math.max(1e-300, ...m.flat().map(abs));
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (abs(a[r][col]) > abs(a[piv][col])) piv = r;
    if (abs(a[piv][col]) <= 1e-14 * norm) return null;
    [a[col], a[piv]] = [a[piv], a[col]];
    const p = a[col][col];
    a[col] = a[col].map((x) => div(x, p));
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = a[r][col];
      if (isZero(f)) continue;
      a[r] = a[r].map((x, j) => sub(x, mul(f, a[col][j])));
    }
  }
  return a.map((row) => row.slice(n));
}
