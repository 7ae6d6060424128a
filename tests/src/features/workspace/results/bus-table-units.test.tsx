/**
 * The bus table's V/pu switch (per unit of each bus's base: V / V_base of the solved values) and the
 * CSV download of a results table (units in the header row, the caution on the first line).
 */
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { SAFETY_CAUTION } from '../../../../../shared/review/risk.ts';
import { BusTable } from '../../../../../src/features/workspace/results/bus-table.tsx';

const result = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
const house = result.buses.find((b) => b.bus === 'HOUSE')!;

afterEach(() => vi.restoreAllMocks());

describe('BusTable units', () => {
  it('switches the voltages to per unit of the bus base and back', async () => {
    render(<BusTable result={result} standard="north-american" />);
    const table = screen.getByRole('table', { name: 'Bus voltages' });
    const row = () => within(table).getByRole('row', { name: /HOUSE/ });
    expect(row()).toHaveTextContent('167.3');
    await userEvent.click(screen.getByRole('button', { name: 'pu' }));
    expect(screen.getByRole('button', { name: 'pu' })).toHaveAttribute('aria-pressed', 'true');
    // V / V_base with V_base = 208/√3 V (the 0.208 kV level's nominal, the default base): 167.3 V → 1.393 pu.
    const expected = (house.lineToNeutral.c.mag / (208 / Math.sqrt(3))).toFixed(3);
    expect(expected).toBe('1.393');
    expect(row()).toHaveTextContent(expected);
    expect(row()).not.toHaveTextContent('167.3');
    expect(within(table).getAllByRole('columnheader', { name: /\(pu∠°\)/ }).length).toBeGreaterThan(0);
    await userEvent.click(screen.getByRole('button', { name: 'V' }));
    expect(row()).toHaveTextContent('167.3');
  });

  it('saves the table as CSV with the caution first and units in the header', async () => {
    const blobs: Blob[] = [];
    vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => {
      blobs.push(b as Blob);
      return 'blob:test';
    });
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
    render(<BusTable result={result} standard="north-american" />);
    await userEvent.click(screen.getByRole('button', { name: 'pu' }));
    await userEvent.click(screen.getByRole('button', { name: 'Download Bus voltages as CSV' }));
    expect(blobs).toHaveLength(1);
    const lines = (await blobs[0].text()).split('\r\n');
    expect(lines[0]).toBe(`# Caution: ${SAFETY_CAUTION}`);
    expect(lines[1]).toMatch(/^Bus,Nominal V_LN \(V\),.*\|pu\| \(pu\)/);
    const houseRow = lines.find((l) => l.startsWith('HOUSE,'))!.split(',');
    expect(houseRow.map(Number).some((x) => Math.abs(x - house.lineToNeutral.c.mag / (208 / Math.sqrt(3))) < 1e-12)).toBe(true);
    expect(screen.getByText(/Saved 2 rows as bus-voltages\.csv/)).toBeInTheDocument();
  });
});
