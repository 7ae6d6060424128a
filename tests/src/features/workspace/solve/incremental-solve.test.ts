/**
 * The live solve sends the worker only the elements an edit changed and the worker re-validates and
 * re-expands only those: every answer must equal a fresh full solve of the same circuit. Seeded
 * sequences of edits of every kind (values, opened and closed conductors, a source's voltage, an
 * element removed and added back, a renamed element, an invalid value and its fix, undo to an
 * earlier circuit, a study case switched), each request cloned as postMessage clones it.
 */
import { describe, expect, it } from 'vitest';
import { applyCase, demoCircuits, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { createSolveHandler } from '../../../../../src/features/workspace/solve/solve-handler.ts';
import type { SolveResponse } from '../../../../../src/features/workspace/solve/solve-protocol.ts';
import { changedElements, createRequestEncoder } from '../../../../../src/features/workspace/solve/solve-request.ts';
import { study300 } from '../../../../bench/workspace/study-300.ts';

type El = Record<string, unknown> & { id: string; type: string };

function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** Every number of two answers within 1e-12 (relative to the larger, at least 1), every other value equal. */
function expectSame(a: unknown, b: unknown, path = 'result'): void {
  if (typeof a === 'number' && typeof b === 'number') {
    if (Number.isNaN(a) && Number.isNaN(b)) return;
    if (Math.abs(a - b) > 1e-12 * Math.max(1, Math.abs(a), Math.abs(b))) throw new Error(`${path}: ${a} ≠ ${b}`);
    return;
  }
  if (typeof a !== 'object' || a === null || typeof b !== 'object' || b === null) {
    if (a !== b) throw new Error(`${path}: ${String(a)} ≠ ${String(b)}`);
    return;
  }
  if (Array.isArray(a) !== Array.isArray(b)) throw new Error(`${path}: array against object`);
  const ka = Object.keys(a).sort();
  const kb = Object.keys(b).sort();
  if (ka.join() !== kb.join()) throw new Error(`${path}: keys ${ka.join()} ≠ ${kb.join()}`);
  for (const k of ka) expectSame((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
}

function expectAnswersEqual(incremental: SolveResponse, fresh: SolveResponse, step: string): void {
  expect(incremental.ok, `${step}: ${incremental.ok ? '' : incremental.error.message} / ${fresh.ok ? '' : fresh.error.message}`).toBe(fresh.ok);
  if (incremental.ok && fresh.ok) expectSame(incremental.result, fresh.result, step);
  else if (!incremental.ok && !fresh.ok) expect(incremental.error).toEqual(fresh.error);
}

/** A number inside an element worth scaling (kW, kvar, lengths, ohms, kV, kVA …), as a path of keys. */
function numericLeaves(v: unknown, path: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  if (typeof v === 'number') out.push(path);
  else if (Array.isArray(v)) v.forEach((x, i) => numericLeaves(x, [...path, i], out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) numericLeaves(x, [...path, k], out);
  return out;
}

/** A copy of `el` with the value at `path` replaced (new objects along the path only, as the workspace's edits make). */
function setIn(v: unknown, path: (string | number)[], value: unknown): unknown {
  if (path.length === 0) return value;
  const [k, ...rest] = path;
  if (Array.isArray(v)) return v.map((x, i) => (i === k ? setIn(x, rest, value) : x));
  const o = v as Record<string, unknown>;
  return { ...o, [k]: setIn(o[k], rest, value) };
}

type Edit = (c: CircuitInput, rnd: () => number, history: CircuitInput[]) => CircuitInput | null;

const withElements = (c: CircuitInput, els: El[]): CircuitInput => ({ ...c, elements: els as unknown as CircuitInput['elements'] });
const elementsOf = (c: CircuitInput) => c.elements as unknown as El[];
const pick = <T,>(xs: readonly T[], rnd: () => number): T => xs[Math.floor(rnd() * xs.length)];

const EDITS: Record<string, Edit> = {
  value(c, rnd) {
    const els = elementsOf(c);
    const i = Math.floor(rnd() * els.length);
    const leaves = numericLeaves(els[i]).filter((p) => !['clock', 'shiftDeg', 'tap', 'xFt', 'yFt'].includes(String(p[p.length - 1])));
    if (leaves.length === 0) return null;
    const p = pick(leaves, rnd);
    const old = p.reduce<unknown>((o, k) => (o as Record<string | number, unknown>)[k], els[i]) as number;
    const next = els.slice();
    next[i] = setIn(els[i], p, old === 0 ? rnd() : old * (0.8 + 0.4 * rnd())) as El;
    return withElements(c, next);
  },
  load(c, rnd) {
    const els = elementsOf(c);
    const loads = els.map((e, i) => [e, i] as const).filter(([e]) => e.type === 'load' && (e.each as { kw?: number } | undefined)?.kw !== undefined);
    if (loads.length === 0) return null;
    const [e, i] = pick(loads, rnd);
    const next = els.slice();
    next[i] = setIn(e, ['each', 'kw'], +(1 + 30 * rnd()).toFixed(3)) as El;
    return withElements(c, next);
  },
  openConductor(c, rnd) {
    const els = elementsOf(c);
    const ways = els.map((e, i) => [e, i] as const).filter(([e]) => e.type === 'line' || e.type === 'switch3');
    if (ways.length === 0) return null;
    const [e, i] = pick(ways, rnd);
    const open = (e.open as string[] | undefined) ?? [];
    const conductor = pick(['a', 'b', 'c', 'n'], rnd);
    const next = els.slice();
    next[i] = { ...e, open: open.includes(conductor) ? open.filter((x) => x !== conductor) : [...open, conductor] };
    return withElements(c, next);
  },
  sourceVoltage(c, rnd) {
    const els = elementsOf(c);
    const i = els.findIndex((e) => e.type === 'source');
    if (i < 0) return null;
    const next = els.slice();
    next[i] = { ...els[i], kvLL: +((els[i].kvLL as number) * (0.95 + 0.1 * rnd())).toFixed(4) };
    return withElements(c, next);
  },
  removeAndAdd(c, rnd) {
    const els = elementsOf(c);
    const loads = els.map((e, i) => [e, i] as const).filter(([e]) => e.type === 'load');
    if (loads.length === 0) return null;
    const [e, i] = pick(loads, rnd);
    const next = els.filter((_, k) => k !== i);
    next.push(e); // removed, then added back at the end (two edits in one)
    return withElements(c, next);
  },
  remove(c, rnd) {
    const els = elementsOf(c);
    const loads = els.map((e, i) => [e, i] as const).filter(([e]) => e.type === 'load');
    if (loads.length < 2) return null;
    const [, i] = pick(loads, rnd);
    return withElements(
      c,
      els.filter((_, k) => k !== i),
    );
  },
  rename(c, rnd) {
    const els = elementsOf(c);
    const loads = els.map((e, i) => [e, i] as const).filter(([e]) => e.type === 'load');
    if (loads.length === 0) return null;
    const [e, i] = pick(loads, rnd);
    const next = els.slice();
    // now and then to a name another element already has (a duplicate id, refused as the full check refuses it)
    next[i] = { ...e, id: rnd() < 0.3 ? pick(els, rnd).id : `${e.id}x` };
    return withElements(c, next);
  },
  invalid(c, rnd) {
    const els = elementsOf(c);
    const i = Math.floor(rnd() * els.length);
    const next = els.slice();
    next[i] = rnd() < 0.5 ? { ...els[i], bus: 7 } : { ...els[i], type: 'load', each: { kw: 'lots' } };
    return withElements(c, next);
  },
  undo(_c, rnd, history) {
    return history.length > 1 ? history[Math.floor(rnd() * (history.length - 1))] : null;
  },
};

function run(base: CircuitInput, seed: number, steps: number, kinds: string[]) {
  const rnd = lcg(seed);
  const handle = createSolveHandler();
  const encode = createRequestEncoder();
  const history: CircuitInput[] = [base];
  let c = base;
  const seen = new Set<string>();
  for (let s = 0; s <= steps; s++) {
    let kind = 'first';
    if (s > 0) {
      kind = pick(kinds, rnd);
      const next = EDITS[kind](c, rnd, history);
      if (!next) continue;
      c = next;
      history.push(c);
    }
    const message = structuredClone(encode({ id: s + 1, circuit: c })); // as postMessage delivers it
    if (message.changes) seen.add('delta');
    const incremental = handle(message);
    const fresh = createSolveHandler()({ id: s + 1, circuit: structuredClone(c) });
    expectAnswersEqual(incremental, fresh, `seed ${seed} step ${s} (${kind})`);
    seen.add(incremental.ok ? 'ok' : 'error');
  }
  return seen;
}

describe('incremental live solve', () => {
  it('sends only the changed elements, and everything when the other fields or the count change', () => {
    const c = demoCircuits[0].circuit;
    const els = c.elements.slice();
    els[2] = { ...els[2] };
    expect(changedElements(c, { ...c, elements: els })).toEqual([]); // equal by value: nothing to send
    els[2] = { ...els[2], id: 'OTHER' } as (typeof els)[number];
    expect(changedElements(c, { ...c, elements: els })).toEqual([2]);
    expect(changedElements(c, { ...c, elements: els.slice(1) })).toBeNull();
    expect(changedElements(c, { ...c, frequencyHz: 50 })).toBeNull();
    const encode = createRequestEncoder();
    expect(encode({ id: 1, circuit: c }).circuit).toBe(c);
    const second = encode({ id: 2, circuit: { ...c, elements: els } });
    expect(second.circuit).toBeUndefined();
    expect(second.changes).toEqual({ at: [2], elements: [els[2]] });
  });

  it('equals a fresh full solve after every edit of every kind (every demo study, 300-element study)', () => {
    const kinds = Object.keys(EDITS);
    const seen = new Set<string>();
    demoCircuits.forEach((d, k) => {
      for (const seed of [1, 2, 3]) for (const x of run(d.circuit, 100 * k + seed, 40, kinds)) seen.add(x);
    });
    for (const x of run(study300(), 77, 25, kinds)) seen.add(x);
    // value edits only, as typed in the properties panel: every one takes the swap path
    for (const x of run(study300(), 78, 15, ['load', 'value'])) seen.add(x);
    expect([...seen].sort()).toEqual(['delta', 'error', 'ok']);
  }, 120_000);

  it('equals a fresh full solve when a study case is switched and edited', () => {
    const plain = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
    const base: CircuitInput = {
      ...plain,
      cases: [
        { id: 'lost', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] },
        { id: 'heavy', name: 'Heavy kitchen', changes: [{ element: 'KITCHEN', set: { each: { kw: 9, kvar: 1 } } }, { remove: 'HEATER' }] },
      ],
    };
    expect(base.elements.some((e) => e.id === 'DROP') && base.elements.some((e) => e.id === 'HEATER')).toBe(true);
    const handle = createSolveHandler();
    const encode = createRequestEncoder();
    const lost = applyCase(base, 'lost');
    const edited = { ...lost, elements: lost.elements.map((e) => (e.id === 'KITCHEN' ? { ...e, each: { kw: 4, kvar: 0.5 } } : e)) } as CircuitInput;
    const circuits: CircuitInput[] = [base, lost, edited, applyCase(base, 'heavy'), base, lost];
    circuits.forEach((c, i) => {
      const incremental = handle(structuredClone(encode({ id: i + 1, circuit: c })));
      expect(incremental.ok).toBe(true);
      expectAnswersEqual(incremental, createSolveHandler()({ id: i + 1, circuit: structuredClone(c) }), `case ${i}`);
    });
  });
});
