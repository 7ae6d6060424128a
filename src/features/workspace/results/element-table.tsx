/**
 * The "Element currents" table: conductor currents at each element's first connection (both sides
 * of a transformer bank, one row each), power, losses, loading, flags.
 */
import { useMemo, useState } from 'react';
import type { CircuitResult, ElementResult, Phasor } from '../../../../shared/engine/index.ts';
import { formatPu } from '../../../../shared/report/format.ts';
import { busBase, readPerUnitSettings, type PerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import { PhasorCell } from './bus-table.tsx';
import { FlagMark } from './flag-mark.tsx';
import { formatPowerFactor, formatValue } from './format.ts';
import { phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';
import { UnitsSwitch } from './units-switch.tsx';

const CONDUCTORS = ['a', 'b', 'c', 'n', '1', '2'];

/** Current of one conductor at an element's first port. */
export function firstPortCurrent(e: ElementResult, conductor: string): Phasor | undefined {
  const port = e.ports?.[0];
  if (!port) return undefined;
  const i = port.conductors.indexOf(conductor);
  return i >= 0 ? port.currents[i] : undefined;
}

const buses = (e: ElementResult) => [...new Set((e.ports ?? []).map((p) => p.bus).filter((b): b is string => !!b))];

/** Element kinds in words (never the file format's type names). */
export const TYPE_WORDS: Record<string, string> = {
  source: 'Source',
  splitPhaseSource: 'Split-phase source',
  line: 'Line / cable',
  transformer: 'Transformer bank',
  splitPhaseTransformer: 'Single-phase transformer',
  load: 'Load',
  capacitorBank: 'Capacitor bank',
  switch3: 'Switch',
  earthing: 'Earth electrode',
  fault: 'Fault',
};
export const typeWords = (type: string): string => TYPE_WORDS[type] ?? 'Network element';

const TWO_SIDED = new Set(['transformer', 'splitPhaseTransformer']);

/** Which side of an element a port is: "HV side (PMT)", "LV side (PM208)"; for others its bus. */
export function sideLabel(e: ElementResult, port: number): string {
  const bus = e.ports?.[port]?.bus;
  if (TWO_SIDED.has(e.type)) return `${port === 0 ? (e.type === 'transformer' ? 'HV side' : 'Primary') : e.type === 'transformer' ? 'LV side' : 'Secondary'}${bus ? ` (${bus})` : ''}`;
  return bus ?? '—';
}

/** One row of the table: an element at one of its connections. */
export interface ElementRow {
  rowId: string;
  e: ElementResult;
  port: number;
}

/** Rows: one per element, two for a transformer (HV and LV sides). */
export function elementRows(result: CircuitResult): ElementRow[] {
  return Object.values(result.elements).flatMap((e) => {
    const rows: ElementRow[] = [{ rowId: e.id, e, port: 0 }];
    if (TWO_SIDED.has(e.type) && (e.ports?.length ?? 0) > 1) rows.push({ rowId: `${e.id}\u0000lv`, e, port: 1 });
    return rows;
  });
}

function portCurrent(e: ElementResult, port: number, conductor: string): Phasor | undefined {
  const p = e.ports?.[port];
  if (!p) return undefined;
  const i = p.conductors.indexOf(conductor);
  return i >= 0 ? p.currents[i] : undefined;
}

/**
 * Base current (A) of a row's side: I_base = S_base / (√3 · V_base,LL) of the voltage level of the
 * bus that side connects to, as the report and the CSV take it (undefined without a nominal voltage).
 */
export function rowBaseAmps(result: CircuitResult, r: ElementRow, perUnit: PerUnitSettings): number | undefined {
  const bus = r.e.ports?.[r.port]?.bus;
  const b = bus ? result.buses.find((x) => x.bus === bus) : undefined;
  return b ? busBase(perUnit, b)?.amps : undefined;
}

const puText = (x: number | undefined) => (x === undefined || !Number.isFinite(x) ? '—' : formatPu(x));

function elementColumns(result: CircuitResult, standard: WiringStandard, units: ResultUnits, perUnit: PerUnitSettings): ResultColumn<ElementRow>[] {
  const pu = units === 'pu';
  const sBase = perUnit.baseMva * 1e6;
  const all = elementRows(result);
  const present = CONDUCTORS.filter((c) => all.some((r) => portCurrent(r.e, r.port, c)));
  const flagsOf = (e: ElementResult) => result.flags.filter((f) => f.elementId === e.id);
  // Power, losses, loading and flags belong to the element: shown once, on its first row.
  const num = (id: string, header: string, unit: string, getE: (e: ElementResult) => number | undefined, digits?: number): ResultColumn<ElementRow> => {
    const get = (r: ElementRow) => (r.port === 0 ? getE(r.e) : undefined);
    return {
      id,
      header: `${header} (${unit})`,
      numeric: true,
      sortValue: get,
      render: (r) => (r.port === 0 ? (unit === 'pu' ? puText(get(r)) : formatValue(get(r), unit, digits)) : ''),
      tsvHeader: [`${header} (${unit})`],
      tsv: (r) => [get(r)?.toString() ?? ''],
    };
  };
  // In pu, a current over the base current of its side's level; `inPu` false keeps a column in A (earth currents, as in the report).
  const phasor = (id: string, header: string, get: (r: ElementRow) => Phasor | undefined, inPu = pu): ResultColumn<ElementRow> => {
    const u = inPu ? 'pu' : 'A';
    const base = (r: ElementRow) => (inPu ? rowBaseAmps(result, r, perUnit) : undefined);
    const shown = (r: ElementRow) => {
      const p = get(r);
      const b = base(r);
      return p === undefined ? undefined : inPu ? (b ? p.mag / b : undefined) : p.mag;
    };
    return {
      id,
      header: `${header} (${u}∠°)`,
      numeric: true,
      sortValue: shown,
      render: (r) => (inPu && get(r) && !base(r) ? <span className="text-ink-faint">—</span> : <PhasorCell p={get(r)} base={base(r)} />),
      tsvHeader: [`${header} |I| (${u})`, `${header} angle (°)`],
      tsv: (r) => {
        const p = get(r);
        const m = shown(r);
        return p && m !== undefined ? [String(m), String(p.angleDeg)] : ['', ''];
      },
    };
  };
  const first = (r: ElementRow) => r.port === 0;
  return [
    { id: 'id', header: 'Element', sortValue: (r) => r.e.id, render: (r) => <span className="font-semibold">{r.e.id}</span>, tsvHeader: ['Element'], tsv: (r) => [r.e.id] },
    { id: 'type', header: 'Type', sortValue: (r) => typeWords(r.e.type), render: (r) => typeWords(r.e.type), tsvHeader: ['Type'], tsv: (r) => [typeWords(r.e.type)] },
    {
      id: 'bus',
      header: 'Bus',
      sortValue: (r) => (TWO_SIDED.has(r.e.type) ? sideLabel(r.e, r.port) : buses(r.e).join(' → ')),
      render: (r) => (TWO_SIDED.has(r.e.type) ? sideLabel(r.e, r.port) : buses(r.e).join(' → ') || '—'),
      tsvHeader: ['Bus'],
      tsv: (r) => [TWO_SIDED.has(r.e.type) ? sideLabel(r.e, r.port) : buses(r.e).join(' -> ')],
    },
    ...present.map((c) => phasor(`i-${c}`, `I ${phaseStyle(c, standard).label}`, (r) => portCurrent(r.e, r.port, c))),
    phasor('i-earth', 'I to earth', (r) => (first(r) ? r.e.earthCurrent : undefined), false),
    pu ? num('p', 'P', 'pu', (e) => e.power.re / sBase) : num('p', 'P', 'kW', (e) => e.power.re / 1000),
    pu ? num('q', 'Q', 'pu', (e) => e.power.im / sBase) : num('q', 'Q', 'kvar', (e) => e.power.im / 1000),
    {
      id: 'pf',
      header: 'PF',
      numeric: true,
      sortValue: (r) => (first(r) && r.e.power.mag ? Math.abs(r.e.power.re) / r.e.power.mag : undefined),
      render: (r) => (first(r) ? formatPowerFactor(r.e.power) : ''),
      tsvHeader: ['PF'],
      tsv: (r) => [first(r) ? formatPowerFactor(r.e.power) : ''],
    },
    pu ? num('losses', 'Losses', 'pu', (e) => (e.losses ? e.losses.re / sBase : undefined)) : num('losses', 'Losses', 'kW', (e) => (e.losses ? e.losses.re / 1000 : undefined)),
    num('loading', 'Loading', '%', (e) => e.loadingPercent, 1),
    {
      id: 'flags',
      header: 'Flags',
      sortValue: (r) => (first(r) ? flagsOf(r.e).length : undefined),
      render: (r) => (first(r) ? <FlagMark flags={flagsOf(r.e)} /> : ''),
      tsvHeader: ['Flags'],
      tsv: (r) => [first(r) ? flagsOf(r.e).map((f) => f.message).join('; ') : ''],
    },
  ];
}

/**
 * Element currents of a result; `selectedId` highlights the canvas selection. An A/pu switch shows
 * the conductor currents in per unit of the base current of each side's level and P, Q, losses in
 * per unit of the system base (the study's bases, `perUnit`); earth currents stay in A, as in the report.
 */
export function ElementTable({ result, standard, selectedId, onSelect, perUnit }: { result: CircuitResult; standard: WiringStandard; selectedId?: string | null; onSelect?: (id: string) => void; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  const columns = useMemo(() => elementColumns(result, standard, units, bases), [result, standard, units, bases]);
  const rows = useMemo(() => elementRows(result), [result]);
  return (
    <div>
      <UnitsSwitch
        label="Element current units"
        lead="Currents in"
        siWord="A"
        units={units}
        onChange={setUnits}
        note={`of the base current of each side's level, I_base = S_base / (√3 · V_base,LL), on ${bases.baseMva} MVA; P, Q and losses in pu of ${bases.baseMva} MVA; earth currents in A.`}
      />
      <ResultsTable label="Element currents" rows={rows} columns={columns} rowId={(r) => r.rowId} selectedId={selectedId} onRowSelect={onSelect ? (id) => onSelect(id.split('\u0000')[0]) : undefined} />
      <p className="mt-1 text-[11px] text-ink-muted">
        Currents at each element's first connection, and at both sides of a transformer bank, RMS: into the element for loads and series elements, out of the source for sources. P and Q:
        S = V·I*, load convention, Q &gt; 0 lagging; sources show what they deliver.
      </p>
    </div>
  );
}
