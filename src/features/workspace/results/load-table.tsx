/**
 * The "Load voltages" table: per load (and per branch of a three-phase load) the voltage across its
 * own terminals, its rating and that voltage in per unit of it, and its verdict against the limit
 * set. A load behind a broken neutral is judged on what it sees, not on the bus figure.
 */
import { useMemo } from 'react';
import type { CircuitResult, LoadBranchResult, LoadResult } from '../../../../shared/engine/index.ts';
import { PhasorCell } from './bus-table.tsx';
import { formatMagnitude } from './format.ts';
import { phaseStyle, type WiringStandard } from './phase-style.ts';
import { ResultsTable, type ResultColumn } from './results-table.tsx';

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

function columns(standard: WiringStandard): ResultColumn<LoadRow>[] {
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
      header: 'Terminal voltage (V∠°)',
      numeric: true,
      sortValue: (r) => r.branch.voltage.mag,
      render: (r) => <PhasorCell p={r.branch.voltage} />,
      tsvHeader: ['Terminal voltage |V| (V)', 'Terminal voltage angle (°)'],
      tsv: (r) => [String(r.branch.voltage.mag), String(r.branch.voltage.angleDeg)],
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
export function LoadTable({ result, standard, selectedId, onSelect }: { result: CircuitResult; standard: WiringStandard; selectedId?: string | null; onSelect?: (id: string) => void }) {
  const cols = useMemo(() => columns(standard), [standard]);
  const rows = useMemo(() => loadRows(result), [result]);
  if (rows.length === 0) return null;
  const l = result.limits;
  return (
    <div>
      <ResultsTable label="Load voltages" rows={rows} columns={cols} rowId={(r) => r.rowId} selectedId={selectedId} onRowSelect={onSelect ? (id) => onSelect(id.split('\u0000')[0]) : undefined} />
      <p className="mt-1 text-[11px] text-ink-muted">
        The voltage across each load's own terminals (each branch of a three-phase load), RMS, in per unit of the load's rating (its own, else the bus nominal).
        Flag against the limit set: warning outside {l.voltageWarningPu.map((x) => x.toFixed(3)).join('–')} pu, violation outside {l.voltageViolationPu.map((x) => x.toFixed(3)).join('–')} pu.
      </p>
    </div>
  );
}
