/**
 * The A/pu switch of the element currents table and the V/pu switch of the load table: a value shown
 * in pu is the solved value over its base, the base computed here from the bus's nominal voltages (C:
 * I_base = S_base / (√3 · V_base,LL), V_base = the nominal, the default per-unit convention (P)).
 */
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { ElementTable } from '../../../../../src/features/workspace/results/element-table.tsx';
import { LoadTable } from '../../../../../src/features/workspace/results/load-table.tsx';
import { SequenceCurrentTable, SequenceVoltageTable } from '../../../../../src/features/workspace/results/sequence-tables.tsx';
import { formatMagnitude } from '../../../../../src/features/workspace/results/format.ts';
import { formatPu } from '../../../../../shared/report/format.ts';

const result = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
const house = result.buses.find((b) => b.bus === 'HOUSE')!;
// A small system base so that house currents read well above the three decimals shown.
const perUnit = { baseMva: 0.01, baseKv: {} };
const iBase = (perUnit.baseMva * 1e6) / (Math.sqrt(3) * house.nominalVLL!);

function captureCsv() {
  const blobs: Blob[] = [];
  vi.spyOn(URL, 'createObjectURL').mockImplementation((b) => {
    blobs.push(b as Blob);
    return 'blob:test';
  });
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
  return blobs;
}

afterEach(() => vi.restoreAllMocks());

describe('ElementTable units', () => {
  const kitchen = result.elements.KITCHEN;
  const ia = kitchen.ports![0].currents[kitchen.ports![0].conductors.indexOf('a')];

  it('switches the currents to pu of the base current and P to pu of the system base, and back', async () => {
    render(<ElementTable result={result} standard="north-american" perUnit={perUnit} />);
    const table = screen.getByRole('table', { name: 'Element currents' });
    const row = () => within(table).getByRole('row', { name: /KITCHEN/ });
    const amps = formatMagnitude(ia.mag);
    expect(row()).toHaveTextContent(amps);
    const group = screen.getByRole('group', { name: 'Element current units' });
    await userEvent.click(within(group).getByRole('button', { name: 'pu' }));
    expect(within(group).getByRole('button', { name: 'pu' })).toHaveAttribute('aria-pressed', 'true');
    const expected = (ia.mag / iBase).toFixed(3);
    expect(Number(expected)).toBeGreaterThan(0.1);
    expect(row()).toHaveTextContent(expected);
    expect(row()).not.toHaveTextContent(amps);
    expect(row()).toHaveTextContent((kitchen.power.re / (perUnit.baseMva * 1e6)).toFixed(3));
    expect(within(table).getAllByRole('columnheader', { name: /\(pu∠°\)/ }).length).toBeGreaterThan(0);
    await userEvent.click(within(group).getByRole('button', { name: 'A' }));
    expect(row()).toHaveTextContent(amps);
  });

  it('exports the CSV in the units shown', async () => {
    const blobs = captureCsv();
    render(<ElementTable result={result} standard="north-american" perUnit={perUnit} />);
    await userEvent.click(within(screen.getByRole('group', { name: 'Element current units' })).getByRole('button', { name: 'pu' }));
    await userEvent.click(screen.getByRole('button', { name: 'Download Element currents as CSV' }));
    const lines = (await blobs[0].text()).split('\r\n');
    expect(lines[1]).toMatch(/\|I\| \(pu\)/);
    const cells = lines.find((l) => l.startsWith('KITCHEN,'))!.split(',').map(Number);
    expect(cells.some((x) => Math.abs(x - ia.mag / iBase) < 1e-12)).toBe(true);
  });
});

describe('LoadTable units', () => {
  const electronics = result.loads.find((l) => l.id === 'ELECTRONICS')!;
  const v = electronics.branches[0].voltage;

  it('shows terminal voltages in pu of the bus base (line to neutral for a phase-to-neutral load)', async () => {
    render(<LoadTable result={result} standard="north-american" perUnit={perUnit} />);
    const table = screen.getByRole('table', { name: 'Load voltages' });
    const row = () => within(table).getByRole('row', { name: /ELECTRONICS/ });
    expect(row()).toHaveTextContent(formatMagnitude(v.mag));
    const group = screen.getByRole('group', { name: 'Load voltage units' });
    await userEvent.click(within(group).getByRole('button', { name: 'pu' }));
    const expected = (v.mag / house.nominalVLN!).toFixed(3);
    expect(row()).toHaveTextContent(expected);
    expect(row()).not.toHaveTextContent(formatMagnitude(v.mag));
    await userEvent.click(within(group).getByRole('button', { name: 'V' }));
    expect(row()).toHaveTextContent(formatMagnitude(v.mag));
  });

  it('exports the CSV in the units shown', async () => {
    const blobs = captureCsv();
    render(<LoadTable result={result} standard="north-american" perUnit={perUnit} />);
    await userEvent.click(within(screen.getByRole('group', { name: 'Load voltage units' })).getByRole('button', { name: 'pu' }));
    await userEvent.click(screen.getByRole('button', { name: 'Download Load voltages as CSV' }));
    const lines = (await blobs[0].text()).split('\r\n');
    expect(lines[1]).toMatch(/of bus base \|V\| \(pu\)/);
    const cells = lines.find((l) => l.startsWith('ELECTRONICS,'))!.split(',').map(Number);
    expect(cells.some((x) => Math.abs(x - v.mag / house.nominalVLN!) < 1e-12)).toBe(true);
  });
});

describe('Sequence tables units', () => {
  it('shows sequence voltages in pu of the line-to-neutral base and sequence currents in pu of the base current', async () => {
    render(
      <>
        <SequenceVoltageTable result={result} perUnit={perUnit} />
        <SequenceCurrentTable result={result} perUnit={perUnit} />
      </>,
    );
    const v2 = house.sequence!.negative.mag;
    const drop = result.elements.DROP.ports![0];
    const pad = result.buses.find((b) => b.bus === drop.bus)!;
    const i1 = drop.sequence!.positive.mag;
    const padBase = (perUnit.baseMva * 1e6) / (Math.sqrt(3) * pad.nominalVLL!);
    const vRow = () => within(screen.getByRole('table', { name: 'Sequence voltages' })).getByRole('row', { name: /HOUSE/ });
    const iRow = () => within(screen.getByRole('table', { name: 'Sequence currents' })).getByRole('row', { name: /DROP/ });
    expect(vRow()).toHaveTextContent(formatMagnitude(v2));
    await userEvent.click(within(screen.getByRole('group', { name: 'Sequence voltage units' })).getByRole('button', { name: 'pu' }));
    expect(vRow()).toHaveTextContent(formatPu(v2 / house.nominalVLN!));
    expect(vRow()).not.toHaveTextContent(formatMagnitude(v2));
    await userEvent.click(within(screen.getByRole('group', { name: 'Sequence current units' })).getByRole('button', { name: 'pu' }));
    expect(Number((i1 / padBase).toFixed(3))).toBeGreaterThan(0.1);
    expect(iRow()).toHaveTextContent((i1 / padBase).toFixed(3));
  });
});
