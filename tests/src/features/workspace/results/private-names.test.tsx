import { render, screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { hidePrivate, publicBus } from '../../../../../src/features/workspace/results/private-names.ts';
import { ResultsPanel } from '../../../../../src/features/workspace/results/results-panel.tsx';

// The open-neutral demo wired as the canvas writes an opened connection: KITCHEN sits on a private
// terminal bus behind a generated switch with its neutral open.
const base = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const wired: CircuitInput = {
  ...base,
  elements: [
    ...base.elements.map((e) => (e.id === 'KITCHEN' ? { ...e, bus: 'KITCHEN~bus' } : e)),
    { type: 'switch3', id: 'KITCHEN~bus-sw', from: 'HOUSE', to: 'KITCHEN~bus', open: ['n'] },
  ] as CircuitInput['elements'],
};
const result = solveCircuit(wired);

describe('private names of generated buses and switches', () => {
  it('follows a private bus through the generated switch to the bus the user drew', () => {
    expect(publicBus(result, 'KITCHEN~bus', '~')).toBe('HOUSE');
    expect(publicBus(result, 'HOUSE', '~')).toBe('HOUSE');
    expect(publicBus(result, 'KITCHEN~bus', undefined)).toBe('KITCHEN~bus');
  });

  it('hides private buses and elements from the lists, and their names from every flag, keeping totals', () => {
    const shown = hidePrivate(result, '~');
    expect(shown.buses.map((b) => b.bus).sort()).toEqual(['HOUSE', 'PAD']);
    expect(Object.keys(shown.elements)).not.toContain('KITCHEN~bus-sw');
    // Every flag is kept; those naming the private bus read in the words of the diagram.
    expect(shown.flags.map((f) => f.code)).toEqual(result.flags.map((f) => f.code));
    expect(result.flags.some((f) => f.message.includes('~'))).toBe(true);
    for (const f of shown.flags) expect(f.message).not.toContain('~');
    // KITCHEN's own terminal voltage flags it, and the load names the drawn bus
    expect(shown.flags.some((f) => f.elementId === 'KITCHEN')).toBe(true);
    expect(shown.loads.find((l) => l.id === 'KITCHEN')!.bus).toBe('HOUSE');
    expect(shown.totals).toBe(result.totals);
    expect(hidePrivate(result, undefined)).toBe(result);
  });

  it('an element behind a generated switch names the bus the user drew', () => {
    const shown = hidePrivate(result, '~');
    // the full result keeps the private name (the canvas overlays use it)
    expect(result.elements.KITCHEN.ports?.map((p) => p.bus)).toContain('KITCHEN~bus');
    expect(shown.elements.KITCHEN.ports?.map((p) => p.bus)).toEqual(['HOUSE']);
  });

  it('the panel shows the drawn bus when the element on a private bus is selected', () => {
    const { rerender } = render(<ResultsPanel status="ok" result={result} selection="KITCHEN" />); // the default marker is "~"
    expect(screen.getByRole('img', { name: 'Phasor diagram, bus HOUSE' })).toBeInTheDocument();
    expect(within(screen.getByRole('table', { name: 'Bus voltages' })).queryByRole('row', { name: /KITCHEN~bus/ })).toBeNull();
    expect(within(screen.getByRole('table', { name: 'Element currents' })).queryByRole('row', { name: /KITCHEN~bus-sw/ })).toBeNull();
    rerender(<ResultsPanel status="ok" result={result} selection="KITCHEN" privateMarker="" />);
    expect(screen.getByRole('img', { name: 'Phasor diagram, bus KITCHEN~bus' })).toBeInTheDocument();
  });
});
