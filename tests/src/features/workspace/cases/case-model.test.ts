import { describe, expect, it } from 'vitest';
import { applyCase, demoCircuits, setPath, solveCircuit, type CircuitInput, type StudyCase } from '../../../../../shared/engine/index.ts';
import {
  addCase,
  caseFromPoint,
  caseNameProblem,
  changedElements,
  deleteCase,
  drawnElementsOf,
  numericParameters,
  overrideRows,
  removeOverride,
  renameCase,
  setOverride,
  setStudyCases,
} from '../../../../../src/features/workspace/cases/case-model.ts';
import { defaultSettings } from '../../../../../src/features/workspace/model/layout.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const base = { ...demo, elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) } as CircuitInput;
const withCases = (cases: StudyCase[]) => ({ ...base, cases }) as CircuitInput;
const house = (c: CircuitInput) => solveCircuit(c).buses.find((b) => b.bus === 'HOUSE')!;

describe('case editor model', () => {
  it('creates, renames and deletes cases, refusing empty, reserved and duplicate names', () => {
    let cases = addCase([], 'Peak evening');
    cases = addCase(cases, 'Neutral lost');
    expect(cases.map((c) => c.name)).toEqual(['Peak evening', 'Neutral lost']);
    expect(new Set(cases.map((c) => c.id)).size).toBe(2);
    expect(caseNameProblem(cases, '  ')).toMatch(/name/);
    expect(caseNameProblem(cases, 'base')).toMatch(/Base/);
    expect(caseNameProblem(cases, 'neutral LOST')).toMatch(/already exists/);
    expect(caseNameProblem(cases, 'Neutral lost', cases[1].id)).toBeNull();
    cases = renameCase(cases, cases[0].id, 'Peak');
    expect(cases[0].name).toBe('Peak');
    cases = deleteCase(cases, cases[0].id);
    expect(cases.map((c) => c.name)).toEqual(['Neutral lost']);
  });

  it('offers the numeric values of elements as drawn, never generated ones', () => {
    const kitchen = drawnElementsOf(base).find((e) => e.id === 'KITCHEN')!;
    expect(numericParameters(kitchen).map((p) => [p.path, p.value])).toEqual([
      ['each.kw', 1.5],
      ['each.kvar', 0.2],
    ]);
    expect(numericParameters(kitchen)[0].label).toBe('every phase › P (kW)');
    const withSwitch = { ...base, elements: [...base.elements, { type: 'switch3', id: 'KITCHEN~bus~sw', from: 'HOUSE', to: 'X' }] };
    expect(drawnElementsOf(withSwitch).map((e) => e.id)).not.toContain('KITCHEN~bus~sw');
  });

  it('an override becomes a set of the top-level field, and the case solves as the edited circuit does', () => {
    let cases = addCase([], 'Heavy kitchen, neutral lost');
    const id = cases[0].id;
    cases = setOverride(cases, id, base, 'KITCHEN', 'each.kw', 3);
    cases = setOverride(cases, id, base, 'DROP', 'open', ['n']);
    cases = setOverride(cases, id, base, 'KITCHEN', 'each.kvar', 0.5);
    expect(cases[0].changes).toEqual([
      { element: 'KITCHEN', set: { each: { kw: 3, kvar: 0.5 } } },
      { element: 'DROP', set: { open: ['n'] } },
    ]);
    // the same circuit edited directly (setPath on the base)
    let direct = setPath(base, 'KITCHEN.each.kw', 3);
    direct = setPath(direct, 'KITCHEN.each.kvar', 0.5);
    direct = { ...direct, elements: direct.elements.map((e) => (e.id === 'DROP' ? { ...e, open: ['n'] } : e)) } as CircuitInput;
    const viaCase = house(applyCase(withCases(cases), id));
    expect(viaCase.neutralToEarth!.mag).toBeCloseTo(house(direct).neutralToEarth!.mag, 9);
    expect(viaCase.neutralToEarth!.mag).toBeGreaterThan(house(base).neutralToEarth!.mag + 1);

    const rows = overrideRows(cases[0], base);
    expect(rows.map((r) => r.text)).toEqual(['KITCHEN: every phase › P (kW) 1.5 → 3; every phase › Q (kvar) 0.2 → 0.5', 'DROP: open conductors none → neutral']);
    expect([...changedElements(cases[0])]).toEqual(['KITCHEN', 'DROP']);
    for (const r of rows) expect(r.text).not.toMatch(/[{}~]|"/);

    cases = removeOverride(cases, id, 0, 'each');
    expect(cases[0].changes).toEqual([{ element: 'DROP', set: { open: ['n'] } }]);
  });

  it('a sweep point becomes a case on top of the case it ran on', () => {
    let cases = addCase([], 'Neutral lost');
    cases = setOverride(cases, cases[0].id, base, 'DROP', 'open', ['n']);
    const next = caseFromPoint(cases, base, cases[0].id, [{ elementId: 'HEATER', path: 'each.kw' }], [2.5], 'Sweep point');
    expect(next).toHaveLength(2);
    expect(next[1].name).toBe('Sweep point');
    const shift = house(applyCase(withCases(next), next[1].id)).neutralToEarth!.mag;
    const direct = house(setPath(applyCase(withCases(cases), cases[0].id), 'HEATER.each.kw', 2.5)).neutralToEarth!.mag;
    expect(shift).toBeCloseTo(direct, 9);
  });

  it('the case list is part of the document settings (saved with the study), and an empty list removes it', () => {
    const doc = { nodes: [], edges: [], settings: defaultSettings() };
    const one = setStudyCases(doc, addCase([], 'A'));
    expect(one.settings.cases).toHaveLength(1);
    expect('cases' in setStudyCases(one, []).settings).toBe(false);
  });
});
