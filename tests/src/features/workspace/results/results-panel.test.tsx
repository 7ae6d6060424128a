import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { ResultsPanel } from '../../../../../src/features/workspace/results/results-panel.tsx';

const solved = (key: string) => solveCircuit(demoCircuits.find((d) => d.key === key)!.circuit);

describe('ResultsPanel on the open-neutral demo (real engine result)', () => {
  const result = solved('open-neutral-208y120');
  const house = result.buses.find((b) => b.bus === 'HOUSE')!;

  it('shows the neutral shift of each bus in the bus table, in V and % of nominal', () => {
    render(<ResultsPanel status="ok" result={result} ms={2.5} />);
    const region = screen.getByRole('region', { name: 'Results' });
    const table = within(region).getByRole('table', { name: 'Bus voltages' });
    expect(within(table).getByRole('columnheader', { name: /Neutral shift/ })).toBeInTheDocument();
    const row = within(table).getByRole('row', { name: /HOUSE/ });
    // Engine value (the demo's solve): 56.84 V, 47.3 % of 120.1 V.
    expect(house.neutralToEarth!.mag).toBeCloseTo(56.84, 2);
    expect(within(row).getByText('56.8 V (47.3 %)')).toBeInTheDocument();
    expect(within(table).getByRole('row', { name: /PAD/ })).toHaveTextContent(/0(\.0+)? V \(0\.0 %\)/);
    expect(screen.getByText('Solved in 2.5 ms.')).toBeInTheDocument();
  });

  it('lists the flags with the limit set in force, most severe first', () => {
    render(<ResultsPanel status="ok" result={result} />);
    expect(screen.getByText(/ANSI C84\.1 service voltage/)).toBeInTheDocument();
    const flags = within(screen.getByRole('list', { name: 'Flags' })).getAllByRole('listitem');
    // 3 loads' own terminal voltages and 3 bus phases (violations), then phase-voltage unbalance and the neutral shift (warnings).
    expect(flags).toHaveLength(8);
    expect(flags[0]).toHaveTextContent(/Violation.*load KITCHEN has 141\.6 V across its terminals/);
    expect(flags.some((f) => /Violation.*HOUSE a-n: 141\.6 V/.test(f.textContent!))).toBe(true);
    expect(flags[7]).toHaveTextContent(/Warning.*neutral-to-earth voltage 56\.8 V.*the neutral is open upstream/);
  });

  it('carries the safety caution, and still does with no result', () => {
    const { unmount } = render(<ResultsPanel status="ok" result={result} />);
    expect(screen.getByRole('note', { name: 'Results caution' })).toHaveTextContent(/Lost-neutral conditions put dangerous voltages on equipment/);
    unmount();
    render(<ResultsPanel status="idle" />);
    expect(screen.getByRole('note', { name: 'Results caution' })).toHaveTextContent(/licensed practice/);
    expect(screen.getByText(/Nothing to solve yet/)).toBeInTheDocument();
  });

  it('draws the phasor diagram of the bus with the largest shift, and follows the canvas selection', () => {
    const { rerender } = render(<ResultsPanel status="ok" result={result} />);
    expect(screen.getByRole('img', { name: 'Phasor diagram, bus HOUSE' })).toBeInTheDocument();
    expect(screen.getByRole('img', { name: 'Sequence components, bus HOUSE' })).toBeInTheDocument();
    expect(screen.getByTestId('selected-neutral-shift')).toHaveTextContent('56.8 V');
    rerender(<ResultsPanel status="ok" result={result} selection="PAD" />);
    expect(screen.getByRole('img', { name: 'Phasor diagram, bus PAD' })).toBeInTheDocument();
    rerender(<ResultsPanel status="ok" result={result} selection="KITCHEN" />);
    expect(screen.getByRole('img', { name: 'Phasor diagram, bus HOUSE' })).toBeInTheDocument();
    expect(screen.getByRole('img', { name: 'Current over one cycle' })).toBeInTheDocument();
    expect(screen.getByRole('checkbox', { name: /I L1 / })).toBeChecked();
  });

  it('labels the phases by the chosen wiring standard', () => {
    const { unmount } = render(<ResultsPanel status="ok" result={result} standard="north-american" />);
    expect(screen.getByRole('columnheader', { name: /^A–N \(V∠°\)/ })).toBeInTheDocument();
    unmount();
    render(<ResultsPanel status="ok" result={result} standard="iec-60445" />);
    expect(screen.getByRole('columnheader', { name: /^L1–N \(V∠°\)/ })).toBeInTheDocument();
  });

  it('sorts the bus table by neutral shift', async () => {
    const user = userEvent.setup();
    render(<ResultsPanel status="ok" result={result} />);
    const table = screen.getByRole('table', { name: 'Bus voltages' });
    const order = () => within(table).getAllByRole('row').slice(1).map((r) => r.textContent!.slice(0, 5));
    await user.click(within(table).getByRole('button', { name: /Neutral shift/ }));
    const first = order();
    await user.click(within(table).getByRole('button', { name: /Neutral shift/ }));
    expect(order()).toEqual(first.slice().reverse());
    expect(within(table).getByRole('columnheader', { name: /Neutral shift/ })).toHaveAttribute('aria-sort', first[0] === 'PAD' ? 'descending' : 'ascending');
  });

  it('copies the element table as tab-separated text with units in the header', async () => {
    const user = userEvent.setup();
    render(<ResultsPanel status="ok" result={result} />);
    await user.click(screen.getByRole('button', { name: 'Copy Element currents as tab-separated text' }));
    const text = await navigator.clipboard.readText();
    const lines = text.trim().split('\n');
    expect(lines).toHaveLength(1 + Object.keys(result.elements).length);
    const header = lines[0].split('\t');
    expect(header.slice(0, 5)).toEqual(['Element', 'Type', 'Bus', 'I L1 |I| (A)', 'I L1 angle (°)']);
    const kitchen = lines.find((l) => l.startsWith('KITCHEN\t'))!.split('\t');
    expect(Number(kitchen[3])).toBeCloseTo(result.elements.KITCHEN.ports![0].currents[0].mag, 9);
    expect(screen.getByText(/Copied 6 rows/)).toBeInTheDocument();
  });

  it('shows the power balance check with its residual', () => {
    render(<ResultsPanel status="ok" result={result} />);
    expect(screen.getByText(/source = load \+ faults \+ losses/)).toHaveTextContent('✓ balanced');
  });
});

describe('ResultsPanel on other results', () => {
  it('states an engine error in plain words with the element it names, keeping the last good result', () => {
    const result = solved('open-neutral-208y120');
    render(
      <ResultsPanel
        status="error"
        stale
        result={result}
        error={{ code: 'invalid-circuit', message: 'switch SW9: node "NOWHERE.a" is not connected to anything else (check the node name)', elementIds: ['SW9'], nodes: ['NOWHERE.a'], issues: [{ path: 'elements[6].to', message: 'node "NOWHERE.a" is not used by any other element', text: 'element SW9: to: node "NOWHERE.a" is not used by any other element' }] }}
      />,
    );
    const alert = screen.getByRole('alert');
    expect(alert).toHaveTextContent('The circuit has a problem to fix (SW9)');
    // The problem as a form error naming the element (worded by the solve worker, which has the circuit), never its path.
    expect(alert).toHaveTextContent('element SW9: to: node "NOWHERE.a" is not used by any other element');
    expect(alert).not.toHaveTextContent('elements[6]');
    expect(screen.getByText(/showing the last good solution/)).toBeInTheDocument();
    expect(screen.getByRole('table', { name: 'Bus voltages' })).toBeInTheDocument();
  });

  it('delta–wye demo: the bank loading and the 30° shift with its convention', () => {
    render(<ResultsPanel status="ok" result={solved('delta-wye-bank')} />);
    const section = screen.getByRole('region', { name: 'Transformers' });
    expect(section).toHaveTextContent(/PM-BANK: loading 78\.4 %/); // engine value: 78.37 %
    expect(section).toHaveTextContent('D-Yg, low side lags high side by 30° (North American rule)');
    // PMT has no neutral: its diagram draws phase-to-earth voltages.
    const tableRow = within(screen.getByRole('table', { name: 'Bus voltages' })).getByRole('row', { name: /PMT/ });
    expect(tableRow).toHaveTextContent('—');
  });

  it('feeder fault demo: fault currents table and the unbalance flags', () => {
    const r = solved('feeder-earth-fault');
    render(<ResultsPanel status="ok" result={r} />);
    const faults = screen.getByRole('table', { name: 'Fault currents' });
    expect(within(faults).getByRole('row', { name: /F1/ })).toHaveTextContent(`${r.faults[0].phaseCurrents.a.mag.toFixed(1)} A∠`);
    expect(screen.getByRole('list', { name: 'Unbalance against the limits' })).toHaveTextContent(/END: ▲ out of limits — line-voltage \(NEMA\) 29\.85 % over 3 %/);
  });
});

describe('ResultsPanel on a floating part', () => {
  it('says which part has no path to earth and marks its bus (D-Y bank with an unearthed star)', () => {
    const c = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
    const r = solveCircuit({ ...c, elements: c.elements.map((e) => (e.id === 'PM-BANK' ? { ...e, connection: 'D-Y' } : e)) });
    expect(r.floating).toHaveLength(1);
    render(<ResultsPanel status="ok" result={r} />);
    // the bank's own star point is named in words, never by its internal "#" name
    const ref = r.floating[0].referenceNode.replace(/^PM-BANK#lvStar$/, 'the LV star point of PM-BANK');
    expect(screen.getByRole('note', { name: 'Floating parts' })).toHaveTextContent(`5 nodes (the LV star point of PM-BANK, PM208.a, PM208.b, PM208.c, PM208.n) have no path to earth. Their voltages to earth are shown with ${ref} held at 0 V`);
    expect(screen.getByRole('region', { name: 'Results' }).textContent).not.toMatch(/#/);
    expect(within(screen.getByRole('table', { name: 'Bus voltages' })).getByRole('row', { name: /PM208/ })).toHaveTextContent('PM208(floating)');
  });
});

describe('ResultsPanel on a large study', () => {
  it('keeps the flag and unbalance lists short, with every flag one click away', async () => {
    const { study300 } = await import('../../../../bench/workspace/study-300.ts');
    const r = solveCircuit(study300());
    expect(r.flags.length).toBeGreaterThan(12);
    const user = userEvent.setup();
    render(<ResultsPanel status="ok" result={r} />);
    const list = () => within(screen.getByRole('list', { name: 'Flags' })).getAllByRole('listitem');
    expect(list()).toHaveLength(12);
    await user.click(screen.getByRole('button', { name: `Show all ${r.flags.length} flags` }));
    expect(list()).toHaveLength(r.flags.length);
    // within only when every definition is within its own 3 % (ANSI set)
    const withinLimit = r.buses.filter((b) => b.nemaUnbalancePercent !== undefined && b.nemaUnbalancePercent <= 3 && b.iecUnbalancePercent! <= 3 && b.ieeeUnbalancePercent! <= 3).length;
    expect(screen.getByText(new RegExp(`^${withinLimit} of \\d+ buses within every unbalance limit`))).toBeInTheDocument();
  }, 60_000);
});
