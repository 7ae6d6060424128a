/** The cases compare view: rows per quantity, one column per case, deltas against the base, the worst case marked. */
import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { applyCase, demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { compareCases } from '../../../../../src/features/workspace/results/cases-compare-model.ts';
import { CasesCompare } from '../../../../../src/features/workspace/results/cases-compare.tsx';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
// the demo with its neutral repaired as the base; two cases: the neutral lost, and lost with the rod gone
const base = { ...demo, elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) } as CircuitInput;
const circuit = {
  ...base,
  cases: [
    { id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] },
    { id: 'lost-no-rod', name: 'Neutral lost, rod gone', changes: [{ element: 'DROP', set: { open: ['n'] } }, { remove: 'ROD' }] },
  ],
} as CircuitInput;

describe('compareCases', () => {
  const outcomes = ['base', 'lost-n', 'lost-no-rod'].map((id) => ({ id, label: id, result: solveCircuit(applyCase(circuit, id)) }));
  const rows = compareCases(outcomes);
  const row = (key: string) => rows.find((r) => r.key === key)!;

  it('values per case, deltas against the base (P: a delta is the difference of two solves)', () => {
    const shift = row('shift:HOUSE');
    expect(shift.values).toEqual(outcomes.map((o) => o.result.buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag));
    expect(shift.deltas[0]).toBeNull();
    expect(shift.deltas[1]).toBeCloseTo(shift.values[1]! - shift.values[0]!, 12);
  });

  it('marks the worst case: the largest neutral shift, the phase voltage furthest from nominal', () => {
    const shift = row('shift:HOUSE');
    expect(shift.worst).toBe(shift.values.indexOf(Math.max(...(shift.values as number[]))));
    expect(shift.worst).toBe(2); // without the rod the star point floats furthest (Millman: no earth branch)
    const vc = row('v:HOUSE:c');
    const dist = vc.values.map((v) => Math.abs(v! - 120));
    expect(vc.worst).toBe(dist.indexOf(Math.max(...dist)));
    expect(row('flags').values[0]).toBeLessThan(row('flags').values[1]!);
    expect(row('unb-ieee:HOUSE').worst).toBe(2); // phase-voltage unbalance grows as the star point floats
    for (const k of ['unb:HOUSE', 'unb-nema:HOUSE']) expect(row(k).values.every((v) => v !== null), k).toBe(true);
  });

  it('per load: terminal voltage in volts and per unit of its rating, the worst furthest from it', () => {
    const kitchen = outcomes.map((o) => o.result.loads.find((l) => l.id === 'KITCHEN')!.branches[0]);
    expect(row('load:KITCHEN:an').label).toBe('KITCHEN terminal voltage');
    expect(row('load:KITCHEN:an').values).toEqual(kitchen.map((b) => b.voltage.mag));
    expect(row('load-pu:KITCHEN:an').values).toEqual(kitchen.map((b) => b.pu!));
    const dist = kitchen.map((b) => Math.abs(b.pu! - 1));
    expect(row('load-pu:KITCHEN:an').worst).toBe(dist.indexOf(Math.max(...dist)));
  });

  it('no worst case when every case agrees, and missing values for a case that failed', () => {
    const same = compareCases([outcomes[0], { ...outcomes[0], id: 'copy' }]);
    expect(same.every((r) => r.worst === null)).toBe(true);
    // a row marks a worst case only when the cases differ by more than 0.05 (V, A, %; 0.0005 pu): no marks on noise
    for (const r of rows) {
      const nominal = r.key.startsWith('v:') ? outcomes[0].result.buses.find((b) => b.bus === r.key.split(':')[1])!.nominalVLN! : r.nominal;
      const v = r.values.filter((x): x is number => x !== null).map((x) => (nominal ? Math.abs(x - nominal) : x));
      expect(r.worst !== null, r.key).toBe(Math.max(...v) - Math.min(...v) > (r.unit === 'pu' ? 0.0005 : 0.05));
    }
    const failed = compareCases([outcomes[0], { id: 'bad', label: 'bad', error: 'does not solve' }]);
    expect(failed[0].values[1]).toBeNull();
    expect(failed[0].deltas[1]).toBeNull();
  });
});

describe('<CasesCompare>', () => {
  it('one column per case with deltas, the worst marked, and the caution', async () => {
    render(<CasesCompare circuit={circuit} privateMarker="~" />);
    const table = await screen.findByRole('table', { name: 'Study cases compared' });
    const headers = within(table).getAllByRole('columnheader').map((h) => h.textContent);
    expect(headers).toEqual(['Quantity', 'Base', 'Neutral lost', 'Neutral lost, rod gone']);
    const shiftRow = within(table).getByRole('row', { name: /HOUSE neutral shift/ });
    expect(within(shiftRow).getByLabelText(/worst case/)).toHaveTextContent('▲');
    expect(shiftRow.textContent).toMatch(/\(\+\d+\.\d V\)/);
    expect(screen.getByRole('note', { name: 'Results caution' })).toHaveTextContent('Lost-neutral');
  });

  it('shows nothing for a circuit without cases, and a case that cannot be applied says so in its column', async () => {
    const { container } = render(<CasesCompare circuit={base} />);
    await new Promise((r) => setTimeout(r, 0));
    expect(container).toBeEmptyDOMElement();
    render(<CasesCompare circuit={{ ...base, cases: [{ id: 'typo', name: 'Typo', changes: [{ remove: 'NOPE' }] }] }} />);
    const table = await screen.findByRole('table', { name: 'Study cases compared' });
    expect(within(table).getAllByRole('columnheader')[2]).toHaveTextContent(/^Typo\s*does not solve: case "Typo": element "NOPE": no such element in the circuit$/);
  });
});
