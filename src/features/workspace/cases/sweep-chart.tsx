/**
 * Sweep charts, one per recorded output: a line (d3-shape, drawn on a canvas) over one parameter,
 * or a heat map over two, with the limit set's bands drawn (warning band amber, beyond the
 * violation limit red) and, on a line, the first point that breaks the limit called out (and named
 * in the caption). A click picks the nearest point (line) or the cell (heat map), so it can be made
 * a case.
 */
import { line } from 'd3-shape';
import { memo, useLayoutEffect, useMemo, useRef, type MouseEvent } from 'react';
import { breaksLimit, type SweepOutput } from '../../../../shared/review/sweep-outputs.ts';
import { columnsOf, LineSeries, type Columns } from './line-series.ts';

const W = 460;
const H = 210;
const M = { l: 56, r: 12, t: 12, b: 40 };
const IW = W - M.l - M.r;
const IH = H - M.t - M.b;

type Scale = ((v: number) => number) & { ticks: number[] };

/** A linear or log scale from a domain to a pixel range, with about five round ticks. */
function scale(d0: number, d1: number, r0: number, r1: number, log = false): Scale {
  if (log && d0 > 0 && d1 > 0) {
    const a = Math.log10(d0);
    const b = Math.log10(d1) === a ? a + 1 : Math.log10(d1);
    const f = ((v: number) => r0 + ((Math.log10(v) - a) / (b - a)) * (r1 - r0)) as Scale;
    f.ticks = [];
    for (let e = Math.ceil(a); e <= Math.floor(b); e++) f.ticks.push(10 ** e);
    if (f.ticks.length < 2) f.ticks = [d0, d1];
    return f;
  }
  if (d0 === d1) [d0, d1] = [d0 - (Math.abs(d0) || 1) * 0.05, d1 + (Math.abs(d1) || 1) * 0.05];
  const f = ((v: number) => r0 + ((v - d0) / (d1 - d0)) * (r1 - r0)) as Scale;
  const span = d1 - d0;
  const step0 = 10 ** Math.floor(Math.log10(span / 5));
  const step = [1, 2, 5, 10].map((m) => m * step0).find((s) => span / s <= 6) ?? step0 * 10;
  f.ticks = [];
  for (let t = Math.ceil(d0 / step) * step; t <= d1 + step * 1e-9; t += step) f.ticks.push(Number(t.toPrecision(12)));
  return f;
}

const tick = (v: number) => (Math.abs(v) >= 1e4 || (Math.abs(v) < 1e-3 && v !== 0) ? v.toExponential(1) : String(Number(v.toPrecision(4))));

/** The chart's x scale for these parameter values (pixels of the drawing). */
export const xScale = (xs: readonly number[], log?: boolean): Scale => {
  let a = Infinity;
  let b = -Infinity;
  for (const v of xs) [a, b] = [Math.min(a, v), Math.max(b, v)];
  return scale(a, b, M.l, M.l + IW, log);
};

/**
 * A line series for one output (see line-series.ts) at this chart's resolution: every point when
 * there are few, else at most about four per pixel column. `ys` is the store's array (NaN: none).
 */
export function lineSeries(xs: readonly number[], ys: ArrayLike<number>, output: Pick<SweepOutput, 'violation'>, log?: boolean, columns: Columns = lineColumns(xs, log)): LineSeries {
  return new LineSeries(xs, ys, { columns, breaks: (v) => breaksLimit(output, v) });
}

/** A line chart's pixel columns over these parameter values (shared by the series of every output of one sweep). */
export function lineColumns(xs: readonly number[], log?: boolean): Columns {
  const x = xScale(xs, log);
  return columnsOf(xs, (v) => Math.round(x(v)), 2 * IW, x);
}

/** The points a line over these values draws (all of them when there are few; per pixel column of `x` the first, lowest, highest and last). */
export function drawn(xs: readonly number[], ys: readonly (number | null)[], x: (v: number) => number): number[] {
  const s = new LineSeries(xs, Float64Array.from(ys, (v) => (v === null ? NaN : v)), { column: (v) => Math.round(x(v)), keepAll: 2 * IW });
  s.add(0, xs.length);
  return s.indices();
}

export interface LineChartProps {
  xLabel: string;
  /** The points as they arrive (drawn again when its version changes). */
  series: LineSeries;
  version: number;
  output: SweepOutput;
  log?: boolean;
  picked?: number | null;
  onPick?: (index: number) => void;
}

/** A limit band: the part of the plot between two values of the output (pixels of the drawing). */
export interface Band {
  y: number;
  height: number;
  fill: string;
}

/** What a line chart draws, in the drawing's pixels (W × H): computed from the series, drawn on a canvas. Pure. */
export interface LineGeometry {
  x: Scale;
  y: Scale;
  /** Limit bands: beyond the violation limits red, between a violation and a warning limit amber. */
  bands: Band[];
  /** The line as runs of points without a gap between them, each point [x, y]. */
  runs: [number, number][][];
  /** The first point (in point order) whose value breaks the limit; -1 when none. */
  first: number;
}

const VIOLATION_FILL = '#f3d3cf';
const WARNING_FILL = '#f6e7c4';

/**
 * The geometry of a line chart: scales (the y range takes in the nearest limits when they are close
 * to the data), limit bands, the line as runs between gaps (points not solved yet, or that failed),
 * and the first limit crossing. O(points drawn): the series keeps at most about four points per
 * pixel column, so this costs the same for 1 000 and 10 000 points.
 */
export function lineGeometry(series: LineSeries, output: Pick<SweepOutput, 'violation' | 'warning'>, log?: boolean): LineGeometry {
  const { xs, ys } = series;
  let lo = series.lo;
  let hi = series.hi;
  if (!(hi >= lo)) [lo, hi] = [0, 1];
  // show the nearest limit lines when they are close to the data
  const span = Math.max(hi - lo, Math.abs(hi) * 0.02, 1e-9);
  for (const b of [...output.violation, ...(output.warning ?? [])]) if (Number.isFinite(b) && b > lo - span && b < hi + span) [lo, hi] = [Math.min(lo, b), Math.max(hi, b)];
  const pad = (hi - lo) * 0.06 || Math.abs(hi) * 0.05 || 1;
  const x = (series.scale as Scale | undefined) ?? xScale(xs, log);
  const y0 = lo - pad;
  const y1 = hi + pad;
  const y = scale(y0, y1, M.t + IH, M.t);
  const bands: Band[] = [];
  const band = (a: number, b: number, fill: string) => {
    const top = Math.max(Math.min(a, b), y0);
    const bot = Math.min(Math.max(a, b), y1);
    if (bot > top) bands.push({ y: y(bot), height: y(top) - y(bot), fill });
  };
  const [vlo, vhi] = output.violation;
  band(-Infinity, vlo, VIOLATION_FILL);
  band(vhi, Infinity, VIOLATION_FILL);
  if (output.warning) {
    band(vlo, output.warning[0], WARNING_FILL);
    band(output.warning[1], vhi, WARNING_FILL);
  }
  const runs: [number, number][][] = [];
  let run: [number, number][] | null = null;
  for (const i of series.indices()) {
    const v = ys[i];
    if (!Number.isFinite(v)) {
      run = null;
      continue;
    }
    if (!run) runs.push((run = []));
    run.push([x(xs[i]), y(v)]);
  }
  return { x, y, bands, runs, first: series.firstBreak };
}

/** The index of the point nearest to a pixel column of the drawing (a click on the chart). */
export function nearestPoint(xs: readonly number[], x: (v: number) => number, px: number): number {
  let best = 0;
  let dist = Infinity;
  for (let i = 0; i < xs.length; i++) {
    const d = Math.abs(x(xs[i]) - px);
    if (d < dist) [best, dist] = [i, d];
  }
  return best;
}

const INK = '#1c2226';
const MUTED = '#5b6369';
const GRID = '#e4e1d8';
const LINE = '#1f5f8b';
const ALARM = '#a3261b';
const FONT = 'system-ui, -apple-system, "Segoe UI", sans-serif';

/** Draws a line chart's geometry on a 2-D canvas context whose units are the drawing's pixels (W × H). */
function paintLineChart(ctx: CanvasRenderingContext2D, g: LineGeometry, series: LineSeries, xLabel: string, output: SweepOutput, picked: number | null | undefined) {
  const { x, y } = g;
  const { xs, ys } = series;
  ctx.clearRect(0, 0, W, H);
  for (const b of g.bands) {
    ctx.fillStyle = b.fill;
    ctx.fillRect(M.l, b.y, IW, b.height);
  }
  ctx.strokeStyle = GRID;
  ctx.lineWidth = 1;
  ctx.beginPath();
  for (const t of x.ticks) {
    ctx.moveTo(Math.round(x(t)) + 0.5, M.t);
    ctx.lineTo(Math.round(x(t)) + 0.5, M.t + IH);
  }
  for (const t of y.ticks) {
    ctx.moveTo(M.l, Math.round(y(t)) + 0.5);
    ctx.lineTo(M.l + IW, Math.round(y(t)) + 0.5);
  }
  ctx.stroke();
  ctx.font = `10px ${FONT}`;
  ctx.fillStyle = MUTED;
  ctx.textAlign = 'center';
  for (const t of x.ticks) ctx.fillText(tick(t), x(t), M.t + IH + 14);
  ctx.textAlign = 'right';
  for (const t of y.ticks) ctx.fillText(tick(t), M.l - 4, y(t) + 3);
  ctx.strokeStyle = LINE;
  ctx.lineWidth = 1.6;
  ctx.beginPath();
  const path = line().context(ctx);
  for (const r of g.runs) path(r);
  ctx.stroke();
  if (g.first >= 0) {
    ctx.strokeStyle = ALARM;
    ctx.lineWidth = 2;
    ctx.beginPath();
    ctx.arc(x(xs[g.first]), y(ys[g.first]), 4, 0, 2 * Math.PI);
    ctx.stroke();
    ctx.fillStyle = ALARM;
    ctx.textAlign = 'left';
    ctx.fillText(`limit first broken at ${tick(xs[g.first])}`, Math.min(x(xs[g.first]) + 6, M.l + IW - 120), M.t + 12);
  }
  if (picked !== null && picked !== undefined && Number.isFinite(ys[picked])) {
    ctx.fillStyle = LINE;
    ctx.beginPath();
    ctx.arc(x(xs[picked]), y(ys[picked]), 4, 0, 2 * Math.PI);
    ctx.fill();
  }
  ctx.font = `11px ${FONT}`;
  ctx.fillStyle = INK;
  ctx.textAlign = 'center';
  ctx.fillText(xLabel, M.l + IW / 2, H - 6);
  ctx.save();
  ctx.translate(12, M.t + IH / 2);
  ctx.rotate(-Math.PI / 2);
  ctx.fillText(`${output.label} (${output.unit})`, 0, 0);
  ctx.restore();
}

/**
 * A line chart drawn on a canvas: a redraw while points arrive is a few hundred canvas calls on the
 * page's thread (no elements rebuilt, laid out or painted again), so it stays a small part of a
 * frame however many points the sweep has. Its words stay in the page: the chart's name (output and
 * parameter) and the first limit crossing in its caption.
 */
export const SweepLineChart = memo(function SweepLineChart({ xLabel, series, version, output, log, picked, onPick }: LineChartProps) {
  const canvas = useRef<HTMLCanvasElement>(null);
  // eslint-disable-next-line react-hooks/exhaustive-deps -- version stands for the points added to the series in place
  const g = useMemo(() => lineGeometry(series, output, log), [series, version, output, log]);
  useLayoutEffect(() => {
    const el = canvas.current;
    if (!el) return;
    let ctx: CanvasRenderingContext2D | null = null;
    try {
      ctx = el.getContext('2d');
    } catch {
      ctx = null;
    }
    if (!ctx) return; // no 2-D canvas (component tests): the geometry is tested on its own
    const dpr = Math.min(3, Math.max(1, typeof window !== 'undefined' ? window.devicePixelRatio || 1 : 1));
    if (el.width !== Math.round(W * dpr)) [el.width, el.height] = [Math.round(W * dpr), Math.round(H * dpr)];
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    paintLineChart(ctx, g, series, xLabel, output, picked);
  }, [g, series, xLabel, output, picked]);
  const pick = (e: MouseEvent<HTMLCanvasElement>) => {
    const box = e.currentTarget.getBoundingClientRect();
    onPick?.(nearestPoint(series.xs, g.x, ((e.clientX - box.left) / box.width) * W));
  };
  const first = g.first;
  return (
    <figure className="m-0">
      <canvas
        ref={canvas}
        role="img"
        aria-label={`${output.label} (${output.unit}) against ${xLabel}`}
        width={W}
        height={H}
        className="block w-full max-w-[460px] cursor-crosshair bg-paper"
        style={{ aspectRatio: `${W} / ${H}` }}
        onClick={pick}
      />
      {first >= 0 ? (
        <figcaption className="text-[11px] text-danger">
          <span>limit first broken at {tick(series.xs[first])}</span>
        </figcaption>
      ) : null}
    </figure>
  );
});

export interface HeatMapProps {
  xLabel: string;
  yLabel: string;
  /** Values of the first (slowest) parameter: rows; of the second: columns. */
  xs: number[];
  ys: number[];
  /** Point k = i·ys.length + j (null, undefined or NaN: no value). */
  values: ArrayLike<number | null | undefined>;
  /** Drawn again when this changes (the values are filled in place while a sweep runs). */
  version?: number;
  output: SweepOutput;
  picked?: number | null;
  onPick?: (index: number) => void;
}

const MISSING = '#e4e1d8';
const MISSING_RGB: [number, number, number] = [0xe4, 0xe1, 0xd8];

/** Hue, saturation and lightness of a value: blue shades within the limits, red beyond them (null when missing). */
function shade(v: number | null | undefined, lo: number, hi: number, out: boolean): [number, number, number] | null {
  if (v === null || v === undefined || Number.isNaN(v)) return null;
  const t = hi > lo ? (v - lo) / (hi - lo) : 0.5;
  const l = Math.round(88 - t * 48);
  return out ? [6, 70, l] : [205, 55, l];
}

/** Colour of a value as CSS: blue shades within the limits, red beyond them, grey when missing. */
function colour(v: number | null | undefined, lo: number, hi: number, out: boolean): string {
  const c = shade(v, lo, hi, out);
  return c ? `hsl(${c[0]} ${c[1]}% ${c[2]}%)` : MISSING;
}

/** HSL (degrees, %, %) to 0–255 RGB (CSS Color 4's conversion). */
export function hslToRgb(h: number, s: number, l: number): [number, number, number] {
  const sat = s / 100;
  const lig = l / 100;
  const f = (n: number) => {
    const k = (n + h / 30) % 12;
    return Math.round(255 * (lig - sat * Math.min(lig, 1 - lig) * Math.max(-1, Math.min(k - 3, 9 - k, 1))));
  };
  return [f(0), f(8), f(4)];
}

/**
 * A heat map's cells as RGBA pixels, one per point: ys.length wide, xs.length high, the first
 * parameter's last value on the top row (as the drawing), the same colours as the cells drawn one
 * by one. Pure.
 */
export function heatPixels(rows: number, cols: number, values: ArrayLike<number | null | undefined>, lo: number, hi: number, breaks: (v: number) => boolean): Uint8ClampedArray {
  const px = new Uint8ClampedArray(rows * cols * 4);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < cols; j++) {
      const v = values[i * cols + j];
      const c = shade(v, lo, hi, typeof v === 'number' && !Number.isNaN(v) && breaks(v));
      const [r, g, b] = c ? hslToRgb(...c) : MISSING_RGB;
      const at = ((rows - 1 - i) * cols + j) * 4;
      px[at] = r;
      px[at + 1] = g;
      px[at + 2] = b;
      px[at + 3] = 255;
    }
  }
  return px;
}

/** The point under a click on a heat map's image, from where it fell across (0 left … 1 right) and down (0 top … 1 bottom). */
export function heatCellAt(across: number, down: number, rows: number, cols: number): number {
  const j = Math.min(cols - 1, Math.max(0, Math.floor(across * cols)));
  const i = rows - 1 - Math.min(rows - 1, Math.max(0, Math.floor(down * rows)));
  return i * cols + j;
}

/** Up to this many cells a heat map draws each cell as an element (it can be clicked and read); beyond, one image redrawn as a whole. */
export const HEAT_MAP_CELLS_MAX = 2500;

/** The cells as a PNG data URL (null where the browser has no 2-D canvas). */
function heatImage(rows: number, cols: number, px: Uint8ClampedArray): string | null {
  if (typeof document === 'undefined') return null;
  const canvas = document.createElement('canvas');
  canvas.width = cols;
  canvas.height = rows;
  let ctx: CanvasRenderingContext2D | null = null;
  try {
    ctx = canvas.getContext('2d');
  } catch {
    ctx = null;
  }
  if (!ctx) return null;
  const img = ctx.createImageData(cols, rows);
  img.data.set(px);
  ctx.putImageData(img, 0, 0);
  return canvas.toDataURL('image/png');
}

export const SweepHeatMap = memo(function SweepHeatMap({ xLabel, yLabel, xs, ys, values, output, picked, onPick }: HeatMapProps) {
  let lo = Infinity;
  let hi = -Infinity;
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (typeof v === 'number' && !Number.isNaN(v)) [lo, hi] = [Math.min(lo, v), Math.max(hi, v)];
  }
  if (!(hi >= lo)) [lo, hi] = [0, 1];
  const cw = IW / ys.length;
  const ch = IH / xs.length;
  const everyX = Math.max(1, Math.ceil(xs.length / 6));
  const everyY = Math.max(1, Math.ceil(ys.length / 6));
  // a large map is one image (thousands of cell elements would be rebuilt, laid out and painted at every redraw)
  const image = xs.length * ys.length > HEAT_MAP_CELLS_MAX ? heatImage(xs.length, ys.length, heatPixels(xs.length, ys.length, values, lo, hi, (v) => breaksLimit(output, v))) : null;
  const pickAt = (e: MouseEvent<SVGImageElement>) => {
    const box = e.currentTarget.getBoundingClientRect();
    onPick?.(heatCellAt((e.clientX - box.left) / box.width, (e.clientY - box.top) / box.height, xs.length, ys.length));
  };
  const pk = picked ?? -1;
  return (
    <figure className="m-0">
      <svg role="img" aria-label={`Heat map of ${output.label} (${output.unit}) over ${xLabel} and ${yLabel}`} viewBox={`0 0 ${W} ${H}`} className="w-full max-w-[460px] bg-paper">
        {image ? (
          <>
            <image href={image} x={M.l} y={M.t} width={IW} height={IH} preserveAspectRatio="none" style={{ imageRendering: 'pixelated' }} onClick={pickAt} />
            {pk >= 0 && pk < xs.length * ys.length ? (
              <rect x={M.l + (pk % ys.length) * cw} y={M.t + (xs.length - 1 - Math.floor(pk / ys.length)) * ch} width={cw} height={ch} fill="none" stroke="#1c2226" pointerEvents="none" />
            ) : null}
          </>
        ) : null}
        {image ? null : xs.map((_, i) =>
          ys.map((__, j) => {
            const k = i * ys.length + j;
            const v = values[k] ?? null;
            return (
              <rect
                key={k}
                x={M.l + j * cw}
                y={M.t + (xs.length - 1 - i) * ch}
                width={cw + 0.5}
                height={ch + 0.5}
                fill={colour(v, lo, hi, !Number.isNaN(v) && breaksLimit(output, v))}
                stroke={picked === k ? '#1c2226' : 'none'}
                onClick={() => onPick?.(k)}
              />
            );
          }),
        )}
        {ys.map((v, j) =>
          j % everyY === 0 ? (
            <text key={`c${j}`} x={M.l + (j + 0.5) * cw} y={M.t + IH + 14} textAnchor="middle" fontSize={10} fill="#5b6369">
              {tick(v)}
            </text>
          ) : null,
        )}
        {xs.map((v, i) =>
          i % everyX === 0 ? (
            <text key={`r${i}`} x={M.l - 4} y={M.t + (xs.length - 1 - i + 0.5) * ch + 3} textAnchor="end" fontSize={10} fill="#5b6369">
              {tick(v)}
            </text>
          ) : null,
        )}
        <text x={M.l + IW / 2} y={H - 6} textAnchor="middle" fontSize={11} fill="#1c2226">
          {yLabel}
        </text>
        <text transform={`translate(12 ${M.t + IH / 2}) rotate(-90)`} textAnchor="middle" fontSize={11} fill="#1c2226">
          {xLabel}
        </text>
      </svg>
      <figcaption className="text-[11px] text-ink-muted">
        {output.label} ({output.unit}): {tick(lo)} (light) to {tick(hi)} (dark); red cells break the limit.
      </figcaption>
    </figure>
  );
});
