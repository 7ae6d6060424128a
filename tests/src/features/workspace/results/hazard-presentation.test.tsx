/**
 * Hazard presentation on real engine results: each load's own terminal voltage and flag, the
 * lost-neutral alert, unbalance by every definition, sequence components to neutral and of
 * currents, both sides of a bank. Values are the engine's (its checks against Millman's theorem
 * and hand calculations live in tests/shared/engine/results/); here the screen must say them.
 */
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { BusPhaseVoltages, flagWords, LoadVoltageNote } from '../../../../../src/features/workspace/results/diagram-marks.tsx';
import { NeutralHazardAlert, neutralHazards } from '../../../../../src/features/workspace/results/neutral-alert.tsx';
import { diagramOverlays } from '../../../../../src/features/workspace/results/overlays.ts';
import { ResultsPanel } from '../../../../../src/features/workspace/results/results-panel.tsx';

const demo = (key: string) => demoCircuits.find((d) => d.key === key)!.circuit;
const openNeutral = demo('open-neutral-208y120');
const result = solveCircuit(openNeutral);
const repaired = solveCircuit({ ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) } as CircuitInput);
const branch = (r: typeof result, id: string) => r.loads.find((l) => l.id === id)!.branches[0];

describe('load voltages table', () => {
  it('shows each load’s own terminal voltage, its rating, per unit and flag (ELECTRONICS 167.3 V = 1.39 pu, violation)', () => {
    render(<ResultsPanel status="ok" result={result} />);
    const table = screen.getByRole('table', { name: 'Load voltages' });
    const row = within(table).getByRole('row', { name: /ELECTRONICS/ });
    const e = branch(result, 'ELECTRONICS');
    expect(e.voltage.mag.toFixed(1)).toBe('167.3'); // engine value for the demo
    expect(row).toHaveTextContent(`${e.voltage.mag.toFixed(1)}∠`);
    expect(row).toHaveTextContent(/L3–N/); // IEC 60445 labels (the panel default)
    expect(row).toHaveTextContent(/120\.1 \(bus\)/);
    expect(row).toHaveTextContent(/1\.39/);
    expect(row).toHaveTextContent('Violation: over voltage');
    expect(within(table).getByRole('row', { name: /HEATER/ })).toHaveTextContent('Violation: under voltage');
    // the element table's flag column no longer says "none" for the loads
    const el = within(screen.getByRole('table', { name: 'Element currents' })).getByRole('row', { name: /ELECTRONICS/ });
    expect(el).toHaveTextContent('Violation');
  });

  it('with the neutral repaired every load is within limits', () => {
    render(<ResultsPanel status="ok" result={repaired} />);
    const rows = within(screen.getByRole('table', { name: 'Load voltages' })).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(3);
    for (const r of rows) expect(r).toHaveTextContent('within limits');
  });
});

describe('lost-neutral alert on the diagram', () => {
  it('names the bus, where the neutral is open, the loads over and under voltage, and carries the caution', () => {
    render(<NeutralHazardAlert result={result} privateMarker="~" />);
    const alert = screen.getByRole('alert');
    expect(alert).toHaveTextContent('Neutral lost at bus HOUSE: the neutral is open on DROP.');
    expect(alert).toHaveTextContent(/Over voltage: ELECTRONICS 167\.3 V = 1\.39 pu, KITCHEN 141\.6 V = 1\.18 pu\./);
    expect(alert).toHaveTextContent(/Under voltage: HEATER 68\.8 V = 0\.57 pu\./);
    expect(alert).toHaveTextContent(/dangerous voltages on equipment and people/);
  });

  it('is absent with the neutral intact and in the fault study (a fault’s shift is not a lost neutral)', () => {
    expect(neutralHazards(repaired, '~')).toEqual([]);
    const fault = solveCircuit(demo('feeder-earth-fault'));
    expect(fault.flags.some((f) => f.code === 'neutral-shift')).toBe(true);
    expect(neutralHazards(fault, '~')).toEqual([]);
    const { container } = render(<NeutralHazardAlert result={fault} privateMarker="~" />);
    expect(container).toBeEmptyDOMElement();
  });

  it('a neutral opened on the canvas connection is named as that connection, never by its generated name', () => {
    // As the canvas writes it: the source behind a generated switch with its neutral open.
    const wired = {
      ...openNeutral,
      elements: [
        ...openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e.id === 'XFMR-SEC' ? { ...e, bus: 'XFMR-SEC~bus' } : e)),
        { type: 'switch3', id: 'XFMR-SEC~bus~sw', from: 'PAD', to: 'XFMR-SEC~bus', open: ['n'] },
      ],
    } as CircuitInput;
    render(<NeutralHazardAlert result={solveCircuit(wired)} privateMarker="~" />);
    const alert = screen.getByRole('alert');
    expect(alert.textContent).not.toMatch(/~/);
    expect(alert).toHaveTextContent('Neutral lost at bus PAD: the neutral is open at the connection of XFMR-SEC.');
    expect(alert).toHaveTextContent(/Neutral lost at bus HOUSE/);
  });

  it('a three-phase load whose own neutral connection is opened: its star point floats, and the alert names it and its branches', () => {
    const c: CircuitInput = {
      format: 'wyeward-circuit',
      version: 1,
      frequencyHz: 60,
      elements: [
        { type: 'source', id: 'SRC1', bus: 'B1', kvLL: 0.208 },
        { type: 'load', id: 'SHOP', bus: 'SHOP~bus', connection: 'wye', phases: { a: { kw: 1 }, b: { kw: 3 }, c: { kw: 6 } } },
        { type: 'switch3', id: 'SHOP~bus~sw', from: 'B1', to: 'SHOP~bus', open: ['n'] },
      ],
    };
    const r = solveCircuit(c);
    const hazards = neutralHazards(r, '~');
    expect(hazards.map((h) => h.bus)).toEqual(['the connection of SHOP on bus B1']);
    // the lightest branch (a) rises most, the heaviest (c) sags (P: Millman; the engine's values checked in tests/shared)
    expect(hazards[0].over[0]).toMatchObject({ id: 'SHOP', branch: 'a' });
    expect(hazards[0].under.map((u) => u.branch)).toContain('c');
    render(<NeutralHazardAlert result={r} privateMarker="~" />);
    const alert = screen.getByRole('alert');
    expect(alert).toHaveTextContent('Neutral lost at the connection of SHOP on bus B1: its neutral is open.');
    expect(alert).toHaveTextContent(/Over voltage: SHOP \(a\) \d+\.\d V = 1\.\d\d pu/);
    expect(alert.textContent).not.toMatch(/~/);
  });
});

describe('diagram marks', () => {
  const o = diagramOverlays(result);
  it('marks both the high and the low phases of a bus', () => {
    const { container } = render(<BusPhaseVoltages overlay={o.buses.HOUSE} standard="north-american" />);
    const marks = [...container.querySelectorAll('[data-phase-mark]')].map((e) => [e.textContent, e.getAttribute('data-phase-mark')]);
    expect(marks).toEqual([
      ['A 141.6 V ▲ high', 'high'],
      ['B 68.78 V ▼ low', 'low'],
      ['C 167.3 V ▲ high', 'high'],
    ]);
  });
  it('writes a load’s own voltage and verdict beside it: "167.3 V = 1.39 pu ✖"', () => {
    render(<LoadVoltageNote overlay={o.elements.ELECTRONICS} standard="north-american" />);
    expect(screen.getByTestId('load-voltage-ELECTRONICS')).toHaveTextContent(/^167\.3 V = 1\.39 pu ✖/);
  });
  it('words flags instead of codes, by cause', () => {
    const shift = result.flags.find((f) => f.code === 'neutral-shift')!;
    expect(flagWords(shift)).toBe('neutral lost');
    expect(flagWords(result.flags.find((f) => f.code === 'voltage-low')!)).toBe('low voltage');
  });
});

describe('unbalance by every definition', () => {
  it('never calls a bus within while one definition is out (line-voltage 0.15 % within, phase-voltage 45 % over)', () => {
    render(<ResultsPanel status="ok" result={result} />);
    const list = screen.getByRole('list', { name: 'Unbalance against the limits' });
    const house = within(list).getAllByRole('listitem').find((li) => li.textContent!.startsWith('HOUSE'))!;
    const h = result.buses.find((b) => b.bus === 'HOUSE')!;
    expect(house).toHaveTextContent(/^HOUSE: ▲ out of limits/);
    expect(house).toHaveTextContent(`line-voltage (NEMA) ${h.nemaUnbalancePercent!.toFixed(2)} % within 3 %`);
    expect(house).toHaveTextContent(`phase-voltage (IEEE) ${h.ieeeUnbalancePercent!.toFixed(2)} % over 3 %`);
    expect(house).toHaveTextContent(/IEC \|V2\|\/\|V1\| 0\.\d\d % within 3 %/);
    expect(house.textContent).not.toMatch(/within every limit/);
  });
});

describe('sequence components', () => {
  it('gives V0, V1, V2 to earth and to the bus neutral: to earth the open-neutral set looks balanced, to neutral V0 is the shift', () => {
    render(<ResultsPanel status="ok" result={result} />);
    const row = within(screen.getByRole('table', { name: 'Sequence voltages' })).getByRole('row', { name: /HOUSE/ });
    const h = result.buses.find((b) => b.bus === 'HOUSE')!;
    const cells = within(row).getAllByRole('cell').map((c) => c.textContent);
    expect(cells[0]).toBe('HOUSE');
    expect(cells[3]).toMatch(new RegExp(`^${h.sequence!.negative.mag.toFixed(3)}∠`)); // V2 to earth ≈ 0.18 V
    expect(cells[4]).toMatch(new RegExp(`^${h.sequenceToNeutral!.zero.mag.toFixed(1)}∠`)); // V0 to neutral ≈ 56.9 V
  });

  it('the phasor view lists the line-to-neutral set beside the set to earth', () => {
    render(<ResultsPanel status="ok" result={result} selection="HOUSE" />);
    const h = result.buses.find((b) => b.bus === 'HOUSE')!;
    expect(screen.getByRole('list', { name: 'Sequence components to neutral, bus HOUSE' })).toHaveTextContent(`V0 zero${h.sequenceToNeutral!.zero.mag.toFixed(1)} V∠`);
  });

  it('gives current sequence components per element, on both sides of a transformer bank, and both sides in the currents table', () => {
    const r = solveCircuit(demo('delta-wye-bank'));
    render(<ResultsPanel status="ok" result={r} />);
    const seq = screen.getByRole('table', { name: 'Sequence currents' });
    expect(within(seq).getByRole('columnheader', { name: /^I0 \(A∠°\)/ })).toBeInTheDocument();
    const bank = Object.values(r.elements).find((e) => e.type === 'transformer')!;
    const rows = within(seq).getAllByRole('row', { name: new RegExp(bank.id) });
    expect(rows.map((x) => within(x).getAllByRole('cell')[1].textContent)).toEqual([`HV side (${bank.ports![0].bus})`, `LV side (${bank.ports![1].bus})`]);
    const currents = screen.getByRole('table', { name: 'Element currents' });
    const sides = within(currents).getAllByRole('row', { name: new RegExp(bank.id) });
    expect(sides).toHaveLength(2);
    expect(sides[1]).toHaveTextContent(`LV side (${bank.ports![1].bus})`);
    expect(sides[1]).toHaveTextContent(`${bank.ports![1].currents[0].mag.toFixed(1)}∠`);
    // element kinds in words, never format type names
    expect(within(currents).queryByText('transformer')).toBeNull();
    expect(sides[0]).toHaveTextContent('Transformer bank');
  });
});

describe('neutral shift worded by its cause', () => {
  it('a fault study says the fault shifts the neutral, not that it is lost', () => {
    const r = solveCircuit(demo('feeder-earth-fault'));
    render(<ResultsPanel status="ok" result={r} selection="END" />);
    expect(screen.getByTestId('selected-neutral-cause')).toHaveTextContent("the fault in this study shifts it (the fault's effect, not a lost neutral)");
    const flags = within(screen.getByRole('list', { name: 'Flags' })).getAllByRole('listitem');
    expect(flags.some((f) => /lost or high-impedance|check for a lost/.test(f.textContent!))).toBe(false);
  });
  it('the open-neutral demo says the neutral is open upstream, naming the line', () => {
    render(<ResultsPanel status="ok" result={result} selection="HOUSE" />);
    expect(screen.getByTestId('selected-neutral-cause')).toHaveTextContent('the neutral is open upstream (DROP)');
  });
});
