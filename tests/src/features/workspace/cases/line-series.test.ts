/**
 * The line a sweep chart draws, kept up to date point by point: it keeps every pixel column's
 * extremes and every limit crossing of the data, and taking points in as they arrive (in any order,
 * with gaps) gives exactly what drawing the arrived points from scratch gives (a plain reference
 * written here, one pass over every point).
 */
import { describe, expect, it } from 'vitest';
import { LineSeries } from '../../../../../src/features/workspace/cases/line-series.ts';

/** A deterministic pseudo-random sequence (no Math.random: the test is the same on every run). */
function rng(seed: number) {
  let s = seed >>> 0;
  return () => ((s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 2 ** 32);
}

const N = 10_000;
const PIXELS = 392;
const column = (x: number) => Math.round((x / (N - 1)) * PIXELS);
const xs = Array.from({ length: N }, (_, i) => i);

/** A wiggly curve with sharp single-point spikes, crossing 1.05 and 0.95 many times. */
function curve(rand: () => number): Float64Array {
  return Float64Array.from(xs, (i) => 1 + 0.06 * Math.sin(i / 37) + 0.02 * (rand() - 0.5) + (rand() < 0.002 ? (rand() - 0.5) * 0.5 : 0));
}

/** Reference: per column of arrived points, all of them if any lacks a value, one break if none arrived, else first/lowest/highest/last. */
function reference(ys: Float64Array, arrived: boolean[], firstBreak: number): number[] {
  const out: number[] = [];
  let a = 0;
  while (a < N) {
    let b = a;
    while (b + 1 < N && column(xs[b + 1]) === column(xs[a])) b++;
    const idx = Array.from({ length: b - a + 1 }, (_, k) => a + k);
    const here = idx.filter((i) => arrived[i]);
    if (here.length === 0) out.push(a);
    else if (idx.some((i) => !arrived[i] || Number.isNaN(ys[i]))) out.push(...idx);
    else {
      const lo = idx.reduce((m, i) => (ys[i] < ys[m] ? i : m), a);
      const hi = idx.reduce((m, i) => (ys[i] > ys[m] ? i : m), a);
      const keep = new Set([a, lo, hi, b]);
      if (firstBreak >= a && firstBreak <= b) keep.add(firstBreak);
      out.push(...[...keep].sort((p, q) => p - q));
    }
    a = b + 1;
  }
  return out;
}

const breaks = (v: number) => v < 0.95 || v > 1.05;

describe('line series (what a sweep chart draws)', () => {
  it('keeps each pixel column’s lowest and highest value, at most five points per column', () => {
    const ys = curve(rng(7));
    const s = new LineSeries(xs, ys, { column, keepAll: 2 * PIXELS, breaks });
    s.add(0, N);
    const kept = s.indices();
    expect(kept.length).toBeLessThanOrEqual(5 * s.columns);
    expect(kept.length).toBeLessThan(N / 4);
    const byCol = (list: number[]) => {
      const m = new Map<number, number[]>();
      for (const i of list) m.set(column(i), [...(m.get(column(i)) ?? []), ys[i]]);
      return m;
    };
    const all = byCol(xs);
    const drawn = byCol(kept);
    expect([...drawn.keys()]).toEqual([...all.keys()]);
    for (const [c, v] of all) {
      expect(Math.min(...drawn.get(c)!)).toBe(Math.min(...v));
      expect(Math.max(...drawn.get(c)!)).toBe(Math.max(...v));
    }
    expect(s.lo).toBe(Math.min(...ys));
    expect(s.hi).toBe(Math.max(...ys));
  });

  it('crosses each limit in exactly the pixel columns where the data does, and keeps the first point that breaks it', () => {
    const ys = curve(rng(11));
    const s = new LineSeries(xs, ys, { column, keepAll: 2 * PIXELS, breaks });
    s.add(0, N);
    const kept = s.indices();
    const crossings = (list: number[], b: number) => {
      const cols = new Set<number>();
      for (let k = 1; k < list.length; k++) if ((ys[list[k - 1]] - b) * (ys[list[k]] - b) < 0) cols.add(column(list[k]));
      return [...cols].sort((p, q) => p - q);
    };
    for (const b of [0.95, 1.05]) {
      const data = crossings(xs, b);
      expect(data.length).toBeGreaterThan(10);
      expect(crossings(kept, b)).toEqual(data);
    }
    const first = Array.from(ys).findIndex(breaks);
    expect(s.firstBreak).toBe(first);
    expect(kept).toContain(first);
  });

  it('taking chunks in as they arrive, in any order and with failed points, draws what drawing them from scratch draws', () => {
    const rand = rng(3);
    const ys = new Float64Array(N).fill(NaN);
    const truth = curve(rand);
    const s = new LineSeries(xs, ys, { column, keepAll: 2 * PIXELS, breaks });
    const chunks = Array.from({ length: 50 }, (_, k) => k * 200).sort(() => rand() - 0.5);
    const arrived = new Array<boolean>(N).fill(false);
    chunks.forEach((start, n) => {
      for (let i = start; i < start + 200; i++) {
        ys[i] = i % 997 === 0 ? NaN : truth[i]; // a point that could not be solved has no value
        arrived[i] = true;
      }
      s.add(start, 200);
      if (n % 7 === 0) s.add(start, 200); // a chunk taken in twice counts once
      const got = Array.from(ys).findIndex((v, i) => arrived[i] && breaks(v));
      expect(s.firstBreak).toBe(got);
      if (n % 10 === 0 || n === chunks.length - 1) expect(s.indices()).toEqual(reference(ys, arrived, got));
    });
    const finite = Array.from(ys).filter((v) => !Number.isNaN(v));
    expect(s.lo).toBe(Math.min(...finite));
    expect(s.hi).toBe(Math.max(...finite));
  });

  it('draws every point of a small sweep', () => {
    const ys = Float64Array.from([1, 2, NaN, 4, 5]);
    const s = new LineSeries([1, 2, 3, 4, 5], ys, { column: () => 0, keepAll: 10 });
    expect(s.indices()).toEqual([0, 1, 2, 3, 4]); // nothing arrived: each point breaks the line
    s.add(0, 5);
    expect(s.indices()).toEqual([0, 1, 2, 3, 4]);
    expect([s.lo, s.hi]).toEqual([1, 5]);
  });
});
