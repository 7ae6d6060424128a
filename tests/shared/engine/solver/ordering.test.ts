/**
 * The minimum-degree ordering (adjacency in one Int32Array pool) against the plain
 * list-per-vertex version it replaced, kept here as the reference: the same elimination order on
 * random sparse graphs, dense ones (much fill: lists outgrow their slots and move), radial
 * feeders with 4-conductor cliques, and graphs with isolated vertices.
 */
import { describe, expect, it } from 'vitest';
import { minimumDegreeOrder } from '../../../../shared/engine/solver/ordering.ts';
import { prng } from '../spice/random-network.ts';

/** The reference: explicit elimination graph as number[][], binary heap with lazy deletion, ties to the lower index. */
function referenceOrder(n: number, colPtr: Int32Array, rowIdx: Int32Array): number[] {
  const adj: number[][] = [];
  for (let j = 0; j < n; j++) {
    const list: number[] = [];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) if (rowIdx[p] !== j) list.push(rowIdx[p]);
    adj.push(list);
  }
  const eliminated = new Uint8Array(n);
  const heap: [number, number][] = [];
  const less = (a: [number, number], b: [number, number]) => a[0] < b[0] || (a[0] === b[0] && a[1] < b[1]);
  const push = (d: number, v: number) => {
    heap.push([d, v]);
    heap.sort((a, b) => (less(a, b) ? -1 : less(b, a) ? 1 : 0));
  };
  for (let j = 0; j < n; j++) push(adj[j].length, j);
  const perm: number[] = [];
  while (perm.length < n) {
    let v = -1;
    for (;;) {
      const [d, x] = heap.shift()!;
      if (!eliminated[x] && adj[x].length === d) {
        v = x;
        break;
      }
    }
    perm.push(v);
    eliminated[v] = 1;
    const nb = adj[v];
    for (const u of nb) {
      const seen = new Set<number>([u]);
      const next: number[] = [];
      for (const w of adj[u]) {
        if (w === v || eliminated[w] || seen.has(w)) continue;
        seen.add(w);
        next.push(w);
      }
      for (const w of nb) if (!seen.has(w)) next.push(w);
      adj[u] = next;
      push(next.length, u);
    }
    adj[v] = [];
  }
  return perm;
}

/** Symmetric CSC pattern (sorted columns, diagonal included) of an edge list. */
function pattern(n: number, edges: [number, number][]): { colPtr: Int32Array; rowIdx: Int32Array } {
  const cols: Set<number>[] = Array.from({ length: n }, (_, j) => new Set([j]));
  for (const [a, b] of edges) {
    cols[a].add(b);
    cols[b].add(a);
  }
  const colPtr = new Int32Array(n + 1);
  const rows: number[] = [];
  for (let j = 0; j < n; j++) {
    rows.push(...[...cols[j]].sort((x, y) => x - y));
    colPtr[j + 1] = rows.length;
  }
  return { colPtr, rowIdx: Int32Array.from(rows) };
}

const check = (n: number, edges: [number, number][]) => {
  const { colPtr, rowIdx } = pattern(n, edges);
  const perm = [...minimumDegreeOrder(n, colPtr, rowIdx)];
  expect(perm).toEqual(referenceOrder(n, colPtr, rowIdx));
  expect([...perm].sort((a, b) => a - b)).toEqual(Array.from({ length: n }, (_, i) => i));
};

describe('minimum-degree ordering', () => {
  it('matches the list-per-vertex reference on random sparse and dense graphs', () => {
    const rnd = prng(2026);
    for (let t = 0; t < 40; t++) {
      const n = 2 + Math.floor(rnd() * 60);
      const density = t % 4 === 0 ? 0.5 : 2.5 / n;
      const edges: [number, number][] = [];
      for (let a = 0; a < n; a++) for (let b = a + 1; b < n; b++) if (rnd() < density) edges.push([a, b]);
      check(n, edges);
    }
  });

  it('matches the reference on radial four-wire feeders (a clique per bus, tied to its parent bus)', () => {
    const rnd = prng(14);
    for (const buses of [1, 7, 40, 200]) {
      const edges: [number, number][] = [];
      for (let b = 0; b < buses; b++) {
        const node = (bus: number, c: number) => 4 * bus + c;
        for (let c = 0; c < 4; c++) for (let d = c + 1; d < 4; d++) if (rnd() < 0.7) edges.push([node(b, c), node(b, d)]);
        if (b > 0) {
          const parent = Math.floor(rnd() * b);
          for (let c = 0; c < 4; c++) edges.push([node(parent, c), node(b, c)]);
        }
      }
      check(4 * buses, edges);
    }
  });

  it('matches the reference with isolated vertices and a complete graph', () => {
    check(5, []);
    const k: [number, number][] = [];
    for (let a = 0; a < 12; a++) for (let b = a + 1; b < 12; b++) k.push([a, b]);
    check(12, k);
  });
});
