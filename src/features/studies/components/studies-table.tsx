import { createColumnHelper, rowSortingFeature, tableFeatures, useTable, type SortingState, type Updater } from '@tanstack/react-table';
import { useMemo } from 'react';
import { Link } from 'react-router';
import type { ListStudiesQuery, StudySummary } from '../../../../shared/api/studies.ts';
import { StatusBadge, TemplateBadge } from '../../../components/badges.tsx';
import { Button } from '../../../components/button.tsx';
import { formatDateTime } from '../../../lib/format.ts';

const features = tableFeatures({ rowSortingFeature });
const helper = createColumnHelper<typeof features, StudySummary>();

/** The columns the API can sort by (GET /api/studies `sort`). */
type SortKey = ListStudiesQuery['sort'];
const SORTABLE: readonly string[] = ['name', 'updatedAt'] satisfies SortKey[];

export interface StudyRowActions {
  canWrite: boolean;
  onClone: (study: StudySummary) => void;
  onDelete: (study: StudySummary) => void;
  /** Id of the study whose clone is being made, to show progress on its button. */
  cloningId?: string | null;
}

interface StudiesTableProps extends StudyRowActions {
  rows: StudySummary[];
  sort: SortKey;
  dir: ListStudiesQuery['dir'];
  onSortChange: (sort: SortKey, dir: ListStudiesQuery['dir']) => void;
}

function buildColumns(actions: StudyRowActions) {
  return helper.columns([
    helper.accessor('name', {
      header: 'Name',
      enableSorting: true,
      cell: (info) => (
        <Link to={`/studies/${info.row.original.id}`} className="inline-block min-w-48 font-semibold text-accent [overflow-wrap:anywhere] hover:underline">
          {info.getValue()}
        </Link>
      ),
    }),
    helper.accessor('status', { header: 'Status', enableSorting: false, cell: (info) => <StatusBadge status={info.getValue()} /> }),
    helper.accessor('isTemplate', {
      header: 'Template',
      enableSorting: false,
      cell: (info) => (info.getValue() ? <TemplateBadge /> : <span className="text-ink-faint">—<span className="sr-only">not a template</span></span>),
    }),
    // Users count revisions; the edit version stays internal.
    helper.accessor((row) => row.revision ?? null, { id: 'revision', header: 'Revision', enableSorting: false, cell: (info) => <span className="num">{info.getValue() ?? '—'}</span> }),
    helper.accessor((row) => row.updatedBy.name, {
      id: 'updatedBy',
      header: 'Updated by',
      enableSorting: false,
      cell: (info) => <span className="whitespace-nowrap">{info.getValue()}</span>,
    }),
    helper.accessor('updatedAt', {
      header: 'Updated at',
      enableSorting: true,
      cell: (info) => <time dateTime={info.getValue()} className="num text-[13px] whitespace-nowrap">{formatDateTime(info.getValue())}</time>,
    }),
    helper.accessor('elementCount', {
      header: 'Elements',
      enableSorting: false,
      cell: (info) => <span className="num">{info.getValue()}</span>,
    }),
    helper.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      cell: (info) => {
        const study = info.row.original;
        if (!actions.canWrite) return null;
        const busy = actions.cloningId === study.id;
        return (
          <div className="flex justify-end gap-1">
            {study.isTemplate ? (
              <Button size="sm" variant="primary" busy={busy} busyText="Starting…" aria-label={`Start from template ${study.name}`} onClick={() => actions.onClone(study)}>
                Start from template
              </Button>
            ) : (
              <Button size="sm" busy={busy} busyText="Cloning…" aria-label={`Clone ${study.name}`} onClick={() => actions.onClone(study)}>
                Clone
              </Button>
            )}
            <Button size="sm" variant="danger" aria-label={`Delete ${study.name}`} onClick={() => actions.onDelete(study)}>
              Delete
            </Button>
          </div>
        );
      },
    }),
  ]);
}

const NUMERIC = new Set(['revision', 'elementCount']);

/** The studies table: sorting is done by the server (name, updated at), so the table runs in manual mode. */
export function StudiesTable({ rows, sort, dir, onSortChange, canWrite, onClone, onDelete, cloningId }: StudiesTableProps) {
  const columns = useMemo(() => buildColumns({ canWrite, onClone, onDelete, cloningId }), [canWrite, onClone, onDelete, cloningId]);
  const sorting = useMemo<SortingState>(() => [{ id: sort, desc: dir === 'desc' }], [sort, dir]);

  const table = useTable({
    features,
    columns,
    data: rows,
    getRowId: (row) => row.id,
    manualSorting: true,
    enableSortingRemoval: false,
    enableMultiSort: false,
    state: { sorting },
    onSortingChange: (updater: Updater<SortingState>) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      if (first && SORTABLE.includes(first.id)) onSortChange(first.id as SortKey, first.desc ? 'desc' : 'asc');
    },
  });

  return (
    <table className="w-full border-collapse text-sm">
      <thead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id} className="border-b border-rule-strong">
            {group.headers.map((header) => {
              const sorted = header.column.getIsSorted();
              const canSort = header.column.getCanSort();
              return (
                <th
                  key={header.id}
                  scope="col"
                  aria-sort={canSort ? (sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none') : undefined}
                  className={`px-2 py-1.5 text-left text-[12px] font-semibold uppercase tracking-wide whitespace-nowrap text-ink-muted ${NUMERIC.has(header.column.id) ? 'text-right' : ''}`}
                >
                  {header.isPlaceholder ? null : canSort ? (
                    <button
                      type="button"
                      onClick={header.column.getToggleSortingHandler()}
                      className="inline-flex items-center gap-1 rounded-[2px] uppercase hover:text-ink"
                      title={`Sort by ${String(header.column.columnDef.header)}`}
                    >
                      <table.FlexRender header={header} />
                      <span aria-hidden="true" className={sorted ? 'text-ink' : 'text-ink-faint'}>
                        {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                      </span>
                    </button>
                  ) : (
                    <table.FlexRender header={header} />
                  )}
                </th>
              );
            })}
          </tr>
        ))}
      </thead>
      <tbody>
        {table.getRowModel().rows.map((row) => (
          <tr key={row.id} className="border-b border-rule hover:bg-sunken/50">
            {row.getAllCells().map((cell) => (
              <td key={cell.id} className={`px-2 py-1.5 align-middle ${NUMERIC.has(cell.column.id) ? 'text-right' : ''}`}>
                <table.FlexRender cell={cell} />
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
