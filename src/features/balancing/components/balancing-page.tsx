/**
 * Phase balancing of a study: the customers are the study's own single-phase loads or an uploaded
 * customer list (CSV, read with papaparse and checked here, checked again by the server); the
 * planner picks the objective (or a weighted mix of them with its four weights) and the move limit, runs it on the server (its progress in words beside Cancel, which stops it), reads
 * the move list with the caution, the before / after / rotating-rule table, phasor diagrams of the
 * currents where the neutral is measured and each customer's voltage, downloads the moves as CSV, and applies them as a new revision (which goes to review
 * like any change).
 */
import { useRef, useState, type FormEvent } from 'react';
import { Link } from 'react-router';
import { MIX_TERMS, type BalanceProgress, type BalanceRequest, type BalanceResponse, type MixWeights } from '../../../../shared/api/balancing.ts';
import type { StudyContent, StudyDetail } from '../../../../shared/api/studies.ts';
import { applyAssignment, applyCustomers, FIGURE_ROWS, movesCsv, type CircuitInput, type Customer } from '../../../../shared/engine/index.ts';
import { Button } from '../../../components/button.tsx';
import { SelectField, TextField } from '../../../components/field.tsx';
import { Notice } from '../../../components/notice.tsx';
import { useRunBalance } from '../api/run-balance.ts';
import { readCustomersCsv, type ReadCustomers } from '../utils/read-customers.ts';
import { readWeights, type WeightTexts } from '../utils/mix-weights.ts';
import { progressWords } from '../utils/progress-words.ts';
import { CurrentPhasors } from './current-phasors.tsx';
import { useDocumentTitle } from '../../../lib/document-title.ts';

const OBJECTIVES = [
  ['neutral', 'Neutral current'],
  ['unbalance', 'Worst voltage unbalance along the feeder'],
  ['losses', 'Losses'],
  ['voltage', 'Lowest customer voltage'],
  ['mix', 'Weighted mix'],
] as const;

export interface BalancingPageProps {
  study: StudyDetail;
  /** Engineers and owners may save the moves as a revision. */
  canApply: boolean;
  /** Saves the content as a new revision; resolves to its number. */
  onApply: (content: StudyContent, message: string) => Promise<number | null | undefined>;
}

export function BalancingPage({ study, canApply, onApply }: BalancingPageProps) {
  useDocumentTitle('Phase balancing', study.name);
  const [source, setSource] = useState<'study' | 'csv'>('study');
  const [file, setFile] = useState<{ name: string; read: ReadCustomers } | null>(null);
  const [objective, setObjective] = useState<BalanceRequest['objective']>('neutral');
  const [definition, setDefinition] = useState<'iec' | 'nema' | 'ieee'>('iec');
  const [maxMoves, setMaxMoves] = useState('8');
  const [bus, setBus] = useState('');
  const [weightTexts, setWeightTexts] = useState<WeightTexts>({ neutral: '1', unbalance: '1', losses: '1', voltage: '1' });
  const [formError, setFormError] = useState<string | null>(null);
  const [result, setResult] = useState<{ response: BalanceResponse; customers: Customer[] | null; fileName: string | null } | null>(null);
  const [applied, setApplied] = useState<{ revision: number | null | undefined } | null>(null);
  const [applyError, setApplyError] = useState<string | null>(null);
  const [applying, setApplying] = useState(false);
  const run = useRunBalance(study.id);
  const abort = useRef<AbortController | null>(null);
  const [progress, setProgress] = useState<BalanceProgress | null>(null);

  /** A result, or a server error, belongs to the customers it was run on: a change of them puts it away. */
  function forgetRun() {
    abort.current?.abort();
    run.reset();
    setResult(null);
    setApplied(null);
    setApplyError(null);
  }

  async function pick(f: File | undefined) {
    forgetRun();
    setFormError(null);
    setFile(f ? { name: f.name, read: readCustomersCsv(await f.text()) } : null);
  }

  function submit(e: FormEvent) {
    e.preventDefault();
    setFormError(null);
    forgetRun();
    const moves = maxMoves.trim() === '' ? undefined : Number(maxMoves);
    if (moves !== undefined && (!Number.isInteger(moves) || moves < 0)) return setFormError('The number of moves must be a whole number, 0 or more.');
    let weights: MixWeights | undefined;
    if (objective === 'mix') {
      const read = readWeights(weightTexts);
      if (!read.ok) return setFormError(read.message);
      weights = read.weights;
    }
    let customers: Customer[] | null = null;
    let customersCsv: string | undefined;
    if (source === 'csv') {
      if (!file) return setFormError('Choose a customer list (CSV) first.');
      if (!file.read.ok) return setFormError('Correct the customer list first (see its problems above).');
      customers = file.read.customers;
      customersCsv = file.read.text;
    }
    const controller = new AbortController();
    abort.current = controller;
    setResult(null);
    setProgress(null);
    run.mutate(
      {
        body: {
          objective,
          ...(objective === 'unbalance' || (objective === 'mix' && (weights?.unbalance ?? 0) > 0) ? { definition } : {}),
          ...(weights ? { weights } : {}),
          ...(moves !== undefined ? { maxMoves: moves } : {}),
          ...(bus.trim() ? { bus: bus.trim() } : {}),
          ...(customersCsv !== undefined ? { customersCsv } : {}),
        },
        signal: controller.signal,
        onProgress: (p) => {
          if (abort.current === controller && !controller.signal.aborted) setProgress(p);
        },
      },
      { onSuccess: (response) => setResult({ response, customers, fileName: customers ? (file?.name ?? null) : null }) },
    );
  }

  function cancel() {
    abort.current?.abort();
    run.reset();
  }

  function download() {
    if (!result) return;
    const url = URL.createObjectURL(new Blob([movesCsv(result.response.moves)], { type: 'text/csv' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = `${study.name} phase moves.csv`;
    a.click();
    URL.revokeObjectURL(url);
  }

  async function apply() {
    if (!result) return;
    setApplyError(null);
    setApplying(true);
    const circuit = study.content.circuit as unknown as CircuitInput;
    const next = result.customers ? applyCustomers(circuit, result.customers, result.response.assignment) : applyAssignment(circuit, result.response.assignment);
    try {
      const moves = result.response.moves.length;
      const added = result.customers ? `${result.customers.length} customer${result.customers.length === 1 ? '' : 's'} added as loads from ${result.fileName ?? 'the customer list'}, ` : '';
      const revision = await onApply({ ...study.content, circuit: next as unknown as StudyContent['circuit'] }, `Phase balancing: ${added}${moves} move${moves === 1 ? '' : 's'} (${result.response.objective})`);
      setApplied({ revision });
    } catch (err) {
      setApplyError(err instanceof Error ? err.message : 'The moves could not be saved.');
    } finally {
      setApplying(false);
    }
  }

  const running = run.isPending;
  const error = run.isError && !(run.error instanceof DOMException) ? run.error.message : null;
  const r = result?.response;
  return (
    <div className="flex max-w-5xl flex-col gap-4">
      <nav aria-label="Breadcrumb" className="text-[13px] text-ink-muted">
        <Link to="/" className="text-accent hover:underline">
          Studies
        </Link>{' '}
        <span aria-hidden="true">/</span>{' '}
        <Link to={`/studies/${study.id}`} className="text-accent hover:underline">
          {study.name}
        </Link>
      </nav>
      <h1 className="text-lg">Phase balancing</h1>
      <p className="text-sm text-ink-muted">
        Find the few customers whose phase to move for the most improvement, checked on this study's unbalanced network. Every figure below is an exact solve of
        that connection.
      </p>

      <form onSubmit={submit} className="flex flex-col gap-3 rounded-[3px] border border-rule bg-panel p-3" aria-label="Balancing settings">
        <fieldset className="flex flex-col gap-1.5">
          <legend className="text-[13px] font-semibold">Customers</legend>
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              name="source"
              checked={source === 'study'}
              onChange={() => {
                forgetRun();
                setSource('study');
              }}
            />
            The study's single-phase loads (between a phase and the neutral)
          </label>
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              name="source"
              checked={source === 'csv'}
              onChange={() => {
                forgetRun();
                setSource('csv');
              }}
            />
            A customer list (CSV: customer, bus, phase, kw, kvar or pf; optional fixed, model, phases)
          </label>
          {source === 'csv' ? (
            <div className="flex flex-col gap-1 pl-6">
              <label className="text-[13px] font-semibold" htmlFor="customers-file">
                Customer list (CSV)
              </label>
              {/* Emptied on click: a browser reports only a changed choice, so the same file, edited and chosen again, is read again. */}
              <input
                id="customers-file"
                type="file"
                accept=".csv,text/csv"
                onClick={(e) => {
                  e.currentTarget.value = '';
                }}
                onChange={(e) => void pick(e.target.files?.[0])}
                className="text-sm"
              />
              {file?.read.ok ? <p className="text-[13px] text-ink-muted">{file.name}: {file.read.customers.length} customer{file.read.customers.length === 1 ? '' : 's'} read.</p> : null}
              {file && !file.read.ok ? (
                <Notice tone="error" title={`${file.name} has problems`}>
                  <ul className="list-disc pl-4">
                    {file.read.problems.map((p) => (
                      <li key={p}>{p}</li>
                    ))}
                  </ul>
                </Notice>
              ) : null}
            </div>
          ) : null}
        </fieldset>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-4">
          <SelectField label="Objective" value={objective} onChange={(e) => setObjective(e.target.value as BalanceRequest['objective'])}>
            {OBJECTIVES.map(([v, label]) => (
              <option key={v} value={v}>
                {label}
              </option>
            ))}
          </SelectField>
          {objective === 'unbalance' || objective === 'mix' ? (
            <SelectField label="Unbalance definition" value={definition} onChange={(e) => setDefinition(e.target.value as 'iec' | 'nema' | 'ieee')}>
              <option value="iec">IEC |V2|/|V1|</option>
              <option value="nema">Line voltages (NEMA)</option>
              <option value="ieee">Phase voltages (IEEE)</option>
            </SelectField>
          ) : null}
          <TextField label="Most customers to move" inputMode="numeric" value={maxMoves} onChange={(e) => setMaxMoves(e.target.value)} hint="Empty: no limit" />
          {objective === 'neutral' || objective === 'mix' ? <TextField label="Measure the neutral at bus" value={bus} onChange={(e) => setBus(e.target.value)} hint="Empty: at the source" /> : null}
        </div>
        {objective === 'mix' ? (
          <fieldset className="flex flex-col gap-1.5">
            <legend className="text-[13px] font-semibold">Weights of the mix</legend>
            <p className="text-[13px] text-ink-muted">Each figure counts relative to its value before balancing, times its weight; an empty box or 0 leaves it out.</p>
            <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
              {MIX_TERMS.map(([term, words]) => (
                <TextField
                  key={term}
                  label={`Weight of the ${words}`}
                  inputMode="decimal"
                  value={weightTexts[term]}
                  onChange={(e) => setWeightTexts((w) => ({ ...w, [term]: e.target.value }))}
                />
              ))}
            </div>
          </fieldset>
        ) : null}
        {formError ? (
          <p role="alert" className="text-[13px] text-danger">
            <span aria-hidden="true">✕ </span>
            {formError}
          </p>
        ) : null}
        <div className="flex items-center gap-2">
          <Button type="submit" variant="primary" busy={running} busyText="Balancing…">
            Run balancing
          </Button>
          {running ? (
            <>
              <Button onClick={cancel}>Cancel</Button>
              <span role="status" aria-live="polite" className="text-[13px] text-ink-muted">
                {progress ? progressWords(progress) : 'Finding the best moves: starting on the server…'}
              </span>
            </>
          ) : null}
        </div>
        {error ? <Notice tone="error">{error}</Notice> : null}
      </form>

      {r ? (
        <section aria-label="Balancing result" className="flex flex-col gap-3">
          <Notice tone="caution" title="Caution">
            {r.caution.replace(/^CAUTION:\s*/, '')}
          </Notice>
          <h2 className="text-base">
            Moves for the crew ({r.moves.length}) — minimise the {r.objective}
          </h2>
          {r.moves.length === 0 ? (
            <p className="text-sm">No move improves on the present connection.</p>
          ) : (
            <table className="w-full max-w-xl text-sm" aria-label="Moves for the crew">
              <thead>
                <tr className="text-left text-[12px] text-ink-muted">
                  <th className="py-1">Customer</th>
                  <th>Bus</th>
                  <th>From</th>
                  <th>To</th>
                </tr>
              </thead>
              <tbody>
                {r.moves.map((m) => (
                  <tr key={m.customer} className="border-t border-rule">
                    <td className="py-1">{m.customer}</td>
                    <td>{m.bus}</td>
                    <td>{m.from}</td>
                    <td>{m.to}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <div className="flex flex-wrap items-center gap-2">
            <Button onClick={download} disabled={r.moves.length === 0}>
              Download the moves (CSV)
            </Button>
            {canApply ? (
              <Button variant="primary" onClick={() => void apply()} busy={applying} busyText="Saving…" disabled={r.moves.length === 0 || applied !== null}>
                Apply as a new revision
              </Button>
            ) : null}
            {applied ? (
              <span role="status" className="text-[13px]">
                Saved as revision {applied.revision ?? '—'}; it goes through review like any change.{' '}
                <Link to={`/studies/${study.id}`} className="text-accent hover:underline">
                  Open the workspace
                </Link>
              </span>
            ) : null}
          </div>
          {applyError ? <Notice tone="error">{applyError}</Notice> : null}

          <h2 className="text-base">Before and after</h2>
          <table className="w-full max-w-3xl text-sm" aria-label="Before and after">
            <thead>
              <tr className="text-left text-[12px] text-ink-muted">
                <th className="py-1">Figure</th>
                <th className="text-right">Before</th>
                <th className="text-right">After</th>
                <th className="text-right">Rotating rule (A, B, C, … along the feeder)</th>
              </tr>
            </thead>
            <tbody>
              {FIGURE_ROWS.map((row) => (
                <tr key={row.label} className="border-t border-rule">
                  <td className="py-1">
                    {row.label} ({row.unit})
                  </td>
                  <td className="num text-right">{row.get(r.before).toFixed(row.digits)}</td>
                  <td className="num text-right">{row.get(r.after).toFixed(row.digits)}</td>
                  <td className="num text-right">{row.get(r.rotatingRule).toFixed(row.digits)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <p className="text-[13px] text-ink-muted">
            Gap proved by the assignment problem on the linearised feeder: {r.gapPercent === null ? 'none' : `${r.gapPercent.toFixed(2)} %`}
            {r.milpStatus === 'optimal' ? '' : ' (stopped at its time limit)'}; {r.solves} exact solves. The figures are exact solves whatever the gap.
          </p>

          <h2 className="text-base">Phasors</h2>
          <CurrentPhasors currents={r.currents} />

          <h2 className="text-base">Customer voltages</h2>
          <table className="w-full max-w-3xl text-sm" aria-label="Customer voltages">
            <thead>
              <tr className="text-left text-[12px] text-ink-muted">
                <th className="py-1">Customer</th>
                <th>Bus</th>
                <th>Phase</th>
                <th className="text-right">Before (V)</th>
                <th className="text-right">After (V)</th>
                <th className="text-right">After (pu)</th>
              </tr>
            </thead>
            <tbody>
              {r.voltages.after.map((v, i) => {
                const b = r.voltages.before[i];
                return (
                  <tr key={v.customer} className="border-t border-rule">
                    <td className="py-1">{v.customer}</td>
                    <td>{v.bus}</td>
                    <td>{b.phase === v.phase ? v.phase : `${b.phase} → ${v.phase}`}</td>
                    <td className="num text-right">{b.volts.toFixed(1)}</td>
                    <td className="num text-right">{v.volts.toFixed(1)}</td>
                    <td className="num text-right">{v.pu.toFixed(3)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </section>
      ) : null}
    </div>
  );
}
