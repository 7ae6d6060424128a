/** The study cases part of the revision diff, in words. */
import { describe, expect, it } from 'vitest';
import { caseDiff, diffRevisions, type ResultsSummary } from '../../../shared/review/index.ts';

const circuit = (cases?: unknown[]) => ({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [], ...(cases ? { cases } : {}) });
const texts = (a: unknown, b: unknown) => caseDiff(a, b).map((l) => l.text);

describe('case diff', () => {
  it('a new case and each of its changes, in words', () => {
    const lost = { id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }, { element: 'KITCHEN', set: { each: { kw: 3 } } }, { add: { type: 'fault', id: 'F1', bus: 'HOUSE', kind: 'lineEarth' } }, { remove: 'ROD' }] };
    expect(texts(circuit(), circuit([lost]))).toEqual([
      'case "Neutral lost" added (4 changes)',
      'case "Neutral lost": DROP open n added',
      'case "Neutral lost": adds F1 (fault) added',
      'case "Neutral lost": removes ROD added',
      'case "Neutral lost": KITCHEN each.kw 3 added',
      'case "Neutral lost": new F1 bus HOUSE added',
      'case "Neutral lost": new F1 kind lineEarth added',
    ]);
  });

  it('a change added to an existing case, a value changed, a change dropped, a rename, a removed case', () => {
    const before = [
      { id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'KITCHEN', set: { each: { kw: 3 } } }, { remove: 'ROD' }] },
      { id: 'peak', changes: [] },
    ];
    const after = [{ id: 'lost-n', name: 'Neutral lost at the drop', changes: [{ element: 'DROP', set: { open: ['n'] } }, { element: 'KITCHEN', set: { each: { kw: 4 } } }] }];
    expect(texts(circuit(before), circuit(after))).toEqual([
      'case "Neutral lost" renamed "Neutral lost at the drop"',
      'case "Neutral lost at the drop": DROP open n added',
      'case "Neutral lost at the drop": removes ROD removed',
      'case "Neutral lost at the drop": KITCHEN each.kw 3 → 4',
      'case "peak" removed',
    ]);
    expect(texts(circuit(after), circuit(after))).toEqual([]);
  });

  it('the revision diff carries the cases apart from the other circuit changes', () => {
    const ok: ResultsSummary = { ok: true, buses: [], neutralCurrents: [], flags: [] };
    const d = diffRevisions(
      { number: 1, content: { circuit: circuit() }, summary: ok },
      { number: 2, content: { circuit: circuit([{ id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] }]) }, summary: ok },
    );
    expect(d.circuit).toEqual([]);
    expect(d.cases.map((c) => c.text)).toEqual(['case "Neutral lost" added (1 change)', 'case "Neutral lost": DROP open n added']);
  });
});
