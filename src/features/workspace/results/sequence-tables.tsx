/**
 * Sequence components (a = 1∠120°): per bus of the phase-to-earth set and of the line-to-neutral
 * set (relative to the bus neutral: the same V1 and V2, V0 less the neutral shift, so a set that
 * looks balanced to earth can show its whole shift here), and per element and side the sequence
 * components of its phase currents.
 */
import { useMemo } from 'react';
import type { BusResult, CircuitResult, ElementResult, PortResult, SequenceResult } from '../../../../shared/engine/index.ts';
import { PhasorCell } from './bus-table.tsx';
import { ResultsTable, type ResultColumn } from './results-table.tsx';
import { sideLabel } from './element-table.tsx';

const KEYS: [keyof SequenceResult, string][] = [
  ['zero', '0'],
  ['positive', '1'],
  ['negative', '2'],
];

function seqColumns<Row>(prefix: string, symbol: 'V' | 'I', what: string, get: (r: Row) => SequenceResult | undefined): ResultColumn<Row>[] {
  const unit = symbol === 'V' ? 'V' : 'A';
  const name = (n: string) => `${symbol}${n}${what ? ` ${what}` : ''}`;
  return KEYS.map(([k, n]) => ({
    id: `${prefix}-${k}`,
    header: `${name(n)} (${unit}∠°)`,
    numeric: true,
    sortValue: (r: Row) => get(r)?.[k].mag,
    render: (r: Row) => <PhasorCell p={get(r)?.[k]} />,
    tsvHeader: [`${name(n)} |${symbol}| (${unit})`, `${name(n)} angle (°)`],
    tsv: (r: Row) => {
      const p = get(r)?.[k];
      return p ? [String(p.mag), String(p.angleDeg)] : ['', ''];
    },
  }));
}

/** Sequence voltages of every three-phase bus: to earth and to the bus neutral. */
export function SequenceVoltageTable({ result, selectedBus, onSelectBus }: { result: CircuitResult; selectedBus?: string | null; onSelectBus?: (bus: string) => void }) {
  const rows = useMemo(() => result.buses.filter((b) => b.sequence), [result]);
  const columns = useMemo<ResultColumn<BusResult>[]>(
    () => [
      { id: 'bus', header: 'Bus', sortValue: (b) => b.bus, render: (b) => <span className="font-semibold">{b.bus}</span>, tsvHeader: ['Bus'], tsv: (b) => [b.bus] },
      ...seqColumns<BusResult>('e', 'V', 'to earth', (b) => b.sequence),
      ...seqColumns<BusResult>('n', 'V', 'to neutral', (b) => b.sequenceToNeutral),
    ],
    [],
  );
  if (rows.length === 0) return null;
  return (
    <div>
      <ResultsTable label="Sequence voltages" rows={rows} columns={columns} rowId={(b) => b.bus} selectedId={selectedBus} onRowSelect={onSelectBus} />
      <p className="mt-1 text-[11px] text-ink-muted">
        Symmetrical components, a = 1∠120°, RMS. To earth: of the phase-to-earth voltages. To neutral: of the line-to-neutral voltages, relative to the bus neutral (V1 and
        V2 are the same; V0 differs by the neutral-to-earth voltage). A bus without a neutral has no line-to-neutral set.
      </p>
    </div>
  );
}

interface PortRow {
  rowId: string;
  element: ElementResult;
  port: PortResult;
  side: string;
}

/** Sequence components of the phase currents of every element, per side (both sides of a transformer bank). */
export function SequenceCurrentTable({ result, selectedId, onSelect }: { result: CircuitResult; selectedId?: string | null; onSelect?: (id: string) => void }) {
  const rows = useMemo<PortRow[]>(
    () =>
      Object.values(result.elements).flatMap((e) =>
        (e.ports ?? []).flatMap((p, k) => {
          if (!p.sequence) return [];
          // One row per port; a line's far end carries the same currents (less shunt) and is left out.
          if (k > 0 && e.type !== 'transformer' && e.type !== 'splitPhaseTransformer') return [];
          return [{ rowId: k === 0 ? e.id : `${e.id}\u0000${k}`, element: e, port: p, side: sideLabel(e, k) }];
        }),
      ),
    [result],
  );
  const columns = useMemo<ResultColumn<PortRow>[]>(
    () => [
      { id: 'el', header: 'Element', sortValue: (r) => r.element.id, render: (r) => <span className="font-semibold">{r.element.id}</span>, tsvHeader: ['Element'], tsv: (r) => [r.element.id] },
      { id: 'side', header: 'At', sortValue: (r) => r.side, render: (r) => r.side, tsvHeader: ['At'], tsv: (r) => [r.side] },
      ...seqColumns<PortRow>('i', 'I', '', (r) => r.port.sequence),
    ],
    [],
  );
  if (rows.length === 0) return null;
  return (
    <div>
      <ResultsTable label="Sequence currents" rows={rows} columns={columns} rowId={(r) => r.rowId} selectedId={selectedId} onRowSelect={onSelect ? (id) => onSelect(id.split('\u0000')[0]) : undefined} />
      <p className="mt-1 text-[11px] text-ink-muted">Symmetrical components of the phase currents a, b, c at each connection, a = 1∠120°, RMS, in the direction of the element currents table.</p>
    </div>
  );
}
