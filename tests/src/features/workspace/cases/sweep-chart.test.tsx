/** Sweep charts: the line keeps every peak at the chart's resolution; a chart names its output and parameter; the first limit crossing is called out. */
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { drawn, heatCellAt, heatPixels, hslToRgb, lineSeries, SweepHeatMap, SweepLineChart } from '../../../../../src/features/workspace/cases/sweep-chart.tsx';
import type { SweepOutput } from '../../../../../shared/review/sweep-outputs.ts';

const output: SweepOutput = { key: 'load:K:an', spec: { kind: 'load', load: 'K', branch: 'an' }, label: 'K terminal voltage', unit: 'pu', violation: [0.9, 1.05], warning: [0.95, 1.042] };

describe('sweep charts', () => {
  it('a 10 000-point line is drawn with at most four points per pixel column, keeping the highest and lowest', () => {
    const xs = Array.from({ length: 10_000 }, (_, i) => i);
    const ys = xs.map((i) => Math.sin(i / 50) + (i === 7777 ? 5 : 0) - (i === 1234 ? 5 : 0));
    const keep = drawn(xs, ys, (v) => (v / 9999) * 392);
    expect(keep.length).toBeLessThanOrEqual(4 * 393);
    expect(keep).toContain(7777);
    expect(keep).toContain(1234);
    expect(keep).toEqual([...keep].sort((a, b) => a - b));
    expect(drawn(xs.slice(0, 50), ys.slice(0, 50), (v) => v)).toHaveLength(50);
  });

  it('names the output and the parameter, and calls out the first point that breaks the limit', () => {
    const xs = [1, 2, 3, 4];
    const series = lineSeries(xs, Float64Array.from([1.0, 1.02, 1.07, 1.1]), output);
    series.add(0, 4);
    render(<SweepLineChart xLabel="K every phase › P (kW)" series={series} version={series.version} output={output} />);
    expect(screen.getByRole('img', { name: 'K terminal voltage (pu) against K every phase › P (kW)' })).toBeTruthy();
    expect(screen.getByText('limit first broken at 3')).toBeTruthy();
    render(<SweepHeatMap xLabel="A" yLabel="B" xs={[1, 2]} ys={[3, 4]} values={[1, 1.01, 1.06, null]} output={output} />);
    expect(screen.getByRole('img', { name: 'Heat map of K terminal voltage (pu) over A and B' }).querySelectorAll('rect')).toHaveLength(4);
  });

  it('draws the points as they arrive: a gap where points are missing, one line once they are all in', () => {
    const xs = Array.from({ length: 3000 }, (_, i) => i);
    const ys = new Float64Array(3000).fill(NaN);
    const series = lineSeries(xs, ys, output);
    const fill = (a: number, b: number) => {
      for (let i = a; i < b; i++) ys[i] = 1 + 0.01 * Math.sin(i / 100);
      series.add(a, b - a);
    };
    fill(0, 1000);
    fill(2000, 3000);
    const { container, rerender } = render(<SweepLineChart xLabel="x" series={series} version={series.version} output={output} />);
    const d = () => container.querySelector('path')!.getAttribute('d')!;
    expect(d().match(/M/g)).toHaveLength(2);
    fill(1000, 2000);
    rerender(<SweepLineChart xLabel="x" series={series} version={series.version} output={output} />);
    expect(d().match(/M/g)).toHaveLength(1);
    // at most about four points per pixel column of the 392-pixel plot
    expect(d().split('L').length).toBeLessThanOrEqual(4 * 393);
  });

  it('a large heat map is one image whose pixels are the colours the cells are drawn in', () => {
    // (P) CSS colours: red, blue, yellow, 50 % grey and the named "green" #008000
    expect(hslToRgb(0, 100, 50)).toEqual([255, 0, 0]);
    expect(hslToRgb(240, 100, 50)).toEqual([0, 0, 255]);
    expect(hslToRgb(60, 100, 50)).toEqual([255, 255, 0]);
    expect(hslToRgb(0, 0, 50)).toEqual([128, 128, 128]);
    expect(hslToRgb(120, 100, 25)).toEqual([0, 128, 0]);
    const xs = [1, 2, 3];
    const ys = [10, 20, 30, 40];
    const values = [1.0, 1.01, NaN, 1.06, 0.97, null, 1.02, 1.03, 0.85, 1.0, 1.04, 1.05];
    const { container } = render(<SweepHeatMap xLabel="A" yLabel="B" xs={xs} ys={ys} values={values} output={output} />);
    const rects = [...container.querySelectorAll('rect')];
    expect(rects).toHaveLength(12);
    const px = heatPixels(3, 4, values, 0.85, 1.06, (v) => v < 0.9 || v > 1.05);
    rects.forEach((r, k) => {
      const [i, j] = [Math.floor(k / 4), k % 4];
      const at = ((2 - i) * 4 + j) * 4; // the first parameter's last value on the top row
      const fill = r.getAttribute('fill')!;
      const m = /^hsl\((\d+) (\d+)% (\d+)%\)$/.exec(fill);
      const rgb = m ? hslToRgb(Number(m[1]), Number(m[2]), Number(m[3])) : [0xe4, 0xe1, 0xd8];
      expect(fill.startsWith('hsl(6 ')).toBe(k === 3 || k === 8); // red: beyond the limit
      expect([...px.slice(at, at + 3)]).toEqual(rgb);
      expect(px[at + 3]).toBe(255);
    });
  });

  it('a click on a heat map image picks the point of the cell under it (the first parameter’s last value on top)', () => {
    // 3 values of the first parameter (rows), 4 of the second (columns): point k = i·4 + j
    expect(heatCellAt(0.01, 0.01, 3, 4)).toBe(2 * 4 + 0); // top left: last row value, first column
    expect(heatCellAt(0.99, 0.99, 3, 4)).toBe(0 * 4 + 3); // bottom right
    expect(heatCellAt(0.5, 0.5, 3, 4)).toBe(1 * 4 + 2);
    expect(heatCellAt(1, 1, 3, 4)).toBe(3); // the far edges stay in the map
    // the same cell the drawn pixels put there
    const px = heatPixels(3, 4, Array.from({ length: 12 }, (_, k) => k), 0, 11, () => false);
    const k = heatCellAt(0.3, 0.1, 3, 4);
    const [r, c] = [0, 1]; // top row, second column of the image
    expect([...px.slice((r * 4 + c) * 4, (r * 4 + c) * 4 + 3)]).toEqual([...heatPixels(1, 1, [k], 0, 11, () => false).slice(0, 3)]);
  });
});
