/**
 * Sweep charts, one per recorded output: a line (d3-shape) over one parameter, or a heat map over
 * two, with the limit set's bands drawn (warning band amber, beyond the violation limit red) and,
 * on a line, the first point that breaks the limit called out. A click picks the nearest point
 * (line) or the cell (heat map), so it can be made a case.
 */
import { line } from 'd3-shape';
import { memo, useMemo, type MouseEvent } from 'react';
import { breaksLimit, type SweepOutput } from '../../../../shared/review/sweep-outputs.ts';
import { LineSeries } from './line-series.ts';

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
export function lineSeries(xs: readonly number[], ys: ArrayLike<number>, output: Pick<SweepOutput, 'violation'>, log?: boolean): LineSeries {
  const x = xScale(xs, log);
  return new LineSeries(xs, ys, { column: (v) => Math.round(x(v)), keepAll: 2 * IW, breaks: (v) => breaksLimit(output, v) });
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

export const SweepLineChart = memo(function SweepLineChart({ xLabel, series, version, output, log, picked, onPick }: LineChartProps) {
  const { xs, ys } = series;
  const g = useMemo(() => {
    let lo = series.lo;
    let hi = series.hi;
    if (!(hi >= lo)) [lo, hi] = [0, 1];
    // show the nearest limit lines when they are close to the data
    const span = Math.max(hi - lo, Math.abs(hi) * 0.02, 1e-9);
    for (const b of [...output.violation, ...(output.warning ?? [])]) if (Number.isFinite(b) && b > lo - span && b < hi + span) [lo, hi] = [Math.min(lo, b), Math.max(hi, b)];
    const pad = (hi - lo) * 0.06 || Math.abs(hi) * 0.05 || 1;
    const x = xScale(xs, log);
    const y = scale(lo - pad, hi + pad, M.t + IH, M.t);
    const path = line<number>()
      .defined((i) => Number.isFinite(ys[i]))
      .x((i) => x(xs[i]))
      .y((i) => y(ys[i]))(series.indices());
    return { x, y, path, first: series.firstBreak, y0: lo - pad, y1: hi + pad };
    // eslint-disable-next-line react-hooks/exhaustive-deps -- version stands for the points added to the series in place
  }, [series, version, output, log]);
  const { x, y } = g;
  const band = (a: number, b: number, fill: string, key: string) => {
    const top = Math.max(Math.min(a, b), g.y0);
    const bot = Math.min(Math.max(a, b), g.y1);
    if (!(bot > top)) return null;
    return <rect key={key} x={M.l} width={IW} y={y(bot)} height={y(top) - y(bot)} fill={fill} />;
  };
  const [vlo, vhi] = output.violation;
  const w = output.warning;
  const pick = (clientX: number, svg: SVGSVGElement) => {
    const box = svg.getBoundingClientRect();
    const px = ((clientX - box.left) / box.width) * W;
    let best = 0;
    xs.forEach((v, i) => (Math.abs(x(v) - px) < Math.abs(x(xs[best]) - px) ? (best = i) : null));
    onPick?.(best);
  };
  return (
    <figure className="m-0">
      <svg
        role="img"
        aria-label={`${output.label} (${output.unit}) against ${xLabel}`}
        viewBox={`0 0 ${W} ${H}`}
        className="w-full max-w-[460px] cursor-crosshair bg-paper"
        onClick={(e) => pick(e.clientX, e.currentTarget)}
      >
        {band(-Infinity, vlo, '#f3d3cf', 'vlo')}
        {band(vhi, Infinity, '#f3d3cf', 'vhi')}
        {w ? band(vlo, w[0], '#f6e7c4', 'wlo') : null}
        {w ? band(w[1], vhi, '#f6e7c4', 'whi') : null}
        {x.ticks.map((t) => (
          <g key={`x${t}`}>
            <line x1={x(t)} x2={x(t)} y1={M.t} y2={M.t + IH} stroke="#e4e1d8" />
            <text x={x(t)} y={M.t + IH + 14} textAnchor="middle" fontSize={10} fill="#5b6369">
              {tick(t)}
            </text>
          </g>
        ))}
        {y.ticks.map((t, i) => (
          // keyed by place, not value: as the range grows while points arrive, the tick elements are
          // moved and relabelled rather than removed and inserted again (each insertion is style and layout work)
          <g key={`y${i}`}>
            <line x1={M.l} x2={M.l + IW} y1={y(t)} y2={y(t)} stroke="#e4e1d8" />
            <text x={M.l - 4} y={y(t) + 3} textAnchor="end" fontSize={10} fill="#5b6369">
              {tick(t)}
            </text>
          </g>
        ))}
        <path d={g.path ?? ''} fill="none" stroke="#1f5f8b" strokeWidth={1.6} />
        {g.first >= 0 ? (
          <g>
            <circle cx={x(xs[g.first])} cy={y(ys[g.first])} r={4} fill="none" stroke="#a3261b" strokeWidth={2} />
            <text x={Math.min(x(xs[g.first]) + 6, M.l + IW - 120)} y={M.t + 12} fontSize={10} fill="#a3261b">
              limit first broken at {tick(xs[g.first])}
            </text>
          </g>
        ) : null}
        {picked !== null && picked !== undefined && Number.isFinite(ys[picked]) ? <circle cx={x(xs[picked])} cy={y(ys[picked])} r={4} fill="#1f5f8b" /> : null}
        <text x={M.l + IW / 2} y={H - 6} textAnchor="middle" fontSize={11} fill="#1c2226">
          {xLabel}
        </text>
        <text transform={`translate(12 ${M.t + IH / 2}) rotate(-90)`} textAnchor="middle" fontSize={11} fill="#1c2226">
          {output.label} ({output.unit})
        </text>
      </svg>
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
