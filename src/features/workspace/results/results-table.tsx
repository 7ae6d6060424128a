/**
 * A dense, sortable results table (@tanstack/react-table v9, client-side sorting) with units in
 * the headers and a copy-to-clipboard button that writes the rows, in their shown order, as
 * tab-separated text (magnitude and angle in separate spreadsheet columns).
 */
import { createColumnHelper, createSortedRowModel, rowSortingFeature, tableFeatures, useTable, type SortingState } from '@tanstack/react-table';
import { useMemo, useState, type ReactNode } from 'react';
import { csvText } from '../../../../shared/report/csv.ts';
import { copyText, downloadText, toTsv } from './tsv.ts';

const features = tableFeatures({ rowSortingFeature, sortedRowModel: createSortedRowModel() });

/** One column: what it shows, how it sorts, what it copies. */
export interface ResultColumn<Row> {
  id: string;
  /** Header with its unit, e.g. "L1–N (V∠°)". */
  header: string;
  numeric?: boolean;
  /** Sort key (undefined sorts last). */
  sortValue: (row: Row) => number | string | undefined;
  render: (row: Row) => ReactNode;
  /** Spreadsheet header cells for this column and the matching cells of a row. */
  tsvHeader: string[];
  tsv: (row: Row) => string[];
}

const collator = new Intl.Collator('en', { numeric: true, sensitivity: 'base' });
function compare(a: unknown, b: unknown): number {
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  return collator.compare(String(a), String(b));
}

interface ResultsTableProps<Row extends object> {
  /** Accessible name of the table (also its caption). */
  label: string;
  rows: Row[];
  columns: ResultColumn<Row>[];
  rowId: (row: Row) => string;
  /** Highlighted row (the canvas selection). */
  selectedId?: string | null;
  onRowSelect?: (id: string) => void;
}

export function ResultsTable<Row extends object>({ label, rows, columns, rowId, selectedId, onRowSelect }: ResultsTableProps<Row>) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [copyState, setCopyState] = useState<string>('');
  const tableColumns = useMemo(() => {
    const helper = createColumnHelper<typeof features, Row>();
    return helper.columns(
      columns.map((c) =>
        helper.accessor((row: Row) => c.sortValue(row), {
          id: c.id,
          header: c.header,
          sortUndefined: 'last',
          sortFn: (a, b, id) => compare(a.getValue(id), b.getValue(id)),
        }),
      ),
    );
  }, [columns]);
  const byId = useMemo(() => new Map(columns.map((c) => [c.id, c])), [columns]);

  const table = useTable({
    features,
    columns: tableColumns,
    data: rows,
    getRowId: (row: Row) => rowId(row),
    state: { sorting },
    onSortingChange: (u) => setSorting((s) => (typeof u === 'function' ? u(s) : u)),
    enableMultiSort: false,
  });

  const shownRows = table.getRowModel().rows;
  const onCopy = async () => {
    const header = columns.flatMap((c) => c.tsvHeader);
    const body = shownRows.map((r) => columns.flatMap((c) => c.tsv(r.original)));
    const ok = await copyText(toTsv(header, body));
    setCopyState(ok ? `Copied ${body.length} ${body.length === 1 ? 'row' : 'rows'} as tab-separated text.` : 'The browser refused the clipboard; select the table and copy it instead.');
  };

  const onDownload = () => {
    const header = columns.flatMap((c) => c.tsvHeader);
    const body = shownRows.map((r) => columns.flatMap((c) => c.tsv(r.original)));
    const name = `${label.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '')}.csv`;
    const ok = downloadText(csvText(header, body), name);
    setCopyState(ok ? `Saved ${body.length} ${body.length === 1 ? 'row' : 'rows'} as ${name} (the caution on its first line).` : 'The browser could not save the file.');
  };

  return (
    <div className="min-w-0">
      <div className="mb-1 flex items-center justify-between gap-2">
        <h3 className="text-[12px] font-semibold uppercase tracking-wide text-ink-muted">{label}</h3>
        <div className="flex items-center gap-2">
          <span role="status" className="text-[11px] text-ink-muted">
            {copyState}
          </span>
          <button type="button" onClick={onCopy} aria-label={`Copy ${label} as tab-separated text`} className="h-6 rounded-[3px] border border-rule-strong bg-panel px-2 text-[12px] font-semibold hover:bg-sunken">
            Copy TSV
          </button>
          <button type="button" onClick={onDownload} aria-label={`Download ${label} as CSV`} className="h-6 rounded-[3px] border border-rule-strong bg-panel px-2 text-[12px] font-semibold hover:bg-sunken">
            CSV
          </button>
        </div>
      </div>
      <div className="overflow-x-auto">
        <table aria-label={label} className="w-full border-collapse text-[12px]">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id} className="border-b border-rule-strong">
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const numeric = byId.get(header.column.id)?.numeric;
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}
                      className={`px-1.5 py-1 font-semibold whitespace-nowrap text-ink-muted ${numeric ? 'text-right' : 'text-left'}`}
                    >
                      <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-ink" title={`Sort by ${String(header.column.columnDef.header)}`}>
                        <table.FlexRender header={header} />
                        <span aria-hidden="true" className={sorted ? 'text-ink' : 'text-ink-faint'}>
                          {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                        </span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {shownRows.map((row) => {
              const selected = selectedId != null && row.id === selectedId;
              return (
                <tr
                  key={row.id}
                  aria-selected={selected || undefined}
                  onClick={onRowSelect ? () => onRowSelect(row.id) : undefined}
                  className={`border-b border-rule ${selected ? 'bg-accent-soft' : 'hover:bg-sunken/50'} ${onRowSelect ? 'cursor-pointer' : ''}`}
                >
                  {/* Cells call their column's render directly: rendered through the column definition, each new
                      result (new definitions) would be a new component type, and React would remount every cell. */}
                  {columns.map((c) => (
                    <td key={c.id} className={`px-1.5 py-0.5 align-top whitespace-nowrap ${c.numeric ? 'num text-right' : ''}`}>
                      {c.render(row.original)}
                    </td>
                  ))}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}
