/**
 * A sweep's results as they arrive: progress, one chart per recorded output (a line over one
 * parameter, a heat map over two), the picked point with "Make this point a case", and for small
 * sweeps the points as a table. While points arrive, the box is drawn again at most once per
 * animation frame (sweep-batcher.ts), each line chart only takes in the new points
 * (line-series.ts), and the progress row and each chart are laid out and painted on their own.
 */
import { useEffect, useRef, useState, type CSSProperties } from 'react';
import { flushSync } from 'react-dom';
import type { SweepOutput } from '../../../../shared/review/sweep-outputs.ts';
import { Button } from '../../../components/button.tsx';
import type { LineSeries } from './line-series.ts';
import type { Range } from './sweep-batcher.ts';
import { lineColumns, lineSeries, SweepHeatMap, SweepLineChart } from './sweep-chart.tsx';
import { SweepStore } from './sweep-store.ts';

/** While points arrive, a heat map is drawn again at most this often, ms (a line chart at every redraw: only its new points cost). */
const HEAT_MAP_REDRAW_MS = 1000;

/**
 * While points arrive, the count in words ("Solving: 1200 of 10000 points") is written again at
 * most this often, ms: new text is laid out and repaints the page (its paint and layerization walk
 * the whole document), while the bar (a transform of a layer of its own), the aria-valuenow and the
 * line charts (canvases) follow every redraw without any paint of the page.
 */
export const STATUS_TEXT_MS = 1000;

/** The points table is shown for sweeps up to this size (larger ones: CSV). */
const TABLE_MAX = 200;

/** One sweep run (in the browser's workers or on the server): what was asked and the points so far (filled in place as they arrive). */
export interface Run {
  paramLabels: string[];
  parameters: { elementId: string; path: string }[];
  axes: number[][];
  log: boolean[];
  points: number[][];
  outputs: SweepOutput[];
  /** The points' values, exact. */
  store: SweepStore;
  /** One parameter: the line drawn per output, kept up to date point by point; two: null (heat maps). */
  lines: LineSeries[] | null;
  /** Counts the redraws asked for while points arrive. */
  version: number;
  status: 'running' | 'done' | 'cancelled' | 'failed';
  error?: string;
  started: number;
  ms?: number;
  /** Set by the results box while it shows this run: asks it to draw the points that arrived. */
  notify?: () => void;
}

/** A run's store and, for one parameter, its line series (empty: nothing arrived yet). */
export function runData(points: number[][], axes: number[][], log: boolean[], outputs: SweepOutput[]): Pick<Run, 'store' | 'lines' | 'version'> {
  const store = new SweepStore(points.length, outputs.length);
  const columns = axes.length === 1 ? lineColumns(axes[0], log[0]) : null;
  const lines = columns ? outputs.map((o, k) => lineSeries(axes[0], store.values[k], o, log[0], columns)) : null;
  return { store, lines, version: 0 };
}

/** Takes the points that arrived (already in the run's store) into its lines and asks for one redraw. */
export function drawArrived(run: Run, ranges: readonly Range[]) {
  if (run.lines) for (const line of run.lines) for (const [start, count] of ranges) line.add(start, count);
  run.version++;
  run.notify?.();
}

/**
 * While a run fills in, the progress row and each chart are laid out and painted on their own, not
 * with the page: size and layout containment make each a relayout boundary, so a redraw lays out
 * and repaints only them (not the results tables above, some 20 000 layout objects on a
 * 100-element study). A flex or grid item is never a relayout boundary (its size depends on its
 * siblings), so these boxes are block children: the results box lays its rows out as blocks.
 */
// a layer of its own too: the count in words, written again every second, repaints and re-layerizes only it
const running: CSSProperties = { contain: 'strict', height: '1.25rem', willChange: 'transform' };
const barTrack: CSSProperties = { width: '12rem', height: '0.5rem', overflow: 'hidden' };
const chartBox: CSSProperties = { contain: 'strict', width: '100%', maxWidth: 460, aspectRatio: '460 / 210' };

export function SweepResults({ run, picked, onPick, onMakeCase }: { run: Run; picked: number | null; onPick: (i: number) => void; onMakeCase: (() => void) | null }) {
  const [, setTick] = useState(0);
  useEffect(() => {
    // drawn in the frame the batcher hands the points over in (its cost is then that frame's)
    run.notify = () => flushSync(() => setTick((n) => n + 1));
    return () => {
      run.notify = undefined;
    };
  }, [run]);
  const total = run.points.length;
  const { store } = run;
  const failed = run.status === 'running' ? 0 : store.failed;
  // heat maps (every cell an element) are drawn again at most every HEAT_MAP_REDRAW_MS while the sweep runs, and once more when it stops
  const heat = useRef({ at: -Infinity, version: -1, status: run.status, run });
  const now = performance.now();
  if (heat.current.run !== run || heat.current.status !== run.status || (run.version !== heat.current.version && now - heat.current.at >= HEAT_MAP_REDRAW_MS)) {
    heat.current = { at: now, version: run.version, status: run.status, run };
  }
  const heatVersion = heat.current.version;
  // the count in words follows at most every STATUS_TEXT_MS while points arrive (the bar follows every redraw)
  const said = useRef({ at: now, done: store.done, run });
  if (said.current.run !== run) said.current = { at: now, done: store.done, run };
  else if (store.done !== said.current.done && now - said.current.at >= STATUS_TEXT_MS) said.current = { at: now, done: store.done, run };
  const status =
    run.status === 'running'
      ? `Solving: ${said.current.done} of ${total} points`
      : run.status === 'done'
        ? `Done: ${total} points in ${((run.ms ?? 0) / 1000).toFixed(2)} s${failed ? `; ${failed} could not be solved (see the CSV)` : ''}`
        : run.status === 'cancelled'
          ? `Cancelled after ${store.done} of ${total} points`
          : `The sweep stopped: ${run.error}`;
  const two = run.axes.length === 2;
  // Contained: while points arrive, only the progress row and the charts are laid out and painted again, not the page.
  return (
    <div className="space-y-2" style={{ contain: 'content' }}>
      <div className="flex items-center gap-2 text-[12px]" style={run.status === 'running' ? running : undefined}>
        <div role="progressbar" aria-label="Sweep progress" aria-valuemin={0} aria-valuemax={total} aria-valuenow={store.done} className="shrink-0 rounded-full bg-sunken" style={barTrack}>
          {/* its own layer: a new width is a transform the compositor applies, no layout or paint of the page */}
          <div className="h-full w-full origin-left bg-accent" style={{ transform: `scaleX(${total ? store.done / total : 0})`, willChange: run.status === 'running' ? 'transform' : undefined }} />
        </div>
        <span role="status">{status}</span>
      </div>
      <div className="grid grid-cols-1 gap-3 lg:grid-cols-2">
        {run.outputs.map((o, k) =>
          two || !run.lines ? (
            <SweepHeatMap key={o.key} xLabel={run.paramLabels[0]} yLabel={run.paramLabels[1]} xs={run.axes[0]} ys={run.axes[1]} values={store.values[k]} version={heatVersion} output={o} picked={picked} onPick={onPick} />
          ) : (
            <div key={o.key}>
              <div style={chartBox}>
                <SweepLineChart xLabel={run.paramLabels[0]} series={run.lines[k]} version={run.lines[k].version} output={o} log={run.log[0]} picked={picked} onPick={onPick} />
              </div>
            </div>
          ),
        )}
      </div>
      {picked !== null ? (
        <div className="flex flex-wrap items-center gap-2 text-[12px]">
          <span>
            Picked point: {run.paramLabels.map((l, i) => `${l} = ${Number(run.points[picked][i].toPrecision(6))}`).join(', ')}
            {store.error(picked) ? ` — does not solve: ${store.error(picked)}` : ''}
          </span>
          {onMakeCase ? (
            <Button size="sm" onClick={onMakeCase}>
              Make this point a case
            </Button>
          ) : null}
        </div>
      ) : null}
      {total <= TABLE_MAX && run.status !== 'running' ? (
        <details>
          <summary className="cursor-pointer text-[12px] text-accent">Sweep points as a table</summary>
          <table aria-label="Sweep points" className="text-[12px]">
            <thead>
              <tr>
                {run.paramLabels.map((l) => (
                  <th key={l} scope="col" className="text-right">
                    {l}
                  </th>
                ))}
                {run.outputs.map((o) => (
                  <th key={o.key} scope="col" className="text-right">
                    {o.label} ({o.unit})
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {run.points.map((p, i) => (
                <tr key={i}>
                  {p.map((v, j) => (
                    <td key={j} className="num text-right">
                      {Number(v.toPrecision(6))}
                    </td>
                  ))}
                  {run.outputs.map((o, k) => {
                    const v = store.value(k, i);
                    return (
                      <td key={o.key} className="num text-right">
                        {v === null ? '—' : v.toFixed(o.unit === 'pu' ? 4 : 2)}
                      </td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      ) : null}
    </div>
  );
}
