/** User names only: internal expansions of an opened connection and engine type names read as what the user drew. */
import { describe, expect, it } from 'vitest';
import { demoCircuits } from '../../../shared/engine/index.ts';
import { circuitNames, conductorWords, countWords, diffRevisions, drawnCounts, drawnElements, parameterWords, summarizeCircuit, typeWord, valueWords } from '../../../shared/review/index.ts';

const base = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
/** The demo with its drop repaired, and KITCHEN's neutral opened the way the workspace writes one click on "Open neutral". */
const repaired = { ...base, elements: base.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };
const opened = {
  ...repaired,
  elements: [
    ...repaired.elements.map((e) => (e.id === 'KITCHEN' ? { ...e, bus: 'KITCHEN~bus' } : e)),
    { type: 'switch3', id: 'KITCHEN~bus~sw', from: 'HOUSE', to: 'KITCHEN~bus', conductors: ['a', 'b', 'c', 'n'], closed: true, open: ['n'] },
  ],
};
/** Any internal name: the marker, a primitive or block type name, or JSON. */
const INTERNAL = /~|switch3|capacitorBank|splitPhase|voltageSource|zipLoad|[{}]/;

describe('circuitNames', () => {
  const names = circuitNames(opened);

  it('finds the opened connection behind the hidden switch', () => {
    expect(names.openings).toEqual([
      { switchId: 'KITCHEN~bus~sw', element: 'KITCHEN', field: 'bus', bus: 'HOUSE', privateBus: 'KITCHEN~bus', conductors: ['a', 'b', 'c', 'n'], open: ['n'] },
    ]);
    expect(names.isHidden('KITCHEN~bus~sw')).toBe(true);
    expect(names.isHidden('KITCHEN')).toBe(false);
  });

  it('maps buses and elements back to what the user drew', () => {
    expect(names.drawnBus('KITCHEN~bus')).toBe('HOUSE');
    expect(names.drawnBus('PAD')).toBe('PAD');
    expect(names.bus('KITCHEN~bus')).toBe('KITCHEN terminals at HOUSE');
    expect(names.drawnElement('KITCHEN~bus~sw')).toBe('KITCHEN');
    expect(names.element('KITCHEN~bus~sw')).toBe('connection KITCHEN–HOUSE');
    expect(names.element('DROP')).toBe('DROP');
  });

  it('puts internal names in engine messages and flags into words', () => {
    expect(names.text('bus KITCHEN~bus b-n: 207.8 V = 1.730 pu is above the violation limit')).toBe('KITCHEN terminals at HOUSE b-n: 207.8 V = 1.730 pu is above the violation limit');
    expect(names.text('switch3 KITCHEN~bus~sw: cannot open "x"')).toBe('connection KITCHEN–HOUSE: cannot open "x"');
    expect(names.text('2 node(s) have no path to earth (KITCHEN~bus.n, HOUSE.n)')).toBe('2 node(s) have no path to earth (KITCHEN terminal N at HOUSE, HOUSE.n)');
    expect(names.text('switch KITCHEN~bus~sw/n is open')).toBe('conductor N of the connection KITCHEN–HOUSE is open');
    expect(names.text('capacitorBank CAP1: give "kvLL"; splitPhaseTransformer T1')).toBe('capacitor bank CAP1: give "kvLL"; single-phase transformer T1');
    expect(names.text('impedance KITCHEN/a is singular')).toBe('impedance KITCHEN (A) is singular');
    // Ordinary slashes stay as written.
    expect(names.text('kW/kvar of HOUSE')).toBe('kW/kvar of HOUSE');
  });

  it('reads every flag of a solved study with an opened neutral without an internal name', () => {
    const s = summarizeCircuit(opened);
    if (!s.ok) throw new Error(s.error.message);
    expect(s.flags.length).toBeGreaterThan(0);
    for (const f of s.flags) expect(names.text(f.message)).not.toMatch(INTERNAL);
  });

  it('reads a damaged generated name (no switch in the circuit) as its element', () => {
    const lone = circuitNames({ elements: [{ type: 'load', id: 'L1', bus: 'L1~bus' }] });
    expect(lone.text('bus L1~bus a-n: low')).not.toContain('~');
    expect(lone.drawnElement('L1~bus~sw')).toBe('L1');
  });
});

describe('drawn elements and counts', () => {
  it('leaves the hidden switch out and keeps the opening on its element', () => {
    const els = drawnElements(opened);
    expect([...els.keys()]).toEqual(['XFMR-SEC', 'DROP', 'KITCHEN', 'HEATER', 'ELECTRONICS', 'ROD']);
    expect(els.get('KITCHEN')).toMatchObject({ bus: 'HOUSE', opened: { bus: ['n'] } });
  });

  it('counts what is drawn: 6 elements, not 7, by type in words', () => {
    const c = drawnCounts(opened);
    expect(c.total).toBe(6);
    expect(c.byType).toEqual([
      { type: 'load', count: 3 },
      { type: 'earth electrode', count: 1 },
      { type: 'line', count: 1 },
      { type: 'source', count: 1 },
    ]);
  });

  it('says type names and conductors in words', () => {
    expect(countWords(3, 'load')).toBe('3 loads');
    expect(countWords(2, 'switch')).toBe('2 switches');
    expect(countWords(1, 'earth electrode')).toBe('1 earth electrode');
    expect(typeWord('switch3')).toBe('switch');
    expect(typeWord('zipLoad')).toBe('ZIP load');
    expect(typeWord('nonsense')).toBe('element');
    expect(conductorWords(['n'])).toBe('neutral');
    expect(conductorWords(['n', 'a'])).toBe('phase A and the neutral');
    expect(conductorWords(['a', 'b', 'c'])).toBe('phases A, B and C');
    expect(conductorWords(['1', '2'])).toBe('legs 1 and 2');
  });

  it('says parameters and values in words, never JSON', () => {
    expect(parameterWords('phases.a.kw')).toBe('phases › phase A › P (kW)');
    expect(parameterWords('elements[3].each.kw')).toBe('elements › item 4 › every phase › P (kW)');
    expect(valueWords('impedance.ohms', { re: 0.19, im: -0.38 })).toBe('0.19 − j0.38');
    expect(valueWords('earthing', { ohms: { mag: 5, angleDeg: 0 } })).toBe('impedance (Ω) 5∠0°');
    expect(valueWords('closed', false)).toBe('open');
    expect(valueWords('open', [])).toBe('none');
  });

  it('says the format\'s named choices in words, never as written in the file', () => {
    expect(valueWords('impedance.kind', 'perConductor')).toBe('per conductor');
    expect(valueWords('kind', 'doubleLineEarth')).toBe('two lines to earth');
    expect(valueWords('connection', 'wyeFloating')).toBe('floating wye (star point not connected)');
    expect(valueWords('each.model', 'power')).toBe('constant power');
    expect(valueWords('limits.set', 'iec-en')).toBe('IEC/EN ±10 %');
    expect(valueWords('lvEarthing', 'solid')).toBe('solidly earthed');
    expect(valueWords('name', 'perConductor')).toBe('perConductor'); // a name is a name
  });
});

describe('the diff of opening a neutral with one click', () => {
  const s1 = summarizeCircuit(repaired);
  const s2 = summarizeCircuit(opened);
  const d = diffRevisions({ number: 1, content: { circuit: repaired }, summary: s1 }, { number: 2, content: { circuit: opened }, summary: s2 });

  it('reads as a change of the element the user drew, not a new switch', () => {
    expect(d.elements.added).toEqual([]);
    expect(d.elements.changed).toEqual([
      {
        id: 'KITCHEN',
        type: 'load',
        typeLabel: 'load',
        changes: [{ path: 'opened.bus', from: null, to: ['n'], label: 'opened conductors of the connection KITCHEN–HOUSE', fromText: 'none', toText: 'neutral' }],
      },
    ]);
  });

  it('keeps the same neutral-current row for KITCHEN on both sides (it was drawn on HOUSE both times)', () => {
    const k = d.results.find((r) => r.key === 'neutral-current:KITCHEN@HOUSE')!;
    // (P) With its neutral opened a single-phase load carries no current at all.
    expect(k.to).toBeCloseTo(0, 6);
    expect(k.from!).toBeGreaterThan(10);
  });

  it('has no internal name anywhere people read', () => {
    const read = [
      ...d.results.map((r) => r.text),
      ...d.flags.added.map((f) => f.text),
      ...d.flags.removed.map((f) => f.text),
      ...d.elements.changed.flatMap((e) => [e.id, e.typeLabel, ...e.changes.flatMap((c) => [c.label, c.fromText, c.toText])]),
    ];
    expect(read.length).toBeGreaterThan(5);
    for (const t of read) expect(t).not.toMatch(INTERNAL);
  });
});
