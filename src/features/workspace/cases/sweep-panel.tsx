/**
 * Browser sweeps: one or two numeric values of elements as drawn, each over a range (linear or
 * log), solved on the circuit shown (the base or the case on the canvas) in a pool of Web Workers.
 * Progress fills in as chunks arrive and the run can be cancelled; each chosen output gets a line
 * chart (one parameter) or a heat map (two) with its limit band; the points export as CSV with the
 * caution; a picked point becomes a new case.
 */
import { memo, startTransition, useEffect, useMemo, useRef, useState, type CSSProperties } from 'react';
import { sweepPoints, sweepValues, type CircuitResult, type StudyCase } from '../../../../shared/engine/index.ts';
import { MAX_SERVER_SWEEP_POINTS } from '../../../../shared/api/sweeps.ts';
import { parameterWords } from '../../../../shared/review/parameter-words.ts';
import { Button } from '../../../components/button.tsx';
import { cancelServerSweep, getServerSweep, startServerSweep } from '../api/sweeps.ts';
import { caseFromPoint, drawnElementsOf, numericParameters } from './case-model.ts';
import { sweepCsv } from './sweep-csv.ts';
import { availableOutputs, type SweepOutput } from '../../../../shared/review/sweep-outputs.ts';
import { SweepPool } from './sweep-pool.ts';
import { drawArrived, runData, SweepResults, type Run } from './sweep-results.tsx';
import { createBatcher, type Batcher } from './sweep-batcher.ts';

/**
 * While points arrive, the results are drawn again at most once per animation frame and at most
 * every REDRAW_MS; when a redraw takes long (a busy machine), the next waits REDRAW_BACKOFF times
 * as long, up to REDRAW_MAX_MS.
 */
const REDRAW_MS = 300;
const REDRAW_BACKOFF = 6;
const REDRAW_MAX_MS = 1000;

/** Largest sweep run in the browser (about 20 s of solving on a small study on two cores). */
export const BROWSER_MAX_POINTS = 20_000;
/** At most this many outputs are recorded (one chart each). */
const MAX_OUTPUTS = 6;

interface ParamForm {
  elementId: string;
  path: string;
  from: string;
  to: string;
  steps: string;
  log: boolean;
}

const emptyParam = (): ParamForm => ({ elementId: '', path: '', from: '', to: '', steps: '11', log: false });

/** A parameter in words with its unit: "KITCHEN every phase › P (kW)", a length with the element's length unit. */
export function parameterLabel(elementId: string, path: string, element?: Record<string, unknown>): string {
  const words = parameterWords(path);
  const unit = path === 'length' ? ` (${typeof element?.lengthUnit === 'string' ? element.lengthUnit : 'm'})` : '';
  return `${elementId} ${words}${unit}`;
}


export interface SweepPanelProps {
  /** The circuit shown (the case applied), or null when it cannot be built. */
  circuit: unknown;
  /** The base circuit as drawn (for a new case) and its cases. */
  base: unknown;
  cases: StudyCase[];
  /** The case the sweep runs on (null for the base). */
  onCase: string | null;
  /** Results of the circuit shown (which outputs exist). */
  result?: CircuitResult;
  onCases: ((cases: StudyCase[]) => void) | null;
  onActivate: (id: string) => void;
  /** Sweeps too large for the browser may run on the server, on the saved study (null: not offered, e.g. for read-only roles). */
  server?: { studyId: string; revision: number | null; dirty: boolean } | null;
}

/**
 * The Run and Cancel buttons change colour at once: a colour transition would repaint the page in
 * every frame of the first ~150 ms of a sweep (each repaint walks the whole document).
 */
const NO_TRANSITION: CSSProperties = { transition: 'none' };

/**
 * The outputs a sweep may record, as checkboxes (hundreds on a large study): a component of its
 * own, so starting, redrawing and ending a run does not render them again.
 */
const OutputChoices = memo(function OutputChoices({ outputs, chosenKeys, onChosen }: { outputs: SweepOutput[]; chosenKeys: string[]; onChosen: (keys: string[]) => void }) {
  return (
    <fieldset className="flex flex-wrap gap-x-3 gap-y-0.5 text-[12px]">
      <legend className="mb-0.5 text-[13px] font-semibold">Outputs to record (at most {MAX_OUTPUTS})</legend>
      {outputs.length === 0 ? <span className="text-ink-muted">Solve the circuit first: the outputs come from its results.</span> : null}
      {outputs.map((o) => (
        <label key={o.key} className="flex items-center gap-1">
          <input
            type="checkbox"
            checked={chosenKeys.includes(o.key)}
            disabled={!chosenKeys.includes(o.key) && chosenKeys.length >= MAX_OUTPUTS}
            onChange={(e) => onChosen(e.target.checked ? [...chosenKeys, o.key] : chosenKeys.filter((k) => k !== o.key))}
          />
          {o.label} ({o.unit})
        </label>
      ))}
    </fieldset>
  );
});

/** How often a running server sweep is asked for its progress and new points, ms. */
const SERVER_POLL_MS = 1000;

export function SweepPanel({ circuit, base, cases, onCase, result, onCases, onActivate, server }: SweepPanelProps) {
  const elements = useMemo(() => drawnElementsOf(circuit), [circuit]);
  const [params, setParams] = useState<ParamForm[]>([emptyParam()]);
  const outputs = useMemo(() => (result ? availableOutputs(result) : []), [result]);
  const [chosen, setChosen] = useState<string[] | null>(null);
  const chosenKeys = useMemo(() => chosen ?? outputs.filter((o) => o.spec.kind === 'load').slice(0, 3).map((o) => o.key), [chosen, outputs]);
  const [run, setRun] = useState<Run | null>(null);
  const [picked, setPicked] = useState<number | null>(null);
  const [startError, setStartError] = useState<string | null>(null);
  const pool = useRef<SweepPool | null>(null);
  const running = useRef<{ cancel(): void } | null>(null);
  const batcher = useRef<Batcher | null>(null);
  const csvUrl = useRef<string | null>(null);

  useEffect(
    () => () => {
      running.current?.cancel();
      pool.current?.dispose();
      batcher.current?.cancel();
      if (csvUrl.current) URL.revokeObjectURL(csvUrl.current);
    },
    [],
  );

  // The form's problems, in words; null when it can run.
  const plan = useMemo(() => {
    try {
      const used = params.filter((p) => p.elementId && p.path);
      if (used.length === 0) return { problem: 'Pick an element and a value to sweep.' };
      const specs = used.map((p) => {
        const from = Number(p.from);
        const to = Number(p.to);
        const steps = Number(p.steps);
        if (p.from.trim() === '' || p.to.trim() === '' || !Number.isFinite(from) || !Number.isFinite(to)) throw new Error(`${parameterLabel(p.elementId, p.path)}: enter numbers for from and to.`);
        if (!Number.isInteger(steps) || steps < 2) throw new Error(`${parameterLabel(p.elementId, p.path)}: the number of points must be a whole number of at least 2.`);
        return { from, to, steps, scale: p.log ? ('log' as const) : ('linear' as const) };
      });
      const total = specs.reduce((n, s) => n * s.steps, 1);
      const outs = outputs.filter((o) => chosenKeys.includes(o.key));
      if (outs.length === 0) return { problem: 'Choose at least one output to record.' };
      if (total > BROWSER_MAX_POINTS) {
        const onServer = !!server && total <= MAX_SERVER_SWEEP_POINTS;
        return {
          problem: `${total} points is more than the ${BROWSER_MAX_POINTS} a browser sweep runs; ${onServer ? 'run it on the server, or use fewer points' : 'use fewer points'}.`,
          onServer,
          used,
          specs,
          total,
          outs,
        };
      }
      return { used, specs, total, outs };
    } catch (e) {
      return { problem: (e as Error).message };
    }
  }, [params, outputs, chosenKeys, server]);

  const start = (where: 'browser' | 'server' = 'browser') => {
    if (!('specs' in plan) || !plan.specs || !circuit) return;
    if (where === 'browser' && 'problem' in plan) return;
    let points: number[][];
    let axes: number[][];
    try {
      points = sweepPoints(plan.specs);
      axes = plan.specs.map((s) => sweepValues(s));
    } catch (e) {
      setStartError((e as Error).message);
      return;
    }
    setStartError(null);
    running.current?.cancel();
    const { cases: _c, ...plain } = circuit as Record<string, unknown>;
    const next: Run = {
      paramLabels: plan.used.map((p) => parameterLabel(p.elementId, p.path, elements.find((e) => e.id === p.elementId))),
      parameters: plan.used.map((p) => ({ elementId: p.elementId, path: p.path })),
      axes,
      log: plan.specs.map((s) => s.scale === 'log'),
      points,
      outputs: plan.outs,
      ...runData(points, axes, plan.specs.map((s) => s.scale === 'log'), plan.outs),
      status: 'running',
      started: performance.now(),
    };
    // rendered as a transition (in slices of a few ms, not one long task in the Run click), while the workers already solve
    startTransition(() => {
      setPicked(null);
      setRun(next);
    });
    // Points land in the run's store as they arrive; its results box (not this panel) is drawn again at most once per frame.
    batcher.current?.cancel();
    const batch = createBatcher((ranges) => drawArrived(next, ranges), { minInterval: REDRAW_MS, backoff: REDRAW_BACKOFF, maxInterval: REDRAW_MAX_MS });
    batcher.current = batch;
    if (where === 'server') {
      if (server) runOnServer(server.studyId, next, plan.used, plan.specs, batch);
      return;
    }
    pool.current ??= new SweepPool();
    performance.mark('sweep-start');
    running.current = pool.current.run(
      { circuit: plain, paths: plan.used.map((p) => `${p.elementId}.${p.path}`), points, outputs: plan.outs.map((o) => o.spec) },
      {
        onRows(at, rows) {
          next.store.put(at, rows);
          batch.push(at, rows.count);
        },
        onDone() {
          batch.flushNow();
          performance.mark('sweep-done');
          next.status = 'done';
          next.ms = performance.now() - next.started;
          running.current = null;
          startTransition(() => setRun({ ...next }));
        },
        onFailure(message) {
          batch.flushNow();
          next.status = 'failed';
          next.error = message;
          running.current = null;
          setRun({ ...next });
        },
      },
    );
  };

  /** The same sweep as a server job on the saved study: its points are fetched as they are solved and drawn as a browser run's. */
  const runOnServer = (studyId: string, next: Run, used: ParamForm[], specs: { from: number; to: number; steps: number; scale: 'linear' | 'log' }[], batch: Batcher) => {
    let stopped = false;
    let jobId: string | null = null;
    let timer: ReturnType<typeof setTimeout> | null = null;
    const finish = (status: Run['status'], error?: string) => {
      batch.flushNow();
      next.status = status;
      if (error) next.error = error;
      next.ms = performance.now() - next.started;
      running.current = null;
      setRun({ ...next });
    };
    running.current = {
      cancel: () => {
        stopped = true;
        if (timer) clearTimeout(timer);
        if (jobId) void cancelServerSweep(studyId, jobId).catch(() => {});
      },
    };
    const poll = async () => {
      if (stopped || !jobId) return;
      try {
        const job = await getServerSweep(studyId, jobId, next.store.done);
        if (stopped) return;
        next.store.putRows(
          job.offset,
          job.points.map((p) => ({ outputs: p.outputs, ...(p.error ? { error: p.error } : {}) })),
        );
        batch.push(job.offset, job.points.length);
        if (job.status === 'failed') return finish('failed', job.error ?? 'the server stopped the sweep');
        if (job.status === 'cancelled') return finish('cancelled');
        if (job.status === 'done' && next.store.done >= job.total) return finish('done');
        timer = setTimeout(() => void poll(), job.status === 'done' ? 0 : SERVER_POLL_MS);
      } catch (e) {
        if (!stopped) finish('failed', (e as Error).message);
      }
    };
    startServerSweep(studyId, {
      parameters: used.map((p, i) => ({ path: `${p.elementId}.${p.path}`, from: specs[i].from, to: specs[i].to, points: specs[i].steps, scale: specs[i].scale })),
      ...(onCase ? { case: onCase } : {}),
      outputs: next.outputs.map((o) => o.key),
    }).then(
      (job) => {
        jobId = job.id;
        if (stopped) void cancelServerSweep(studyId, job.id).catch(() => {});
        else void poll();
      },
      (e: Error) => {
        if (!stopped) finish('failed', e.message);
      },
    );
  };

  const cancel = () => {
    running.current?.cancel();
    running.current = null;
    batcher.current?.flushNow();
    batcher.current?.cancel();
    if (run && run.status === 'running') setRun({ ...run, status: 'cancelled', ms: performance.now() - run.started });
  };

  // The CSV is written when asked for (not when the sweep ends: a 10 000-point file is no work for the last frame).
  const exportCsv = (a: HTMLAnchorElement) => {
    if (!run) return;
    if (csvUrl.current) URL.revokeObjectURL(csvUrl.current);
    csvUrl.current = URL.createObjectURL(new Blob([sweepCsv(run.paramLabels, run.outputs, run.points, run.store.rows())], { type: 'text/csv' }));
    a.href = csvUrl.current;
  };

  const makeCase = () => {
    if (!run || picked === null || !onCases) return;
    const values = run.points[picked];
    const name = `Sweep point: ${run.paramLabels.map((l, i) => `${l} = ${Number(values[i].toPrecision(6))}`).join(', ')}`;
    const next = caseFromPoint(cases, base, onCase, run.parameters, values, name);
    onCases(next);
    onActivate(next[next.length - 1].id);
  };

  const setParam = (i: number, patch: Partial<ParamForm>) => setParams(params.map((p, k) => (k === i ? { ...p, ...patch } : p)));

  return (
    <section aria-labelledby="sweep-title" className="flex flex-col gap-2">
      <h3 id="sweep-title" className="text-[13px] font-semibold">
        Sweep {onCase ? 'on the case shown' : 'on the base'}
      </h3>
      {params.map((p, i) => {
        const el = elements.find((e) => e.id === p.elementId);
        const choices = el ? numericParameters(el) : [];
        const n = i + 1;
        return (
          <fieldset key={i} className="flex flex-wrap items-center gap-1.5 text-[13px]">
            <legend className="sr-only">Parameter {n}</legend>
            <span className="font-semibold">Parameter {n}</span>
            <select
              aria-label={`Parameter ${n} element`}
              className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1"
              value={p.elementId}
              onChange={(e) => {
                setParam(i, { elementId: e.target.value, path: '' });
                // a sweep is coming: its workers start loading now, not on Run
                (pool.current ??= new SweepPool()).warm();
              }}
            >
              <option value="">Element…</option>
              {elements.map((e) => (
                <option key={e.id as string} value={e.id as string}>
                  {e.id as string}
                </option>
              ))}
            </select>
            <select
              aria-label={`Parameter ${n} value`}
              className="h-7 rounded-[3px] border border-rule-strong bg-paper px-1"
              value={p.path}
              disabled={!el}
              onChange={(e) => {
                const c = choices.find((x) => x.path === e.target.value);
                setParam(i, { path: e.target.value, ...(c ? { from: String(c.value * 0.5), to: String(c.value * 1.5) } : {}) });
              }}
            >
              <option value="">Value…</option>
              {choices.map((c) => (
                <option key={c.path} value={c.path}>
                  {c.label} (now {c.value})
                </option>
              ))}
            </select>
            <label className="flex items-center gap-1">
              from
              <input aria-label={`Parameter ${n} from`} inputMode="decimal" className="h-7 w-20 rounded-[3px] border border-rule-strong bg-paper px-1" value={p.from} onChange={(e) => setParam(i, { from: e.target.value })} />
            </label>
            <label className="flex items-center gap-1">
              to
              <input aria-label={`Parameter ${n} to`} inputMode="decimal" className="h-7 w-20 rounded-[3px] border border-rule-strong bg-paper px-1" value={p.to} onChange={(e) => setParam(i, { to: e.target.value })} />
            </label>
            <label className="flex items-center gap-1">
              points
              <input aria-label={`Parameter ${n} points`} inputMode="numeric" className="h-7 w-16 rounded-[3px] border border-rule-strong bg-paper px-1" value={p.steps} onChange={(e) => setParam(i, { steps: e.target.value })} />
            </label>
            <label className="flex items-center gap-1">
              <input type="checkbox" checked={p.log} onChange={(e) => setParam(i, { log: e.target.checked })} />
              log spacing
            </label>
            {i === 1 ? (
              <Button size="sm" variant="ghost" onClick={() => setParams(params.slice(0, 1))}>
                Remove
              </Button>
            ) : null}
          </fieldset>
        );
      })}
      {params.length === 1 ? (
        <div>
          <Button size="sm" variant="ghost" onClick={() => setParams([...params, emptyParam()])}>
            + Second parameter (heat map)
          </Button>
        </div>
      ) : null}
      <OutputChoices outputs={outputs} chosenKeys={chosenKeys} onChosen={setChosen} />
      <div className="flex flex-wrap items-center gap-2 text-[13px]">
        <Button size="sm" variant="primary" style={NO_TRANSITION} onClick={() => start('browser')} disabled={'problem' in plan || !circuit || run?.status === 'running'}>
          Run sweep{'total' in plan && plan.total ? ` (${plan.total} points)` : ''}
        </Button>
        {'onServer' in plan && plan.onServer && server ? (
          <Button size="sm" onClick={() => start('server')} disabled={run?.status === 'running'} title="Runs on the server, on the study as last saved">
            Run on the server ({plan.total} points, {server.revision ? `revision ${server.revision}` : 'as saved'})
          </Button>
        ) : null}
        {'onServer' in plan && plan.onServer && server?.dirty ? <span className="text-[12px] text-caution">The server sweeps the study as last saved: save first to include your latest edits.</span> : null}
        {run?.status === 'running' ? (
          <Button size="sm" variant="danger" style={NO_TRANSITION} onClick={cancel}>
            Cancel sweep
          </Button>
        ) : null}
        {'problem' in plan ? <span className="text-[12px] text-ink-muted">{plan.problem}</span> : null}
        {startError ? (
          <span role="alert" className="text-[12px] text-danger">
            {startError}
          </span>
        ) : null}
        {run && run.status !== 'running' ? (
          // the file is made on click, before the browser follows the link
          <a className="text-accent hover:underline" href="#" download="sweep.csv" onClick={(e) => exportCsv(e.currentTarget)}>
            Export CSV
          </a>
        ) : null}
      </div>
      {run ? <SweepResults run={run} picked={picked} onPick={setPicked} onMakeCase={onCases ? makeCase : null} /> : null}
    </section>
  );
}
