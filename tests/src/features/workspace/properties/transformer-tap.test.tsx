import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { ElementForm } from '../../../../../src/features/workspace/properties/element-form.tsx';

const bank = { type: 'transformer' as const, id: 'T1', from: 'HV', to: 'LV', kva: 150, kvHigh: 12.47, kvLow: 0.208, connection: 'D-Yg' as const, percentZ: 4, xOverR: 3 };

describe('transformer tap in the property form', () => {
  it('sets the HV tap position in steps (step size left to its 2.5 % default)', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={bank} readOnly={false} onApply={onApply} />);
    const steps = screen.getByLabelText(/Tap position, HV winding/);
    expect(steps).toHaveValue('');
    await userEvent.type(steps, '-2{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][0]).toEqual({ ...bank, tap: { steps: -2 } });
  });

  it('sets the step size in %', async () => {
    const onApply = vi.fn();
    render(<ElementForm element={{ ...bank, tap: { steps: 1 } }} readOnly={false} onApply={onApply} />);
    const step = screen.getByLabelText(/^Tap step/);
    await userEvent.type(step, '1.25 %{Enter}');
    await waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][0]).toEqual({ ...bank, tap: { steps: 1, stepPercent: 1.25 } });
  });
});
