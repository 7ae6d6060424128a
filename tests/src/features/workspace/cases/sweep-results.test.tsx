/**
 * The sweep results box while points arrive: the progress row and each line chart are relayout
 * boundaries (size and layout containment, and block children: a flex or grid item never is one),
 * so a redraw lays out and repaints only them, not the results tables above; the progress and the
 * lines follow the points handed over.
 */
import { act, render, screen } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { SweepOutput } from '../../../../../shared/review/sweep-outputs.ts';
import { lineGeometry } from '../../../../../src/features/workspace/cases/sweep-chart.tsx';
import { drawArrived, runData, STATUS_TEXT_MS, SweepResults, type Run } from '../../../../../src/features/workspace/cases/sweep-results.tsx';

const output: SweepOutput = { key: 'load:K:an', spec: { kind: 'load', load: 'K', branch: 'an' }, label: 'K terminal voltage', unit: 'pu', violation: [0.9, 1.05] };

function run(n: number): Run {
  const axes = [Array.from({ length: n }, (_, i) => i)];
  const points = axes[0].map((v) => [v]);
  return { paramLabels: ['K every phase › P (kW)'], parameters: [{ elementId: 'K', path: 'each.kw' }], axes, log: [false], points, outputs: [output], ...runData(points, axes, [false], [output]), status: 'running', started: 0 };
}

const isFlexOrGrid = (el: Element | null) => !!el && /(^|\s)(flex|grid|inline-flex|inline-grid)(\s|$)/.test(el.className);

describe('sweep results while a sweep runs', () => {
  it('the progress row and the chart boxes are strict-contained block children; a redraw shows the points handed over', () => {
    const r = run(10);
    render(<SweepResults run={r} picked={null} onPick={() => {}} onMakeCase={null} />);
    const row = screen.getByRole('progressbar', { name: 'Sweep progress' }).parentElement!;
    expect(row.style.contain).toBe('strict');
    expect(isFlexOrGrid(row.parentElement)).toBe(false);
    const chart = screen.getByRole('img', { name: /^K terminal voltage \(pu\) against/ });
    const box = chart.closest('figure')!.parentElement!;
    expect(box.style.contain).toBe('strict');
    expect(isFlexOrGrid(box.parentElement)).toBe(false);

    const bar = screen.getByRole('progressbar', { name: 'Sweep progress' });
    const fill = bar.firstElementChild as HTMLElement;
    expect([bar.getAttribute('aria-valuemax'), bar.getAttribute('aria-valuenow')]).toEqual(['10', '0']);
    // the bar follows every redraw (a transform of its own layer); the count in words at most every STATUS_TEXT_MS
    let clock = performance.now() + STATUS_TEXT_MS;
    const now = vi.spyOn(performance, 'now').mockImplementation(() => clock);
    try {
      r.store.put(0, { count: 2, values: Float64Array.from([1, 1.01]), errors: [] });
      act(() => drawArrived(r, [[0, 2]]));
      expect(bar.getAttribute('aria-valuenow')).toBe('2');
      expect(fill.style.transform).toBe('scaleX(0.2)');
      expect(fill.style.willChange).toBe('transform');
      expect(screen.getByRole('status').textContent).toBe('Solving: 2 of 10 points');
      clock += STATUS_TEXT_MS / 2;
      r.store.put(2, { count: 2, values: Float64Array.from([1.02, 1.03]), errors: [] });
      act(() => drawArrived(r, [[2, 2]]));
      expect(bar.getAttribute('aria-valuenow')).toBe('4');
      expect(fill.style.transform).toBe('scaleX(0.4)');
      expect(screen.getByRole('status').textContent).toBe('Solving: 2 of 10 points');
      clock += STATUS_TEXT_MS / 2;
      act(() => drawArrived(r, []));
      expect(screen.getByRole('status').textContent).toBe('Solving: 4 of 10 points');
    } finally {
      now.mockRestore();
    }
    // the line (drawn on the chart's canvas) runs through the four points handed over
    expect(chart.tagName).toBe('CANVAS');
    const g = lineGeometry(r.lines![0], output);
    expect(g.runs).toHaveLength(1);
    expect(g.runs[0].map(([, y]) => y)).toEqual([1, 1.01, 1.02, 1.03].map((v) => g.y(v)));
  });
});
