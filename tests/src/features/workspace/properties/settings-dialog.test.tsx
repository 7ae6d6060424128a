/**
 * The study settings dialog: nothing exists while it is closed (its form is not rebuilt on every
 * edit of the study), and it opens on the bus voltages and settings it is given at that moment.
 */
import { fireEvent, render, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { defaultSettings } from '../../../../../src/features/workspace/model/layout.ts';
import { SettingsDialog, type BusVoltage } from '../../../../../src/features/workspace/properties/settings-dialog.tsx';

const buses: BusVoltage[] = [
  { id: 'n1', name: 'SRC', kvLL: 12.47 },
  { id: 'n2', name: 'LV', kvLL: 0.208 },
];

describe('SettingsDialog', () => {
  it('renders nothing while closed', () => {
    const { container } = render(<SettingsDialog open={false} settings={defaultSettings()} buses={buses} readOnly={false} onClose={() => {}} onApply={() => {}} />);
    expect(container).toBeEmptyDOMElement();
    expect(screen.queryByRole('dialog')).toBeNull();
  });

  it('opens on the bus voltages given while it was closed, and applies them', async () => {
    const onApply = vi.fn();
    const props = { settings: defaultSettings(), readOnly: false, onClose: () => {}, onApply };
    const { rerender } = render(<SettingsDialog open={false} buses={buses} {...props} />);
    // The study changes while the dialog is closed: a bus is renamed and given another voltage.
    const edited = [buses[0], { id: 'n2', name: 'LV2', kvLL: 0.24 }];
    rerender(<SettingsDialog open={false} buses={edited} {...props} />);
    rerender(<SettingsDialog open buses={edited} {...props} />);
    const dialog = screen.getByRole('dialog', { name: 'Study settings' });
    expect(dialog).toHaveTextContent('LV2');
    expect((screen.getByLabelText('LV2') as HTMLInputElement).value).toMatch(/^0\.24\b|^240\b/);
    fireEvent.submit(dialog.querySelector('form')!);
    await vi.waitFor(() => expect(onApply).toHaveBeenCalledTimes(1));
    expect(onApply.mock.calls[0][1]).toEqual({ n1: 12.47, n2: 0.24 });
  });
});
