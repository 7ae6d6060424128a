/**
 * The property form never changes what a line means when a unit changes (issue 8, point 1), and
 * refuses non-physical values beside the field on the first try and every try (point 3).
 */
import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { demoCircuits, solveCircuit, type CircuitElementInput, type CircuitInput } from '../../../../../shared/engine/index.ts';
import { ElementForm } from '../../../../../src/features/workspace/properties/element-form.tsx';

const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
const tap = demo.elements.find((e) => e.id === 'PM-TAP')!;

function farBus(line: CircuitElementInput): number {
  const c: CircuitInput = { ...demo, elements: demo.elements.map((e) => (e.id === line.id ? line : e)) };
  return solveCircuit(c).buses.find((b) => b.bus === 'PMT')!.lineToNeutral.a.mag;
}

/** Renders the form for `el`, runs `act`, and returns the element it applied. */
async function applied(el: CircuitElementInput, act: () => Promise<void> | void): Promise<CircuitElementInput> {
  const onApply = vi.fn();
  const { unmount } = render(<ElementForm element={el} readOnly={false} onApply={onApply} />);
  await act();
  await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
  unmount();
  return onApply.mock.calls[0][0] as CircuitElementInput;
}

describe('line units in the property form', () => {
  const reference = farBus(tap);

  it('switching the length unit m ↔ km ↔ ft converts the length and keeps the far-bus voltage to 0.01 %', async () => {
    let line = tap;
    for (const [unit, shown] of [['m', '800 m'], ['ft', '2624.67 ft'], ['km', '0.8 km'], ['mi', '0.497097 mi'], ['m', '800 m']] as const) {
      line = await applied(line, () => {
        fireEvent.change(screen.getByLabelText('Length unit'), { target: { value: unit } });
      });
      render(<ElementForm element={line} readOnly={false} onApply={() => {}} />);
      expect(screen.getByLabelText('Length')).toHaveValue(shown);
      // The impedance labels keep saying per km: the data were not reinterpreted.
      expect(screen.getByLabelText(/^Z1 per km/)).toHaveValue('0.19+j0.38 Ω');
      document.body.innerHTML = '';
      expect(Math.abs(farBus(line) - reference) / reference).toBeLessThan(1e-4);
    }
  });

  it('typing “800 m” into a 0.8 km line keeps the impedance per km (the issue’s ×1000 drop does not happen)', async () => {
    const line = await applied(tap, async () => {
      const len = screen.getByLabelText('Length');
      await userEvent.clear(len);
      await userEvent.type(len, '800 m{Enter}');
    });
    expect(line).toMatchObject({ length: 800, lengthUnit: 'm', perLengthUnit: 'km' });
    expect(Math.abs(farBus(line) - reference) / reference).toBeLessThan(1e-4);
  });

  it('changing the per-length unit converts the per-length values', async () => {
    const line = await applied(tap, () => {
      fireEvent.change(screen.getByLabelText('Impedance data given'), { target: { value: 'm' } });
    });
    expect(line).toMatchObject({ length: 0.8, lengthUnit: 'km', perLengthUnit: 'm' });
    render(<ElementForm element={line} readOnly={false} onApply={() => {}} />);
    expect(screen.getByLabelText(/^Z1 per m/)).toHaveValue('0.00019+j0.00038 Ω');
    expect(Math.abs(farBus(line) - reference) / reference).toBeLessThan(1e-4);
  });
});

describe('physical values in the property form', () => {
  const bank: CircuitElementInput = { type: 'transformer', id: 'TX1', from: 'B1', to: 'B2', kva: 300, kvHigh: 12.47, kvLow: 0.208, connection: 'D-Yg', percentZ: 5, xOverR: 4 };

  it('“−5” in a bank’s %Z then Tab gets a message beside the field on the first try and on the next', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={bank} readOnly={false} onApply={onApply} />);
    const z = screen.getByLabelText(/^Impedance/);
    await userEvent.clear(z);
    await userEvent.type(z, '−5');
    await userEvent.tab();
    expect(await screen.findByText('This must be above zero.')).toBeInTheDocument();
    expect(z).toHaveAttribute('aria-invalid', 'true');
    await userEvent.clear(z);
    await userEvent.type(z, '-7');
    await userEvent.tab();
    await waitFor(() => expect(screen.getByText('This must be above zero.')).toBeInTheDocument());
    expect(onApply).not.toHaveBeenCalled();
  });

  it('refuses a source impedance of −1+j0 Ω beside the field', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ type: 'source', id: 'SRC1', bus: 'B1', kvLL: 0.208 }} readOnly={false} onApply={onApply} />);
    const z = screen.getByLabelText(/^Internal impedance/);
    await userEvent.type(z, '-1+j0');
    await userEvent.tab();
    expect(await screen.findByText(/cannot have a negative resistance/)).toBeInTheDocument();
    expect(onApply).not.toHaveBeenCalled();
  });

  it('refuses negative kW on a load until it is marked as generation', async () => {
    const onApply = vi.fn();
    const load: CircuitElementInput = { type: 'load', id: 'L1', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 1, kvar: 0 } };
    const { rerender } = render(<ElementForm element={load} readOnly={false} onApply={onApply} />);
    const p = screen.getByLabelText(/^P \(kW\)/);
    await userEvent.clear(p);
    await userEvent.type(p, '-3 kW{Enter}');
    expect(await screen.findByText(/cannot take negative kW unless it is marked as generation/)).toBeInTheDocument();
    expect(onApply).not.toHaveBeenCalled();
    fireEvent.change(screen.getByLabelText('Role'), { target: { value: 'generation' } });
    const marked = onApply.mock.calls[0][0] as CircuitElementInput;
    expect(marked).toMatchObject({ generation: true });
    rerender(<ElementForm element={marked} readOnly={false} onApply={onApply} />);
    const p2 = screen.getByLabelText(/^P \(kW\)/);
    await userEvent.clear(p2);
    await userEvent.type(p2, '-3 kW{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenLastCalledWith({ ...load, generation: true, each: { kw: -3, kvar: 0 } }));
  });
});
