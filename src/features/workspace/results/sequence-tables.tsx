/**
 * Sequence components (a = 1∠120°): per bus of the phase-to-earth set and of the line-to-neutral
 * set (relative to the bus neutral: the same V1 and V2, V0 less the neutral shift, so a set that
 * looks balanced to earth can show its whole shift here), and per element and side the sequence
 * components of its phase currents.
 */
import { useMemo, useState } from 'react';
import type { BusResult, CircuitResult, ElementResult, PortResult, SequenceResult } from '../../../../shared/engine/index.ts';
import { busBase, readPerUnitSettings, type PerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import { PhasorCell } from './bus-table.tsx';
import { ResultsTable, type ResultColumn } from './results-table.tsx';
import { sideLabel } from './element-table.tsx';
import { UnitsSwitch } from './units-switch.tsx';

const KEYS: [keyof SequenceResult, string][] = [
  ['zero', '0'],
  ['positive', '1'],
  ['negative', '2'],
];

/** With `base` (per row), magnitudes in per unit of it ("—" where a row has no base). */
function seqColumns<Row>(prefix: string, symbol: 'V' | 'I', what: string, get: (r: Row) => SequenceResult | undefined, base?: (r: Row) => number | undefined): ResultColumn<Row>[] {
  const unit = base ? 'pu' : symbol === 'V' ? 'V' : 'A';
  const name = (n: string) => `${symbol}${n}${what ? ` ${what}` : ''}`;
  return KEYS.map(([k, n]) => {
    const shown = (r: Row) => {
      const p = get(r)?.[k];
      const b = base?.(r);
      return p === undefined ? undefined : base ? (b ? p.mag / b : undefined) : p.mag;
    };
    return {
      id: `${prefix}-${k}`,
      header: `${name(n)} (${unit}∠°)`,
      numeric: true,
      sortValue: shown,
      render: (r: Row) => (base && get(r) && !base(r) ? <span className="text-ink-faint">—</span> : <PhasorCell p={get(r)?.[k]} base={base?.(r)} />),
      tsvHeader: [`${name(n)} |${symbol}| (${unit})`, `${name(n)} angle (°)`],
      tsv: (r: Row) => {
        const p = get(r)?.[k];
        const m = shown(r);
        return p && m !== undefined ? [String(m), String(p.angleDeg)] : ['', ''];
      },
    };
  });
}

/** Sequence voltages of every three-phase bus: to earth and to the bus neutral. */
export function SequenceVoltageTable({ result, selectedBus, onSelectBus, perUnit }: { result: CircuitResult; selectedBus?: string | null; onSelectBus?: (bus: string) => void; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  const rows = useMemo(() => result.buses.filter((b) => b.sequence), [result]);
  const columns = useMemo<ResultColumn<BusResult>[]>(() => {
    // Sequence voltages in pu of the bus's line-to-neutral base, as the report's bus table takes them.
    const base = units === 'pu' ? (b: BusResult) => busBase(bases, b)?.vLN : undefined;
    return [
      { id: 'bus', header: 'Bus', sortValue: (b) => b.bus, render: (b) => <span className="font-semibold">{b.bus}</span>, tsvHeader: ['Bus'], tsv: (b) => [b.bus] },
      ...seqColumns<BusResult>('e', 'V', 'to earth', (b) => b.sequence, base),
      ...seqColumns<BusResult>('n', 'V', 'to neutral', (b) => b.sequenceToNeutral, base),
    ];
  }, [units, bases]);
  if (rows.length === 0) return null;
  return (
    <div>
      <UnitsSwitch
        label="Sequence voltage units"
        lead="Voltages in"
        siWord="V"
        units={units}
        onChange={setUnits}
        note={`of each bus's line-to-neutral base on ${bases.baseMva} MVA.`}
      />
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
export function SequenceCurrentTable({ result, selectedId, onSelect, perUnit }: { result: CircuitResult; selectedId?: string | null; onSelect?: (id: string) => void; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
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
  const columns = useMemo<ResultColumn<PortRow>[]>(() => {
    // In pu of the base current of the level of the bus each side connects to, as the element currents table.
    const baseOf = (r: PortRow) => {
      const b = r.port.bus ? result.buses.find((x) => x.bus === r.port.bus) : undefined;
      return b ? busBase(bases, b)?.amps : undefined;
    };
    return [
      { id: 'el', header: 'Element', sortValue: (r) => r.element.id, render: (r) => <span className="font-semibold">{r.element.id}</span>, tsvHeader: ['Element'], tsv: (r) => [r.element.id] },
      { id: 'side', header: 'At', sortValue: (r) => r.side, render: (r) => r.side, tsvHeader: ['At'], tsv: (r) => [r.side] },
      ...seqColumns<PortRow>('i', 'I', '', (r) => r.port.sequence, units === 'pu' ? baseOf : undefined),
    ];
  }, [result, units, bases]);
  if (rows.length === 0) return null;
  return (
    <div>
      <UnitsSwitch
        label="Sequence current units"
        lead="Currents in"
        siWord="A"
        units={units}
        onChange={setUnits}
        note={`of the base current of each side's level on ${bases.baseMva} MVA.`}
      />
      <ResultsTable label="Sequence currents" rows={rows} columns={columns} rowId={(r) => r.rowId} selectedId={selectedId} onRowSelect={onSelect ? (id) => onSelect(id.split('\u0000')[0]) : undefined} />
      <p className="mt-1 text-[11px] text-ink-muted">Symmetrical components of the phase currents a, b, c at each connection, a = 1∠120°, RMS, in the direction of the element currents table.</p>
    </div>
  );
}
