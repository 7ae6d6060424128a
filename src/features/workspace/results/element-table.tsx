/** The "Element currents" table: conductor currents at each element's first connection, power, losses, loading. */
import { useMemo } from 'react';
import type { CircuitResult, ElementResult, Phasor } from '../../../../shared/engine/index.ts';
import { PhasorCell } from './bus-table.tsx';
import { FlagMark } from './flag-mark.tsx';
import { formatPowerFactor, formatValue } from './format.ts';
import { phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';

const CONDUCTORS = ['a', 'b', 'c', 'n', '1', '2'];

/** Current of one conductor at an element's first port. */
export function firstPortCurrent(e: ElementResult, conductor: string): Phasor | undefined {
  const port = e.ports?.[0];
  if (!port) return undefined;
  const i = port.conductors.indexOf(conductor);
  return i >= 0 ? port.currents[i] : undefined;
}

const buses = (e: ElementResult) => [...new Set((e.ports ?? []).map((p) => p.bus).filter((b): b is string => !!b))];

function elementColumns(result: CircuitResult, standard: WiringStandard): ResultColumn<ElementResult>[] {
  const all = Object.values(result.elements);
  const present = CONDUCTORS.filter((c) => all.some((e) => firstPortCurrent(e, c)));
  const flagsOf = (e: ElementResult) => result.flags.filter((f) => f.elementId === e.id);
  const num = (id: string, header: string, unit: string, get: (e: ElementResult) => number | undefined, digits?: number): ResultColumn<ElementResult> => ({
    id,
    header: `${header} (${unit})`,
    numeric: true,
    sortValue: get,
    render: (e) => formatValue(get(e), unit, digits),
    tsvHeader: [`${header} (${unit})`],
    tsv: (e) => [get(e)?.toString() ?? ''],
  });
  const phasor = (id: string, header: string, get: (e: ElementResult) => Phasor | undefined): ResultColumn<ElementResult> => ({
    id,
    header: `${header} (A∠°)`,
    numeric: true,
    sortValue: (e) => get(e)?.mag,
    render: (e) => <PhasorCell p={get(e)} />,
    tsvHeader: [`${header} |I| (A)`, `${header} angle (°)`],
    tsv: (e) => {
      const p = get(e);
      return p ? [String(p.mag), String(p.angleDeg)] : ['', ''];
    },
  });
  return [
    { id: 'id', header: 'Element', sortValue: (e) => e.id, render: (e) => <span className="font-semibold">{e.id}</span>, tsvHeader: ['Element'], tsv: (e) => [e.id] },
    { id: 'type', header: 'Type', sortValue: (e) => e.type, render: (e) => e.type, tsvHeader: ['Type'], tsv: (e) => [e.type] },
    { id: 'bus', header: 'Bus', sortValue: (e) => buses(e).join(' → '), render: (e) => buses(e).join(' → ') || '—', tsvHeader: ['Bus'], tsv: (e) => [buses(e).join(' -> ')] },
    ...present.map((c) => phasor(`i-${c}`, `I ${phaseStyle(c, standard).label}`, (e) => firstPortCurrent(e, c))),
    phasor('i-earth', 'I to earth', (e) => e.earthCurrent),
    num('p', 'P', 'kW', (e) => e.power.re / 1000),
    num('q', 'Q', 'kvar', (e) => e.power.im / 1000),
    { id: 'pf', header: 'PF', numeric: true, sortValue: (e) => (e.power.mag ? Math.abs(e.power.re) / e.power.mag : undefined), render: (e) => formatPowerFactor(e.power), tsvHeader: ['PF'], tsv: (e) => [formatPowerFactor(e.power)] },
    num('losses', 'Losses', 'kW', (e) => (e.losses ? e.losses.re / 1000 : undefined)),
    num('loading', 'Loading', '%', (e) => e.loadingPercent, 1),
    { id: 'flags', header: 'Flags', sortValue: (e) => flagsOf(e).length, render: (e) => <FlagMark flags={flagsOf(e)} />, tsvHeader: ['Flags'], tsv: (e) => [flagsOf(e).map((f) => f.message).join('; ')] },
  ];
}

/** Element currents of a result; `selectedId` highlights the canvas selection. */
export function ElementTable({ result, standard, selectedId, onSelect }: { result: CircuitResult; standard: WiringStandard; selectedId?: string | null; onSelect?: (id: string) => void }) {
  const columns = useMemo(() => elementColumns(result, standard), [result, standard]);
  const rows = useMemo(() => Object.values(result.elements), [result]);
  return (
    <div>
      <ResultsTable label="Element currents" rows={rows} columns={columns} rowId={(e) => e.id} selectedId={selectedId} onRowSelect={onSelect} />
      <p className="mt-1 text-[11px] text-ink-muted">
        Currents at each element's first connection, RMS: into the element for loads and series elements, out of the source for sources. P and Q:
        S = V·I*, load convention, Q &gt; 0 lagging; sources show what they deliver.
      </p>
    </div>
  );
}
