/**
 * The per-unit switches of the smaller results sections. The power summary in pu is the solved power
 * over the system base (C: S_pu = S / S_base, the default per-unit convention (P)). The A/pu switch of the fault currents: a current shown in pu is the solved fault current over the
 * base current of the faulted bus's level, the base computed here from that bus's nominal voltage
 * (C: I_base = S_base / (√3 · V_base,LL), V_base = the nominal, the default per-unit convention (P));
 * the report's and the CSV's fault table give the same figure.
 */
import { render, screen, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../../../shared/engine/index.ts';
import { faultTable, tableContext } from '../../../../../shared/report/tables.ts';
import { FaultSection, PowerSummary } from '../../../../../src/features/workspace/results/result-sections.tsx';
import { formatMagnitude } from '../../../../../src/features/workspace/results/format.ts';

const circuit = demoCircuits.find((d) => d.key === 'feeder-earth-fault')!.circuit;
const result = solveCircuit(circuit);
const fault = result.faults[0];
const bus = result.buses.find((b) => b.bus === fault.bus)!;
const perUnit = { baseMva: 1, baseKv: {} };
const iBase = (perUnit.baseMva * 1e6) / (Math.sqrt(3) * bus.nominalVLL!);
const ia = fault.phaseCurrents.a.mag;

describe('FaultSection units', () => {
  it('switches the fault currents to pu of the faulted level’s base current, and back', async () => {
    expect(ia).toBeGreaterThan(1); // a bolted fault: a real current to show
    render(<FaultSection result={result} standard="iec-60445" perUnit={perUnit} />);
    const table = screen.getByRole('table', { name: 'Fault currents' });
    const row = () => within(table).getAllByRole('row')[1];
    expect(row()).toHaveTextContent(formatMagnitude(ia));
    const group = screen.getByRole('group', { name: 'Fault current units' });
    await userEvent.click(within(group).getByRole('button', { name: 'pu' }));
    const expected = (ia / iBase).toFixed(3);
    expect(Number(expected)).toBeGreaterThan(0.01);
    expect(row()).toHaveTextContent(`${expected} pu`);
    expect(within(table).getAllByRole('columnheader')[1]).toHaveTextContent('(pu∠°)');
    await userEvent.click(within(group).getByRole('button', { name: 'A' }));
    expect(row()).toHaveTextContent(formatMagnitude(ia));
  });

  it('gives the report and CSV the same per-unit figure', () => {
    const t = faultTable(tableContext(circuit, result, 'pu', perUnit));
    expect(t.columns[3]).toBe('A (pu)');
    expect(Number(t.rows[0][3])).toBeCloseTo(ia / iBase, 3);
    const si = faultTable(tableContext(circuit, result, 'si', perUnit));
    expect(si.columns[3]).toBe('A (A)');
    expect(si.rows[0][3]).toBe(formatMagnitude(ia));
  });
});

describe('PowerSummary units', () => {
  it('switches the power balance to pu of the system base, and back', async () => {
    const base = { baseMva: 0.5, baseKv: {} };
    const src = result.totals.sourcePower;
    render(<PowerSummary result={result} perUnit={base} />);
    const table = screen.getByRole('table', { name: 'Power summary' });
    const row = () => within(table).getByRole('row', { name: /Delivered by sources/ });
    expect(row()).toHaveTextContent(`${formatMagnitude(src.re / 1000)} kW`);
    const group = screen.getByRole('group', { name: 'Power units' });
    await userEvent.click(within(group).getByRole('button', { name: 'pu' }));
    const expected = (src.re / (base.baseMva * 1e6)).toFixed(3);
    expect(Number(expected)).toBeGreaterThan(0.01);
    expect(row()).toHaveTextContent(`${expected} pu`);
    expect(within(table).getAllByRole('columnheader')[1]).toHaveTextContent('P (pu)');
    await userEvent.click(within(group).getByRole('button', { name: 'kW, kvar' }));
    expect(row()).toHaveTextContent('kW');
  });
});
