import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput, type CircuitResult } from '../../../../../shared/engine/index.ts';
import { createSolveHandler, elementIdsFromIssues, toLiveSolveError } from '../../../../../src/features/workspace/solve/solve-handler.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

/** Largest difference between two results' node voltages, V. */
function maxNodeDiff(a: CircuitResult, b: CircuitResult): number {
  expect(Object.keys(a.nodes).sort()).toEqual(Object.keys(b.nodes).sort());
  return Math.max(...Object.keys(a.nodes).map((n) => Math.hypot(a.nodes[n].re - b.nodes[n].re, a.nodes[n].im - b.nodes[n].im)));
}

describe('solve worker handler', () => {
  it('answers every demo circuit with the same result as solveCircuit', () => {
    const handle = createSolveHandler();
    demoCircuits.forEach((d, i) => {
      const res = handle({ id: i + 1, circuit: d.circuit });
      if (!res.ok) throw new Error(res.error.message);
      expect(res.id).toBe(i + 1);
      const direct = solveCircuit(d.circuit);
      expect(maxNodeDiff(res.result, direct)).toBeLessThan(1e-9);
      expect(res.result.flags.map((f) => f.message)).toEqual(direct.flags.map((f) => f.message));
      expect(res.ms).toBeGreaterThanOrEqual(0);
    });
  });

  it('reuses the topology when only a value changes, and the answer follows the new value', () => {
    const handle = createSolveHandler();
    const first = handle({ id: 1, circuit: openNeutral });
    expect(first.ok).toBe(true);
    const heavier: CircuitInput = {
      ...openNeutral,
      elements: openNeutral.elements.map((e) => (e.id === 'HEATER' ? { ...e, each: { kw: 6, kvar: 0 } } : e)) as CircuitInput['elements'],
    };
    const second = handle({ id: 2, circuit: heavier });
    if (!second.ok) throw new Error(second.error.message);
    expect(second.timings.analyzeMs).toBe(0); // no new symbolic analysis
    expect(maxNodeDiff(second.result, solveCircuit(heavier))).toBeLessThan(1e-9);
    const shift = (r: CircuitResult) => r.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag;
    expect(shift(second.result)).not.toBeCloseTo(shift((first as { result: CircuitResult }).result), 1);
  });

  it('applies limit overrides from the request', () => {
    const res = createSolveHandler()({ id: 1, circuit: openNeutral, limits: { set: 'iec-en' } });
    if (!res.ok) throw new Error(res.error.message);
    expect(res.result.limits.id).toBe('iec-en');
  });

  it('returns an invalid circuit as plain typed fields with field-level issues, and survives a clone', () => {
    const bad = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'KITCHEN' ? { ...e, each: { kw: 'lots' } } : e)) };
    const res = createSolveHandler()({ id: 7, circuit: bad });
    expect(res.ok).toBe(false);
    if (res.ok) return;
    const cloned = structuredClone(res); // what postMessage does
    expect(cloned.id).toBe(7);
    expect(cloned.error.code).toBe('invalid-circuit');
    expect(cloned.error.issues?.length).toBeGreaterThan(0);
    expect(cloned.error.issues!.some((i) => i.path.startsWith('elements[2]'))).toBe(true);
    expect(cloned.error.elementIds).toEqual(['KITCHEN']); // taken from the issue path, for the canvas
    // Each issue also as a form error naming the element as drawn, never a file path.
    const texts = cloned.error.issues!.map((i) => i.text ?? '');
    expect(texts.some((t) => t.startsWith('element KITCHEN: '))).toBe(true);
    expect(texts.join(' ')).not.toMatch(/elements\[/);
  });

  it('names the element of an engine error (a switch to a node nothing else uses), then solves the next good request', () => {
    const handle = createSolveHandler();
    const withSwitch = { ...openNeutral, elements: [...openNeutral.elements, { type: 'switch', id: 'SW9', from: 'HOUSE.a', to: 'NOWHERE.a', closed: true }] };
    const res = handle({ id: 1, circuit: withSwitch });
    expect(res.ok).toBe(false);
    if (!res.ok) {
      expect(res.error.elementIds).toEqual(['SW9']);
      expect(res.error.nodes).toEqual(['NOWHERE.a']);
      expect(res.error.message).toContain('SW9');
    }
    const next = handle({ id: 2, circuit: openNeutral });
    expect(next.ok).toBe(true);
  });

  it('maps issue paths to element ids and ignores paths outside the element list', () => {
    const circuit = { elements: [{ id: 'A' }, { id: 'B' }] };
    expect(elementIdsFromIssues(circuit, [{ path: 'elements[1].kw' }, { path: 'elements[1].kvar' }, { path: 'frequencyHz' }, { path: 'elements[5].x' }])).toEqual(['B']);
    expect(elementIdsFromIssues('not a circuit', [{ path: 'elements[0]' }])).toEqual([]);
  });

  it('turns an unexpected throw into an internal error with a plain message', () => {
    expect(toLiveSolveError(new TypeError('x is undefined'))).toEqual({ code: 'internal', message: 'The solver stopped unexpectedly: x is undefined', elementIds: [], nodes: [] });
  });
});
