import { fireEvent, render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { ElementForm } from '../../../../../src/features/workspace/properties/element-form.tsx';

describe('ElementForm', () => {
  it('applies a voltage typed in volts as kV and keeps the other fields', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ type: 'source', id: 'SRC1', bus: 'B1', kvLL: 0.208 }} readOnly={false} onApply={onApply} />);
    const kv = screen.getByLabelText(/Nominal voltage/);
    expect(kv).toHaveValue('0.208 kV');
    await userEvent.clear(kv);
    await userEvent.type(kv, '13800 V{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][0]).toEqual({ type: 'source', id: 'SRC1', bus: 'B1', kvLL: 13.8 });
  });

  it('says in plain words what is wrong with a complex value and applies nothing', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ type: 'earthing', id: 'ROD1', node: 'B1.n', ohms: 25 }} readOnly={false} onApply={onApply} />);
    const z = screen.getByLabelText(/Electrode resistance/);
    await userEvent.clear(z);
    await userEvent.type(z, 'twenty{Enter}');
    expect(await screen.findByText(/“twenty” is not a complex value/)).toBeInTheDocument();
    expect(z).toHaveAttribute('aria-invalid', 'true');
    expect(onApply).not.toHaveBeenCalled();
    await userEvent.clear(z);
    await userEvent.type(z, '20+j3{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledWith({ type: 'earthing', id: 'ROD1', node: 'B1.n', ohms: { re: 20, im: 3 } }));
  });

  it('reports the engine schema’s objection at the field (a negative rating)', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ type: 'capacitorBank', id: 'CAP1', bus: 'B1', kvar: 30, connection: 'wye' }} readOnly={false} onApply={onApply} />);
    const kvar = screen.getByLabelText(/^Rating/);
    await userEvent.clear(kvar);
    await userEvent.type(kvar, '-5 kvar{Enter}');
    expect(await screen.findByText('This must be above zero.')).toBeInTheDocument();
    expect(onApply).not.toHaveBeenCalled();
  });

  it('switches a load to single-phase at once and disables every input when read-only', () => {
    const onApply = vi.fn();
    const load = { type: 'load' as const, id: 'L1', bus: 'B1', connection: 'wye' as const, each: { kw: 3, kvar: 0 } };
    const { unmount } = render(<ElementForm element={load} readOnly={false} onApply={onApply} />);
    fireEvent.change(screen.getByLabelText('Connection'), { target: { value: 'single' } });
    expect(onApply).toHaveBeenCalledWith({ type: 'load', id: 'L1', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 3, kvar: 0 } });
    unmount();
    render(<ElementForm element={load} readOnly onApply={onApply} />);
    for (const el of screen.getAllByRole('textbox')) expect(el).toBeDisabled();
    expect(screen.getByLabelText('Connection')).toBeDisabled();
  });

  it('edits a load given as a three-phase total per branch', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ type: 'load', id: 'W', bus: 'B1', connection: 'delta', total: { kw: 45, kvar: 24 } }} readOnly={false} onApply={onApply} />);
    const pab = screen.getByLabelText(/^P A–B/);
    expect(pab).toHaveValue('15 kW');
    await userEvent.clear(pab);
    await userEvent.type(pab, '20{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][0]).toEqual({
      type: 'load', id: 'W', bus: 'B1', connection: 'delta',
      phases: { ab: { kw: 20, kvar: 8 }, bc: { kw: 15, kvar: 8 }, ca: { kw: 15, kvar: 8 } },
    });
  });

  it('shows a source earthed through an impedance as such, edits the impedance and switches earthing kinds', async () => {
    const onApply = vi.fn();
    const src = { type: 'source' as const, id: 'SRC1', bus: 'B1', kvLL: 13.8, earthing: { ohms: { re: 10, im: 2 } } };
    const { unmount } = render(<ElementForm element={src} readOnly={false} onApply={onApply} />);
    const sel = screen.getByLabelText('Star-point earthing');
    expect(sel).toHaveValue('impedance');
    const z = screen.getByLabelText(/Star-point earthing impedance/);
    expect(z).toHaveValue('10+j2 Ω');
    await userEvent.clear(z);
    await userEvent.type(z, '20{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledWith({ ...src, earthing: { ohms: 20 } }));
    fireEvent.change(sel, { target: { value: 'solid' } });
    expect(onApply).toHaveBeenLastCalledWith({ ...src, earthing: 'solid' });
    unmount();
    onApply.mockClear();
    render(<ElementForm element={{ ...src, earthing: 'unearthed' }} readOnly={false} onApply={onApply} />);
    expect(screen.getByLabelText('Star-point earthing')).toHaveValue('unearthed');
    expect(screen.queryByLabelText(/Star-point earthing impedance/)).toBeNull();
    fireEvent.change(screen.getByLabelText('Star-point earthing'), { target: { value: 'impedance' } });
    expect(onApply).toHaveBeenCalledWith({ ...src, earthing: { ohms: 5 } });
  });
});
