/**
 * The complex sparse LU against dense Gaussian elimination on random matrices, the ordering's
 * validity, the deferred-pivot border (zero diagonal pivots that are not singular) and
 * rank detection (singular directions reported with their null vectors).
 */
import { describe, expect, it } from 'vitest';
import { denseInverse, denseZeros } from '../../../../shared/engine/solver/dense.ts';
import { minimumDegreeOrder } from '../../../../shared/engine/solver/ordering.ts';
import { analyzePattern, factorNumeric } from '../../../../shared/engine/solver/sparse-lu.ts';
import { prng } from '../spice/random-network.ts';

interface Entry {
  r: number;
  c: number;
  re: number;
  im: number;
}

/** Assemble (row, col, value) entries into a symbolic + numeric factorization. */
function factor(n: number, entries: Entry[], perm?: Int32Array) {
  const rows = Int32Array.from(entries.map((e) => e.r));
  const cols = Int32Array.from(entries.map((e) => e.c));
  const { symbolic, positions } = analyzePattern(n, rows, cols, entries.length, perm);
  const aRe = new Float64Array(symbolic.rowIdx.length);
  const aIm = new Float64Array(symbolic.rowIdx.length);
  entries.forEach((e, k) => {
    aRe[positions[k]] += e.re;
    aIm[positions[k]] += e.im;
  });
  return { symbolic, lu: factorNumeric(symbolic, aRe, aIm) };
}

function matvec(n: number, entries: Entry[], xr: Float64Array, xi: Float64Array) {
  const yr = new Float64Array(n);
  const yi = new Float64Array(n);
  for (const e of entries) {
    yr[e.r] += e.re * xr[e.c] - e.im * xi[e.c];
    yi[e.r] += e.re * xi[e.c] + e.im * xr[e.c];
  }
  return { yr, yi };
}

/** Dense solve through the small-matrix inverse (Gauss–Jordan with partial pivoting): the reference. */
function denseSolve(n: number, entries: Entry[], br: Float64Array, bi: Float64Array) {
  const a = denseZeros(n);
  for (const e of entries) {
    a.re[e.r * n + e.c] += e.re;
    a.im[e.r * n + e.c] += e.im;
  }
  const inv = denseInverse(a)!;
  const xr = new Float64Array(n);
  const xi = new Float64Array(n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      xr[i] += inv.re[i * n + j] * br[j] - inv.im[i * n + j] * bi[j];
      xi[i] += inv.re[i * n + j] * bi[j] + inv.im[i * n + j] * br[j];
    }
  return { xr, xi };
}

function randomSparse(seed: number, n: number, density: number, unsymmetric: boolean): Entry[] {
  const rnd = prng(seed);
  const entries: Entry[] = [];
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      if (rnd() > density) continue;
      const re = rnd() * 2 - 1;
      const im = rnd() * 2 - 1;
      entries.push({ r: i, c: j, re, im });
      entries.push(unsymmetric ? { r: j, c: i, re: rnd() * 2 - 1, im: rnd() * 2 - 1 } : { r: j, c: i, re, im });
    }
    // a random (not dominant) diagonal: pivots may be small, which exercises the deferral
    entries.push({ r: i, c: i, re: rnd() * 4 - 2, im: rnd() * 4 - 2 });
  }
  return entries;
}

describe('complex sparse LU', () => {
  for (const [seed, n, density, unsym] of [
    [1, 5, 0.6, false],
    [2, 12, 0.3, true],
    [3, 30, 0.15, true],
    [4, 60, 0.05, false],
    [5, 80, 0.08, true],
  ] as const) {
    it(`solves a random ${unsym ? 'unsymmetric' : 'complex-symmetric'} ${n}×${n} matrix like dense elimination (seed ${seed})`, () => {
      const entries = randomSparse(seed, n, density, unsym);
      const rnd = prng(seed + 100);
      const br = Float64Array.from({ length: n }, () => rnd() - 0.5);
      const bi = Float64Array.from({ length: n }, () => rnd() - 0.5);
      const { lu } = factor(n, entries);
      expect(lu.grounded).toEqual([]);
      const x = lu.solve(br, bi);
      const ref = denseSolve(n, entries, br, bi);
      let xmax = 0;
      let diff = 0;
      for (let i = 0; i < n; i++) {
        xmax = Math.max(xmax, Math.hypot(ref.xr[i], ref.xi[i]));
        diff = Math.max(diff, Math.hypot(x.re[i] - ref.xr[i], x.im[i] - ref.xi[i]));
      }
      expect(diff / xmax).toBeLessThan(1e-9);
      // and the residual A·x − b is small
      const { yr, yi } = matvec(n, entries, x.re, x.im);
      for (let i = 0; i < n; i++) expect(Math.hypot(yr[i] - br[i], yi[i] - bi[i])).toBeLessThan(1e-9 * Math.max(1, xmax));
    });
  }

  it('produces a valid permutation, and no fill on a tree (leaves eliminated first)', () => {
    // a random tree of 200 vertices
    const rnd = prng(7);
    const n = 200;
    const entries: Entry[] = [];
    for (let v = 1; v < n; v++) {
      const p = Math.floor(rnd() * v);
      entries.push({ r: v, c: p, re: -1, im: -0.5 }, { r: p, c: v, re: -1, im: -0.5 });
    }
    for (let v = 0; v < n; v++) entries.push({ r: v, c: v, re: 3, im: 1 });
    const { symbolic } = factor(n, entries);
    expect([...symbolic.perm].sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, i) => i));
    // L of a tree in a perfect elimination order has exactly n − 1 off-diagonal entries
    expect(symbolic.lnz).toBe(n - 1);
  });

  it('orders a path graph without fill and deterministically', () => {
    const n = 6;
    // path 0-1-2-3-4-5 as CSC (both directions)
    const colPtr = new Int32Array(n + 1);
    const rows: number[] = [];
    for (let j = 0; j < n; j++) {
      if (j > 0) rows.push(j - 1);
      if (j < n - 1) rows.push(j + 1);
      colPtr[j + 1] = rows.length;
    }
    const perm = minimumDegreeOrder(n, colPtr, Int32Array.from(rows));
    // ends have degree 1; ties broken by the lower index
    expect([...perm]).toEqual([0, 1, 2, 3, 4, 5]);
  });

  it('defers a zero diagonal pivot and still solves a non-singular matrix exactly', () => {
    // [[0, -j], [-j, 1 + j]]: det = 1, but the first pivot in natural order is 0
    const entries: Entry[] = [
      { r: 0, c: 1, re: 0, im: -1 },
      { r: 1, c: 0, re: 0, im: -1 },
      { r: 1, c: 1, re: 1, im: 1 },
      { r: 0, c: 0, re: 0, im: 0 },
    ];
    const { lu } = factor(2, entries, Int32Array.from([0, 1]));
    expect(lu.deferred).toEqual([0]);
    expect(lu.grounded).toEqual([]);
    const x = lu.solve(Float64Array.from([0, 0]), Float64Array.from([0, 1])); // b = (0, j)
    // x = A⁻¹ b = [[1 + j, j], [j, 0]]·(0, j) = (−1, 0)
    expect(x.re[0]).toBeCloseTo(-1, 12);
    expect(x.im[0]).toBeCloseTo(0, 12);
    expect(x.re[1]).toBeCloseTo(0, 12);
    expect(x.im[1]).toBeCloseTo(0, 12);
  });

  it('detects a singular direction (a Laplacian without reference) and returns its null vector', () => {
    // a ring of 5 nodes with complex branch admittances and no path to the reference
    const n = 5;
    const entries: Entry[] = [];
    const y = [
      { re: 1, im: -2 },
      { re: 0.5, im: -1 },
      { re: 2, im: -0.3 },
      { re: 1, im: 1 },
      { re: 0.1, im: -4 },
    ];
    for (let k = 0; k < n; k++) {
      const a = k;
      const b = (k + 1) % n;
      entries.push({ r: a, c: a, ...y[k] }, { r: b, c: b, ...y[k] }, { r: a, c: b, re: -y[k].re, im: -y[k].im }, { r: b, c: a, re: -y[k].re, im: -y[k].im });
    }
    const { lu } = factor(n, entries);
    expect(lu.grounded.length).toBe(1);
    const nv = lu.nullVectors[0];
    // the common mode: every entry 1
    for (let i = 0; i < n; i++) {
      expect(nv.re[i]).toBeCloseTo(1, 9);
      expect(nv.im[i]).toBeCloseTo(0, 9);
    }
    // a consistent right-hand side (sums to zero) is solved with the grounded unknown at 0
    const br = Float64Array.from([1, -0.5, 0, 0.25, -0.75]);
    const bi = Float64Array.from([0.2, 0, -0.2, 0.1, -0.1]);
    const x = lu.solve(br, bi);
    expect(Math.hypot(x.re[lu.grounded[0]], x.im[lu.grounded[0]])).toBe(0);
    const { yr, yi } = matvec(n, entries, x.re, x.im);
    for (let i = 0; i < n; i++) expect(Math.hypot(yr[i] - br[i], yi[i] - bi[i])).toBeLessThan(1e-12);
  });
});
