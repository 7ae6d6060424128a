/**
 * The results tables of the report and the CSV speak of what the user drew: an opened connection
 * (the workspace's hidden switch and private terminal bus) reads as the load and the bus drawn,
 * never a generated name; per-unit cells are V / V_base of the solved values.
 */
import { describe, expect, it } from 'vitest';
import { demoCircuits, solveCircuit } from '../../../shared/engine/index.ts';
import { csvText, toCsv } from '../../../shared/report/csv.ts';
import { formatPu } from '../../../shared/report/format.ts';
import { readPerUnitSettings } from '../../../shared/report/per-unit.ts';
import { oneLineSvg } from '../../../shared/report/one-line.ts';
import { busTable, elementTable, flagTable, loadTable, powerTable, tableContext } from '../../../shared/report/tables.ts';
import { SAFETY_CAUTION } from '../../../shared/review/risk.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
/** The demo with the neutral intact on the drop and opened instead on KITCHEN's connection, as the canvas writes it. */
const openedConnection = {
  ...openNeutral,
  elements: [
    ...openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e.id === 'KITCHEN' ? { ...e, bus: 'KITCHEN~bus' } : e)),
    { type: 'switch3', id: 'KITCHEN~bus~sw', from: 'HOUSE', to: 'KITCHEN~bus', open: ['n'] },
  ],
};

describe('report tables', () => {
  it('never show a generated name', () => {
    const result = solveCircuit(openedConnection);
    const ctx = tableContext(openedConnection, result, 'si', readPerUnitSettings(undefined));
    const tables = [busTable(ctx), loadTable(ctx), elementTable(ctx), powerTable(ctx), flagTable(ctx)];
    const text = tables.map((t) => toCsv(t).split('\r\n').slice(1).join('\n')).join('\n');
    expect(result.buses.some((b) => b.bus.includes('~'))).toBe(true);
    expect(text).not.toMatch(/~|#|switch3/);
    expect(loadTable(ctx).rows.find((r) => r[0] === 'KITCHEN')![1]).toBe('HOUSE');
    expect(oneLineSvg(openedConnection, undefined, 'Plex').svg).not.toMatch(/~/);
    expect(oneLineSvg(openedConnection, undefined, 'Plex').svg).toContain('neutral open');
  });

  it('draws several sources on one bus side by side, not on top of each other', () => {
    const source = (id: string) => ({ type: 'source', id, bus: 'B1', kvLL: 0.4, impedance: { z1: { re: 0.01, im: 0.05 } } });
    const circuit = { format: 'wyeward-circuit', version: 1, frequencyHz: 50, elements: [source('S1'), source('S2'), source('S3')] };
    const { labels } = oneLineSvg(circuit, undefined, 'Plex', { labels: false });
    const xs = ['S1', 'S2', 'S3'].map((id) => labels.find((l) => l.text === id)!.x);
    expect(new Set(xs).size).toBe(3);
    const sorted = [...xs].sort((a, b) => a - b);
    expect(sorted[1] - sorted[0]).toBeGreaterThanOrEqual(60); // a symbol's width apart at least
  });

  it('write per unit as V / V_base of the solved values', () => {
    const result = solveCircuit(openNeutral);
    const pu = busTable(tableContext(openNeutral, result, 'pu', readPerUnitSettings(undefined)));
    const house = result.buses.find((b) => b.bus === 'HOUSE')!;
    const row = pu.rows.find((r) => r[0] === 'HOUSE')!;
    const col = (h: string) => pu.columns.indexOf(h);
    // V_base line to neutral of the 0.208 kV level: 208/√3 V; line to line 208 V.
    expect(row[col('C–N (pu)')]).toBe(formatPu(house.lineToNeutral.c.mag / (208 / Math.sqrt(3))));
    expect(row[col('A–B (pu)')]).toBe(formatPu(house.lineToLine.ab.mag / 208));
    expect(row[col('Neutral shift (pu)')]).toBe(formatPu(house.neutralToEarth!.mag / (208 / Math.sqrt(3))));
    expect(row[col('C–N (pu)')]).toBe('1.393');
  });

  it('put the caution first in every CSV', () => {
    const result = solveCircuit(openNeutral);
    const csv = toCsv(flagTable(tableContext(openNeutral, result, 'si', readPerUnitSettings(undefined))));
    expect(csv.split('\r\n')[0]).toBe(`# Caution: ${SAFETY_CAUTION}`);
    expect(csv).toContain('"');
  });

  it('quote what needs quoting and keep spreadsheets from running a name as a formula', () => {
    const lines = csvText(['Name', 'Value (V)'], [['=SUM(A1)', '-4.70'], ['a, "b"', '−2.1°'], ['-x', '+1']]).split('\r\n');
    expect(lines.slice(1, 5)).toEqual(['Name,Value (V)', "'=SUM(A1),-4.70", '"a, ""b""",−2.1°', "'-x,'+1"]);
  });
});
