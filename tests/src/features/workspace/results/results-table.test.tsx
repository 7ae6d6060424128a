/**
 * A new result gives the tables new column definitions; the cells must be updated in place, not
 * unmounted and mounted again (which made a 300-element study's tables rebuild every DOM node per solve).
 */
import { render } from '@testing-library/react';
import { useEffect } from 'react';
import { describe, expect, it } from 'vitest';
import { ResultsTable, type ResultColumn } from '../../../../../src/features/workspace/results/results-table.tsx';

interface Row {
  id: string;
  v: number;
}

describe('ResultsTable', () => {
  it('keeps its cells mounted when a new result brings new columns and rows, and shows the new values', () => {
    let mounts = 0;
    function Cell({ v }: { v: number }) {
      useEffect(() => {
        mounts++;
      }, []);
      return <span>{v.toFixed(1)}</span>;
    }
    const columns = (): ResultColumn<Row>[] => [
      { id: 'id', header: 'Bus', sortValue: (r) => r.id, render: (r) => r.id, tsvHeader: ['Bus'], tsv: (r) => [r.id] },
      { id: 'v', header: 'V', numeric: true, sortValue: (r) => r.v, render: (r) => <Cell v={r.v} />, tsvHeader: ['V'], tsv: (r) => [String(r.v)] },
    ];
    const rows = (k: number): Row[] => [
      { id: 'A', v: 230 * k },
      { id: 'B', v: 231 * k },
    ];
    const view = render(<ResultsTable label="Bus voltages" rows={rows(1)} columns={columns()} rowId={(r) => r.id} />);
    expect(mounts).toBe(2);
    view.rerender(<ResultsTable label="Bus voltages" rows={rows(2)} columns={columns()} rowId={(r) => r.id} />);
    expect(mounts).toBe(2);
    expect(view.getByRole('table').textContent).toContain('462.0');
    expect(view.getByRole('table').textContent).toContain('A');
  });
});
