/** Sweep charts: the line keeps every peak at the chart's resolution; a chart names its output and parameter; the first limit crossing is called out. */
import { render, screen } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { drawn, heatCellAt, heatPixels, hslToRgb, lineGeometry, lineSeries, nearestPoint, SweepHeatMap, SweepLineChart } from '../../../../../src/features/workspace/cases/sweep-chart.tsx';
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
    const { rerender } = render(<SweepLineChart xLabel="x" series={series} version={series.version} output={output} />);
    const before = lineGeometry(series, output);
    expect(before.runs).toHaveLength(2);
    // each run lies in the plot, left to right, and ends where the points do
    const [x0, x1] = [before.x(0), before.x(2999)];
    expect(before.runs[0][0][0]).toBeCloseTo(x0, 9);
    expect(before.runs[1][before.runs[1].length - 1][0]).toBeCloseTo(x1, 9);
    expect(before.runs[0][before.runs[0].length - 1][0]).toBeLessThan(before.x(1000));
    expect(before.runs[1][0][0]).toBeGreaterThan(before.x(1999));
    fill(1000, 2000);
    rerender(<SweepLineChart xLabel="x" series={series} version={series.version} output={output} />);
    const after = lineGeometry(series, output);
    expect(after.runs).toHaveLength(1);
    // at most about four points per pixel column of the 392-pixel plot
    expect(after.runs[0].length).toBeLessThanOrEqual(4 * 393);
    for (let k = 1; k < after.runs[0].length; k++) expect(after.runs[0][k][0]).toBeGreaterThanOrEqual(after.runs[0][k - 1][0]);
    // the chart is one canvas named by its output and parameter (drawn where a 2-D canvas exists)
    expect(screen.getByRole('img', { name: 'K terminal voltage (pu) against x' }).tagName).toBe('CANVAS');
  });

  it('bands: red beyond the violation limits, amber between them and the warning limits, inside the plot; the y range takes in a limit close to the data', () => {
    const xs = [1, 2, 3, 4];
    const series = lineSeries(xs, Float64Array.from([0.97, 0.99, 1.01, 1.03]), output);
    series.add(0, 4);
    const g = lineGeometry(series, output);
    // 0.95 (warning) and 1.042 / 1.05 are near the data: all inside the y range
    for (const v of [0.95, 1.042, 1.05]) expect(g.y(v)).toBeGreaterThanOrEqual(12 - 1e-9), expect(g.y(v)).toBeLessThanOrEqual(12 + 158 + 1e-9);
    const fills = g.bands.map((b) => b.fill);
    expect(fills.filter((f) => f === '#f3d3cf').length).toBeGreaterThanOrEqual(1); // above 1.05
    expect(fills.filter((f) => f === '#f6e7c4')).toHaveLength(2); // 0.9–0.95 (part in range) and 1.042–1.05
    for (const b of g.bands) {
      expect(b.height).toBeGreaterThan(0);
      expect(b.y).toBeGreaterThanOrEqual(12 - 1e-9);
      expect(b.y + b.height).toBeLessThanOrEqual(12 + 158 + 1e-9);
    }
    // the amber band above: from the warning limit up to the violation limit
    const upper = g.bands.find((b) => b.fill === '#f6e7c4' && Math.abs(b.y - g.y(1.05)) < 1e-9)!;
    expect(upper.height).toBeCloseTo(g.y(1.042) - g.y(1.05), 9);
    expect(g.first).toBe(-1);
    // a click picks the point whose column is nearest
    expect(nearestPoint(xs, g.x, g.x(2.4))).toBe(1);
    expect(nearestPoint(xs, g.x, 10_000)).toBe(3);
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
