/** Revision diff, results summary and @mentions (shared/review): pure logic shared by server and client. */
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import {
  diffRevisions,
  findMentions,
  flatten,
  formatValue,
  jsonEqual,
  resultDeltas,
  summarizeCircuit,
  valueChanges,
  type ResultsSummary,
} from '../../../shared/review/index.ts';

const openNeutralService = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;

/** A hand-made summary: one bus "Bus 4" with a line L4 feeding it. */
function summary(neutralAmps: number, phaseA: number, flags: { code: 'voltage-high' | 'neutral-shift'; conductor?: string; message: string }[] = []): ResultsSummary {
  return {
    ok: true,
    buses: [{ bus: 'Bus 4', kind: 'threePhase', nominalVLN: 120, phaseVolts: { a: phaseA, b: 120, c: 120 }, neutralShiftVolts: 0.5, iecUnbalancePercent: 0.4 }],
    neutralCurrents: [{ key: 'L4@Bus 4', elementId: 'L4', bus: 'Bus 4', amps: neutralAmps }],
    flags: flags.map((f) => ({ key: `${f.code}|Bus 4||${f.conductor ?? ''}`, severity: 'violation', code: f.code, bus: 'Bus 4', conductor: f.conductor, value: 131, unit: 'V', message: f.message })),
  };
}

describe('value changes', () => {
  it('flattens nested objects and arrays to dotted paths', () => {
    expect([...flatten({ a: { b: 1, c: [2, { d: 3 }] }, e: [] }).entries()]).toEqual([
      ['a.b', 1],
      ['a.c.0', 2],
      ['a.c.1.d', 3],
      ['e', []],
    ]);
  });

  it('compares JSON regardless of key order and lists changes parameter by parameter', () => {
    expect(jsonEqual({ a: 1, b: [1, 2] }, { b: [1, 2], a: 1 })).toBe(true);
    expect(jsonEqual({ a: 1 }, { a: 1, b: undefined })).toBe(true);
    expect(jsonEqual([1, 2], [2, 1])).toBe(false);
    expect(valueChanges({ each: { kw: 1.5, kvar: 0.2 }, open: ['n'] }, { each: { kw: 4, kvar: 0.2 } })).toEqual([
      { path: 'each.kw', from: 1.5, to: 4, label: 'every phase › P (kW)', fromText: '1.5', toText: '4' },
      { path: 'open', from: ['n'], to: null, label: 'open conductors', fromText: 'neutral', toText: '—' },
    ]);
  });
});

describe('result deltas', () => {
  it('reads as "neutral current at Bus 4 (L4): 12.1 A → 83.3 A" with the delta in the unit', () => {
    const d = resultDeltas(summary(12.1, 120), summary(83.3, 120));
    expect(d).toHaveLength(1);
    expect(d[0]).toMatchObject({ kind: 'neutral-current', unit: 'A', from: 12.1, to: 83.3, text: 'neutral current at Bus 4 (L4): 12.1 A → 83.3 A' });
    expect(d[0].delta).toBeCloseTo(71.2, 10);
  });

  it('lists houses numbered in names in their numeric order (No 2 before No 10)', () => {
    const withHouses = (amps: number): ResultsSummary => {
      const s = summary(12.1, 120);
      if (!s.ok) throw new Error('ok summary');
      return { ...s, neutralCurrents: ['No 10', 'No 2', 'No 1'].map((id) => ({ key: `${id}@Bus 4`, elementId: id, bus: 'Bus 4', amps })) };
    };
    expect(resultDeltas(withHouses(1), withHouses(5)).map((r) => r.label)).toEqual(['neutral current at Bus 4 (No 1)', 'neutral current at Bus 4 (No 2)', 'neutral current at Bus 4 (No 10)']);
  });

  it('ignores changes within 0.05 of the unit and lists rows that appear or disappear', () => {
    expect(resultDeltas(summary(12.1, 120), summary(12.14, 120.04))).toEqual([]);
    const gone = resultDeltas(summary(12.1, 120), { ok: false, error: { code: 'singular-network', message: 'x', elementIds: [] } });
    expect(gone.map((r) => r.text)).toContain('neutral current at Bus 4 (L4): 12.1 A → —');
    expect(gone.every((r) => r.to === null && r.delta === null)).toBe(true);
  });

  it('formats volts and amperes to 0.1 and percentages to 0.01', () => {
    expect(formatValue(131.04, 'V')).toBe('131.0 V');
    expect(formatValue(2.345, '%')).toBe('2.35 %');
    expect(formatValue(null, 'A')).toBe('—');
  });
});

describe('diffRevisions', () => {
  const circuit = (elements: unknown[], extra: object = {}) => ({ format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements, ...extra });

  it('lists elements added, removed and changed, circuit-level changes, layout and settings', () => {
    const a = { id: 'A', type: 'load', each: { kw: 1 } };
    const b = { id: 'B', type: 'line', length: 30 };
    const c = { id: 'C', type: 'earthing', ohms: 25 };
    const d = diffRevisions(
      { number: 1, content: { circuit: circuit([a, b]), layout: { A: { x: 0 } } }, summary: summary(1, 120) },
      { number: 2, content: { circuit: circuit([{ ...a, each: { kw: 2 } }, c], { frequencyHz: 50 }), layout: { A: { x: 40 } }, settings: { grid: true } }, summary: summary(1, 120) },
    );
    expect(d.from).toBe(1);
    expect(d.to).toBe(2);
    expect(d.elements.added).toEqual([{ id: 'C', type: 'earthing', typeLabel: 'earth electrode' }]);
    expect(d.elements.removed).toEqual([{ id: 'B', type: 'line', typeLabel: 'line' }]);
    expect(d.elements.changed).toEqual([{ id: 'A', type: 'load', typeLabel: 'load', changes: [{ path: 'each.kw', from: 1, to: 2, label: 'every phase › P (kW)', fromText: '1', toText: '2' }] }]);
    expect(d.circuit).toEqual([{ path: 'frequencyHz', from: 60, to: 50, label: 'frequency (Hz)', fromText: '60', toText: '50' }]);
    expect(d.layoutChanged).toBe(true);
    expect(d.settingsChanged).toBe(true);
    expect(d.results).toEqual([]);
  });

  it('reports flags added and removed by their identity, not their value', () => {
    const high = { code: 'voltage-high' as const, conductor: 'b', message: 'phase B 131 V above Range B' };
    const shift = { code: 'neutral-shift' as const, message: 'neutral shift 47 %' };
    const d = diffRevisions(
      { number: 3, content: { circuit: circuit([]) }, summary: summary(1, 120, [shift]) },
      { number: 4, content: { circuit: circuit([]) }, summary: summary(1, 120, [high, shift]) },
    );
    expect(d.flags.added.map((f) => f.text)).toEqual(['flag added: phase B 131 V above Range B']);
    expect(d.flags.removed).toEqual([]);
  });

  it('compares an engine-solved open neutral with the repaired neutral: the neutral current appears and the flags clear', () => {
    // The demo service with its neutral broken (open: ["n"] on DROP), then repaired.
    const broken = { circuit: openNeutralService };
    const repairedCircuit = { ...openNeutralService, elements: openNeutralService.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };
    const d = diffRevisions(
      { number: 1, content: broken, summary: summarizeCircuit(broken.circuit) },
      { number: 2, content: { circuit: repairedCircuit }, summary: summarizeCircuit(repairedCircuit) },
    );
    expect(d.solve).toEqual({ from: 'ok', to: 'ok' });
    expect(d.elements.changed).toEqual([{ id: 'DROP', type: 'line', typeLabel: 'line', changes: [{ path: 'open', from: ['n'], to: [], label: 'open conductors', fromText: 'neutral', toText: 'none' }] }]);
    const drop = d.results.find((r) => r.key === 'neutral-current:DROP@HOUSE')!;
    // (P) With the neutral open the drop carries no neutral current; repaired, it carries the
    // unbalance of 12.5 A, 33 A and 5 A phase currents (C: 1.5 kW, 4 kW, 0.6 kW at ~120 V), well over 10 A.
    expect(drop.from).toBeCloseTo(0, 3);
    expect(drop.to!).toBeGreaterThan(10);
    expect(drop.text).toMatch(/^neutral current at HOUSE \(DROP\): 0\.0 A → \d+\.\d A$/);
    // Results put neutral currents first, as a lost-neutral review reads them.
    expect(d.results[0].kind).toBe('neutral-current');
    // Bus phases a and c high, b low; the three loads' own terminal voltages; phase-voltage unbalance.
    expect(d.flags.removed.map((f) => f.code).sort()).toEqual(['load-voltage-high', 'load-voltage-high', 'load-voltage-low', 'neutral-shift', 'unbalance', 'voltage-high', 'voltage-high', 'voltage-low']);
    expect(d.flags.added).toEqual([]);
  });

  it('carries the engine error of a revision that cannot be solved', () => {
    const bad = circuit([{ type: 'load', id: 'L', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 1, kvar: 0 } }]);
    const s = summarizeCircuit(bad);
    expect(s.ok).toBe(false);
    const d = diffRevisions({ number: 1, content: { circuit: bad }, summary: s }, { number: 2, content: { circuit: bad }, summary: s });
    expect(d.solve.from).toBe('error');
    expect(d.solve.toError).toEqual(expect.any(String));
  });
});

describe('summarizeCircuit', () => {
  it('keeps bus voltages, neutral shift, unbalance, neutral currents and flags of the open-neutral demo', () => {
    const s = summarizeCircuit(openNeutralService);
    if (!s.ok) throw new Error(s.error.message);
    const house = s.buses.find((b) => b.bus === 'HOUSE')!;
    expect(Object.keys(house.phaseVolts).sort()).toEqual(['a', 'b', 'c']);
    // (P) the lightly loaded phases rise well above 120 V and the heavy one sags: the lost-neutral signature.
    expect(house.phaseVolts.c).toBeGreaterThan(130);
    expect(house.phaseVolts.b).toBeLessThan(110);
    expect(house.neutralShiftVolts!).toBeGreaterThan(12); // more than 10 % of 120 V, hence the flag below
    expect(s.flags.some((f) => f.code === 'neutral-shift' && f.bus === 'HOUSE')).toBe(true);
    expect(s.neutralCurrents.map((n) => n.key)).toContain('DROP@HOUSE');
    expect(JSON.parse(JSON.stringify(s))).toEqual(s);
  });
});

describe('findMentions', () => {
  const members = [
    { id: '1', name: 'Idunn Castellane', email: 'idunn.c@example.test' },
    { id: '2', name: 'Tobin Achterberg', email: 'tobin@example.test' },
    { id: '3', name: 'Tobin Marsh', email: 'tmarsh@example.test' },
  ];

  it('matches e-mail local parts, names without spaces and unique first names, each once', () => {
    const found = findMentions('@idunn.c please check, cc @TobinMarsh and @Idunn again. Not an@address.test', members);
    expect(found.map((m) => m.id)).toEqual(['1', '3']);
  });

  it('ignores an ambiguous first name and unknown tokens', () => {
    expect(findMentions('@tobin? @nobody', members).map((m) => m.id)).toEqual(['2']); // "tobin" is Tobin Achterberg's e-mail local part
    expect(findMentions('hello @Tobin.', members.slice(1).map((m) => ({ ...m, email: `${m.id}@x.test` })))).toEqual([]);
  });
});
