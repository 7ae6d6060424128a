/**
 * The workspace converts its document incrementally (`convert`: element nodes whose data object and
 * wiring are unchanged reuse their earlier conversion). On seeded random edit sequences made of the
 * document's own commands, the incremental conversion must equal a fresh full conversion after
 * every step, and must reuse exactly the elements an edit did not touch.
 */
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../../../shared/engine/index.ts';
import { canvasToCircuit } from '../../../../../src/features/workspace/model/canvas-to-circuit.ts';
import { circuitToCanvas } from '../../../../../src/features/workspace/model/circuit-to-canvas.ts';
import { convert } from '../../../../../src/features/workspace/model/conversion.ts';
import { PALETTE } from '../../../../../src/features/workspace/model/defaults.ts';
import * as commands from '../../../../../src/features/workspace/model/document.ts';
import type { WorkspaceDoc } from '../../../../../src/features/workspace/model/document.ts';
import { busConductors, isBusNode, isElementNode, type Conductor } from '../../../../../src/features/workspace/model/types.ts';

/** Small seeded PRNG (LCG, Numerical Recipes constants) (P). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

function docOfCircuit(i: number): WorkspaceDoc {
  const { nodes, edges, settings } = circuitToCanvas(demoCircuits[i % demoCircuits.length].circuit);
  return { nodes, edges, settings };
}

/** Scales every number of an element's parameters found under kw/kvar/length/kva keys (a new object). */
function scaled(el: unknown, f: number): unknown {
  if (Array.isArray(el)) return el.map((x) => scaled(x, f));
  if (el && typeof el === 'object') return Object.fromEntries(Object.entries(el).map(([k, v]) => [k, typeof v === 'number' && /^(kw|kvar|length|kva)$/.test(k) ? +(v * f).toPrecision(6) : scaled(v, f)]));
  return el;
}

/** One random edit through the document commands. */
function randomEdit(d: WorkspaceDoc, rnd: () => number): { doc: WorkspaceDoc; what: string } {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)];
  const elements = d.nodes.filter(isElementNode);
  const buses = d.nodes.filter(isBusNode);
  const kind = Math.floor(rnd() * 9);
  if (kind <= 2 && elements.length > 0) {
    const n = pick(elements);
    return { doc: commands.updateElement(d, n.id, scaled(n.data.element, 0.5 + rnd()) as typeof n.data.element), what: `update ${n.id}` };
  }
  if (kind === 3 && buses.length > 0) {
    const b = pick(buses);
    return { doc: commands.updateBus(d, b.id, { ...b.data, name: `${b.data.name}R`, kvLL: rnd() < 0.5 ? b.data.kvLL : 0.4 }), what: `rename ${b.data.name}` };
  }
  if (kind === 4 && d.edges.length > 0) {
    const e = pick(d.edges);
    const bus = buses.find((b) => b.id === e.target);
    const c = pick(bus ? busConductors(bus.data.splitPhase) : (['n'] as Conductor[]));
    return { doc: commands.toggleOpen(d, e.id, c), what: `toggle ${c} of ${e.id}` };
  }
  if (kind === 5 && elements.length > 0 && buses.length > 0) {
    // rewire a port of an element to another bus handle (possibly refused)
    const e = pick(d.edges.filter((x) => elements.some((n) => n.id === x.source)));
    const b = pick(buses);
    if (e) {
      const handle = pick(['all', ...busConductors(b.data.splitPhase)]);
      const ends = commands.resolveConnection(d, { source: e.source, sourceHandle: e.sourceHandle, target: b.id, targetHandle: handle });
      if (ends) return { doc: commands.connect(d, ends), what: `rewire ${e.id} to ${b.id}.${handle}` };
    }
  }
  if (kind === 6 && d.nodes.length > 2) {
    const n = pick(d.nodes);
    return { doc: commands.deleteSelection(commands.selectOnly(d, n.id)), what: `delete ${n.id}` };
  }
  if (kind === 7) {
    const item = pick(PALETTE);
    return { doc: commands.addItem(d, item, null), what: `add ${item.key}` };
  }
  if (kind === 8 && d.nodes.length > 0) {
    const n = pick(d.nodes);
    const clip = commands.copySelection(commands.selectOnly(d, n.id));
    return { doc: commands.paste(d, clip, null), what: `paste ${n.id}` };
  }
  return { doc: { ...d, settings: { ...d.settings, frequencyHz: d.settings.frequencyHz === 50 ? 60 : 50 } }, what: 'frequency' };
}

describe('incremental conversion', () => {
  for (let seed = 1; seed <= 12; seed++) {
    it(`equals the full conversion after every edit of a random sequence (seed ${seed})`, () => {
      const rnd = lcg(seed);
      let doc = docOfCircuit(seed);
      const log: string[] = [];
      for (let step = 0; step < 40; step++) {
        const { doc: next, what } = randomEdit(doc, rnd);
        log.push(what);
        doc = next;
        const incremental = convert(doc);
        const full = canvasToCircuit(doc.nodes, doc.edges, doc.settings);
        expect(incremental.circuit, log.join('; ')).toEqual(full.circuit);
        expect(incremental.map, log.join('; ')).toEqual(full.map);
        expect(incremental.problems, log.join('; ')).toEqual(full.problems);
      }
    });
  }

  it('reuses the elements an edit did not touch, and re-converts those it did', () => {
    const doc = docOfCircuit(0);
    const before = convert(doc).circuit.elements;
    const load = doc.nodes.filter(isElementNode).find((n) => n.data.element.type === 'load')!;
    const edited = commands.updateElement(doc, load.id, scaled(load.data.element, 2) as typeof load.data.element);
    const after = convert(edited).circuit.elements;
    expect(after).toHaveLength(before.length);
    for (let i = 0; i < after.length; i++) {
      if (after[i].id === load.id) expect(after[i]).not.toBe(before[i]);
      else expect(after[i]).toBe(before[i]);
    }
  });

  it('re-converts the elements wired to a renamed bus (their bus fields name it)', () => {
    const doc = docOfCircuit(0);
    const before = convert(doc).circuit.elements;
    const bus = doc.nodes.filter(isBusNode)[0];
    const wired = new Set(doc.edges.filter((e) => e.target === bus.id || e.source === bus.id).map((e) => (e.target === bus.id ? e.source : e.target)));
    const renamed = commands.updateBus(doc, bus.id, { ...bus.data, name: 'RENAMED' });
    const after = convert(renamed).circuit.elements;
    expect(wired.size).toBeGreaterThan(0);
    for (const el of after) {
      const old = before.find((e) => e.id === el.id)!;
      if (wired.has(el.id)) {
        expect(el).not.toBe(old);
        expect(JSON.stringify(el)).toContain('RENAMED');
      } else expect(el).toBe(old);
    }
  });
});
