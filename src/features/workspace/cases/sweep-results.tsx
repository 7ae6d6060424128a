/**
 * A sweep's results as they arrive: progress, one chart per recorded output (a line over one
 * parameter, a heat map over two), the picked point with "Make this point a case", and for small
 * sweeps the points as a table. The box is laid out and painted on its own while points arrive.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { SweepOutput } from '../../../../shared/review/sweep-outputs.ts';
import { Button } from '../../../components/button.tsx';
import { SweepHeatMap, SweepLineChart } from './sweep-chart.tsx';
import type { PointRow } from './sweep-protocol.ts';

/** While points arrive, the charts are drawn again at most this often, ms (the progress bar more often). */
const CHART_REDRAW_MS = 1000;

/** The points table is shown for sweeps up to this size (larger ones: CSV). */
const TABLE_MAX = 200;

/** One sweep run (in the browser's workers or on the server): what was asked and the rows so far (rows are filled in place as they arrive). */
export interface Run {
  paramLabels: string[];
  parameters: { elementId: string; path: string }[];
  axes: number[][];
  log: boolean[];
  points: number[][];
  outputs: SweepOutput[];
  rows: (PointRow | undefined)[];
  done: number;
  status: 'running' | 'done' | 'cancelled' | 'failed';
  error?: string;
  started: number;
  ms?: number;
  /** Set by the results box while it shows this run: asks it to draw the rows that arrived. */
  notify?: () => void;
}

export function SweepResults({ run, picked, onPick, onMakeCase }: { run: Run; picked: number | null; onPick: (i: number) => void; onMakeCase: (() => void) | null }) {
  const [, setTick] = useState(0);
  useEffect(() => {
    run.notify = () => setTick((n) => n + 1);
    return () => {
      run.notify = undefined;
    };
  }, [run]);
  const total = run.points.length;
  const failed = run.status === 'running' ? 0 : run.rows.filter((r) => r?.error).length;
  // The series the charts draw are rebuilt at most every CHART_REDRAW_MS while the sweep runs
  // (each chart is memoised on them), and once more when it stops.
  const drawn = useRef({ at: -Infinity, done: -1, status: run.status, run });
  const now = performance.now();
  if (drawn.current.run !== run || drawn.current.status !== run.status || (run.done !== drawn.current.done && now - drawn.current.at >= CHART_REDRAW_MS)) {
    drawn.current = { at: now, done: run.done, status: run.status, run };
  }
  const { done: drawnDone } = drawn.current;
  // eslint-disable-next-line react-hooks/exhaustive-deps -- drawnDone and the status stand for the rows filled in place
  const series = useMemo(() => run.outputs.map((_, k) => run.rows.map((r) => r?.outputs[k] ?? null)), [run, drawnDone, run.status]);
  const status =
    run.status === 'running'
      ? `Solving: ${run.done} of ${total} points`
      : run.status === 'done'
        ? `Done: ${total} points in ${((run.ms ?? 0) / 1000).toFixed(2)} s${failed ? `; ${failed} could not be solved (see the CSV)` : ''}`
        : run.status === 'cancelled'
          ? `Cancelled after ${run.done} of ${total} points`
          : `The sweep stopped: ${run.error}`;
  const two = run.axes.length === 2;
  // Contained: while points arrive, only this box is laid out and painted again, not the page.
  return (
    <div className="flex flex-col gap-2" style={{ contain: 'content' }}>
      <div className="flex items-center gap-2 text-[12px]">
        <progress aria-label="Sweep progress" max={total} value={run.done} className="w-48" />
        <span role="status">{status}</span>
      </div>
      <div className="grid grid-cols-1 gap-3 lg:grid-cols-2">
        {run.outputs.map((o, k) =>
          two ? (
            <SweepHeatMap key={o.key} xLabel={run.paramLabels[0]} yLabel={run.paramLabels[1]} xs={run.axes[0]} ys={run.axes[1]} values={series[k]} output={o} picked={picked} onPick={onPick} />
          ) : (
            <SweepLineChart key={o.key} xLabel={run.paramLabels[0]} xs={run.axes[0]} ys={series[k]} output={o} log={run.log[0]} picked={picked} onPick={onPick} />
          ),
        )}
      </div>
      {picked !== null ? (
        <div className="flex flex-wrap items-center gap-2 text-[12px]">
          <span>
            Picked point: {run.paramLabels.map((l, i) => `${l} = ${Number(run.points[picked][i].toPrecision(6))}`).join(', ')}
            {run.rows[picked]?.error ? ` — does not solve: ${run.rows[picked]?.error}` : ''}
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
                    const v = run.rows[i]?.outputs[k];
                    return (
                      <td key={o.key} className="num text-right">
                        {v === null || v === undefined ? '—' : v.toFixed(o.unit === 'pu' ? 4 : 2)}
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
