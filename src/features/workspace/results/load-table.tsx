/**
 * The "Load voltages" table: per load (and per branch of a three-phase load) the voltage across its
 * own terminals, its rating and that voltage in per unit of it, and its verdict against the limit
 * set. A load behind a broken neutral is judged on what it sees, not on the bus figure.
 */
import { useMemo, useState } from 'react';
import type { CircuitResult, LoadBranchResult, LoadResult } from '../../../../shared/engine/index.ts';
import { busBase, readPerUnitSettings, type PerUnitSettings, type ResultUnits } from '../../../../shared/report/per-unit.ts';
import { PhasorCell } from './bus-table.tsx';
import { formatMagnitude } from './format.ts';
import { phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';
import { UnitsSwitch } from './units-switch.tsx';

/** One row: a branch of a load. */
export interface LoadRow {
  rowId: string;
  load: LoadResult;
  branch: LoadBranchResult;
}

/** The branch in words: "C–N", "A–B", "A to own star point". */
export function branchLabel(b: Pick<LoadBranchResult, 'fromConductor' | 'toConductor'>, standard: WiringStandard): string {
  const from = phaseStyle(b.fromConductor, standard).label;
  return b.toConductor === 'star' ? `${from} to own star point` : `${from}–${phaseStyle(b.toConductor, standard).label}`;
}

/** Per unit with two decimals ("1.39"), as the diagram shows it. */
export const formatPu = (pu: number | undefined): string => (pu === undefined || !Number.isFinite(pu) ? '—' : pu.toFixed(2));

export const STATUS_TEXT: Record<LoadBranchResult['status'], { sign: string; words: string; cls: string }> = {
  ok: { sign: '✓', words: 'within limits', cls: 'text-ok' },
  'warning-high': { sign: '▲', words: 'Warning: high', cls: 'text-caution font-semibold' },
  'warning-low': { sign: '▼', words: 'Warning: low', cls: 'text-caution font-semibold' },
  'violation-high': { sign: '✖', words: 'Violation: over voltage', cls: 'text-danger font-semibold' },
  'violation-low': { sign: '✖', words: 'Violation: under voltage', cls: 'text-danger font-semibold' },
  unrated: { sign: '–', words: 'no rating known', cls: 'text-ink-muted' },
};

/** Rows of the table, one per branch, the first branch of a load carrying the load's id as row id. */
export function loadRows(result: CircuitResult): LoadRow[] {
  return (result.loads ?? []).flatMap((load) => load.branches.map((branch, k) => ({ rowId: k === 0 ? load.id : `${load.id}\u0000${branch.branch}`, load, branch })));
}

/**
 * Base voltage (V) of a branch in the "pu of base" view: the bus's line-to-line base across two
 * phases, its line-to-neutral base otherwise, as the report and the CSV take it.
 */
export function branchBaseVolts(result: CircuitResult, r: LoadRow, perUnit: PerUnitSettings): number | undefined {
  const b = result.buses.find((x) => x.bus === r.load.bus);
  const base = b ? busBase(perUnit, b) : undefined;
  const phaseToPhase = /^[abc12]$/.test(r.branch.fromConductor) && /^[abc12]$/.test(r.branch.toConductor);
  return phaseToPhase ? base?.vLL : base?.vLN;
}

function columns(result: CircuitResult, standard: WiringStandard, units: ResultUnits, perUnit: PerUnitSettings): ResultColumn<LoadRow>[] {
  const pu = units === 'pu';
  const base = (r: LoadRow) => (pu ? branchBaseVolts(result, r, perUnit) : undefined);
  const shown = (r: LoadRow) => {
    const b = base(r);
    return pu ? (b ? r.branch.voltage.mag / b : undefined) : r.branch.voltage.mag;
  };
  const u = pu ? 'pu' : 'V';
  return [
    {
      id: 'load',
      header: 'Load',
      sortValue: (r) => r.load.id,
      render: (r) => <span className="font-semibold">{r.load.id}</span>,
      tsvHeader: ['Load'],
      tsv: (r) => [r.load.id],
    },
    { id: 'bus', header: 'Bus', sortValue: (r) => r.load.bus, render: (r) => r.load.bus, tsvHeader: ['Bus'], tsv: (r) => [r.load.bus] },
    { id: 'across', header: 'Across', sortValue: (r) => branchLabel(r.branch, standard), render: (r) => branchLabel(r.branch, standard), tsvHeader: ['Across'], tsv: (r) => [branchLabel(r.branch, standard)] },
    {
      id: 'v',
      header: pu ? 'Terminal voltage, of bus base (pu∠°)' : 'Terminal voltage (V∠°)',
      numeric: true,
      sortValue: shown,
      render: (r) => (pu && !base(r) ? <span className="text-ink-faint">—</span> : <PhasorCell p={r.branch.voltage} base={base(r)} />),
      tsvHeader: [pu ? 'Terminal voltage, of bus base |V| (pu)' : 'Terminal voltage |V| (V)', 'Terminal voltage angle (°)'],
      tsv: (r) => {
        const m = shown(r);
        return m === undefined ? ['', ''] : [String(m), String(r.branch.voltage.angleDeg)];
      },
    },
    {
      id: 'rated',
      header: 'Rating (V)',
      numeric: true,
      sortValue: (r) => r.branch.ratedVolts,
      render: (r) =>
        r.branch.ratedVolts === undefined ? (
          '—'
        ) : (
          <span title={r.branch.ratedFrom === 'load' ? "the load's own rating" : 'the bus nominal voltage'}>
            {formatMagnitude(r.branch.ratedVolts)}
            <span className="text-ink-muted"> ({r.branch.ratedFrom === 'load' ? 'load' : 'bus'})</span>
          </span>
        ),
      tsvHeader: ['Rating (V)', 'Rating from'],
      tsv: (r) => [r.branch.ratedVolts?.toString() ?? '', r.branch.ratedFrom ?? ''],
    },
    {
      id: 'pu',
      header: 'Per unit (pu)',
      numeric: true,
      sortValue: (r) => r.branch.pu,
      render: (r) => formatPu(r.branch.pu),
      tsvHeader: ['Per unit of rating'],
      tsv: (r) => [r.branch.pu?.toString() ?? ''],
    },
    {
      id: 'flag',
      header: 'Flag',
      sortValue: (r) => ['violation-high', 'violation-low', 'warning-high', 'warning-low', 'unrated', 'ok'].indexOf(r.branch.status),
      render: (r) => {
        const s = STATUS_TEXT[r.branch.status];
        return (
          <span className={s.cls}>
            <span aria-hidden="true">{s.sign} </span>
            {s.words}
          </span>
        );
      },
      tsvHeader: ['Flag'],
      tsv: (r) => [STATUS_TEXT[r.branch.status].words],
    },
  ];
}

/** Terminal voltages of every load; `selectedId` highlights the canvas selection. */
export function LoadTable({ result, standard, selectedId, onSelect, perUnit }: { result: CircuitResult; standard: WiringStandard; selectedId?: string | null; onSelect?: (id: string) => void; perUnit?: PerUnitSettings }) {
  const [units, setUnits] = useState<ResultUnits>('si');
  const bases = useMemo(() => perUnit ?? readPerUnitSettings(undefined), [perUnit]);
  const cols = useMemo(() => columns(result, standard, units, bases), [result, standard, units, bases]);
  const rows = useMemo(() => loadRows(result), [result]);
  if (rows.length === 0) return null;
  const l = result.limits;
  return (
    <div>
      <UnitsSwitch
        label="Load voltage units"
        lead="Terminal voltages in"
        siWord="V"
        units={units}
        onChange={setUnits}
        note={`of the bus's base (line to line across two phases, else line to neutral) on ${bases.baseMva} MVA; the rating column and its per unit stay as they are.`}
      />
      <ResultsTable label="Load voltages" rows={rows} columns={cols} rowId={(r) => r.rowId} selectedId={selectedId} onRowSelect={onSelect ? (id) => onSelect(id.split('\u0000')[0]) : undefined} />
      <p className="mt-1 text-[11px] text-ink-muted">
        The voltage across each load's own terminals (each branch of a three-phase load), RMS, in per unit of the load's rating (its own, else the bus nominal).
        Flag against the limit set: warning outside {l.voltageWarningPu.map((x) => x.toFixed(3)).join('–')} pu, violation outside {l.voltageViolationPu.map((x) => x.toFixed(3)).join('–')} pu.
      </p>
    </div>
  );
}
