/**
 * Cases compare: the base circuit and each of its study cases solved side by side (in the solve
 * Web Worker, one request per case, debounced after edits), one column per case with its delta against the base and the
 * worst case of each row marked. Shows nothing when the circuit has no cases. Self-contained: give
 * it the circuit being edited.
 */
import { memo, useEffect, useMemo, useRef, useState } from 'react';
import { applyCase, BASE_CASE_ID, caseLabel, circuitCases, type CircuitInput, type CircuitResult } from '../../../../shared/engine/index.ts';
import { createDefaultPort, type SolvePort } from '../solve/solve-port.ts';
import type { SolveResponse } from '../solve/solve-protocol.ts';
import { compareCases, type CaseOutcome, type CompareRow } from './cases-compare-model.ts';
import { hidePrivate } from './private-names.ts';
import { ResultsCaution } from './result-sections.tsx';

export interface CasesCompareProps {
  circuit: unknown;
  /** Marker of generated names (hidden from the table), as in the results panel. */
  privateMarker?: string;
}

const fmt = (v: number | null, unit: CompareRow['unit']) => (v === null ? '—' : unit === '' ? String(v) : `${v.toFixed(unit === 'pu' ? 3 : unit === '%' ? 2 : 1)} ${unit}`);
const fmtDelta = (d: number | null, unit: CompareRow['unit']) => (d === null ? '' : `${d >= 0 ? '+' : '−'}${fmt(Math.abs(d), unit)}`);

const NO_CASES = '';

/** Quiet time after the last edit before the cases are solved again, ms (each edit would otherwise solve every case). */
export const COMPARE_DEBOUNCE_MS = 300;

/**
 * Solve every case of `circuit` in one solve worker kept for the view's life; outcomes in case order
 * (base first), or null while running. Edits are debounced, and answers to an overtaken round dropped.
 */
function useCaseOutcomes(circuit: unknown): CaseOutcome[] | null {
  // Without cases there is nothing to compare: the circuit is not serialised on every edit then.
  const key = useMemo(() => ((circuit as { cases?: unknown } | null)?.cases === undefined ? NO_CASES : JSON.stringify(circuit)), [circuit]);
  const [outcomes, setOutcomes] = useState<CaseOutcome[] | null>(null);
  const port = useRef<SolvePort | null>(null);
  const onAnswer = useRef<(res: SolveResponse) => void>(() => {});
  const onFailure = useRef<(message: string) => void>(() => {});
  const round = useRef(0);
  useEffect(() => {
    const p = createDefaultPort(
      (res) => onAnswer.current(res),
      (message) => onFailure.current(message),
    );
    port.current = p;
    return () => {
      p.terminate();
      port.current = null;
    };
  }, []);
  useEffect(() => {
    if (key === NO_CASES) {
      setOutcomes([]);
      return;
    }
    const parsed = JSON.parse(key) as unknown;
    let cases;
    try {
      cases = circuitCases(parsed);
    } catch (e) {
      setOutcomes([{ id: BASE_CASE_ID, label: 'Base', error: (e as Error).message }]);
      return;
    }
    if (cases.length === 0) {
      setOutcomes([]);
      return;
    }
    const list: CaseOutcome[] = [{ id: BASE_CASE_ID, label: 'Base' }, ...cases.map((c) => ({ id: c.id, label: caseLabel(c).replace(/^case "(.*)"$/, '$1') }))];
    // request ids: round × 1024 + the case's place (answers of an earlier round are dropped)
    const first = ++round.current * 1024;
    let pending = 0;
    const done = () => {
      if (pending === 0) setOutcomes(list.map((o) => ({ ...o })));
    };
    onAnswer.current = (res) => {
      const o = res.id >= first && res.id < first + 1024 ? list[res.id - first] : undefined;
      if (!o) return;
      if (res.ok) o.result = res.result as CircuitResult;
      else o.error = res.error.message;
      pending--;
      done();
    };
    onFailure.current = (message) => {
      for (const o of list) if (!o.result && !o.error) o.error = message;
      pending = 0;
      done();
    };
    setOutcomes(null);
    const timer = setTimeout(() => {
      list.forEach((o, i) => {
        let edited: unknown;
        try {
          edited = applyCase(parsed as Record<string, unknown>, o.id);
        } catch (e) {
          o.error = (e as Error).message;
          return;
        }
        pending++;
        port.current?.post({ id: first + i, circuit: edited as CircuitInput });
      });
      done();
    }, COMPARE_DEBOUNCE_MS);
    return () => clearTimeout(timer);
  }, [key]);
  return outcomes;
}

/**
 * Renders only for a circuit with cases, and only when the circuit object changes (the workspace
 * re-renders on every frame of a drag; the circuit keeps its identity between edits).
 */
export const CasesCompare = memo(function CasesCompare(props: CasesCompareProps) {
  const cases = (props.circuit as { cases?: unknown } | null)?.cases;
  return Array.isArray(cases) && cases.length > 0 ? <CasesCompareTable {...props} /> : null;
});

function CasesCompareTable({ circuit, privateMarker }: CasesCompareProps) {
  const outcomes = useCaseOutcomes(circuit);
  const visible = useMemo(() => outcomes?.map((o) => (o.result ? { ...o, result: hidePrivate(o.result, privateMarker) } : o)) ?? null, [outcomes, privateMarker]);
  const rows = useMemo(() => (visible ? compareCases(visible) : []), [visible]);
  if (outcomes && outcomes.length === 0) return null;
  return (
    <section aria-labelledby="cases-compare" className="flex flex-col gap-2">
      <h3 id="cases-compare" className="text-[13px] font-semibold">
        Study cases compared
      </h3>
      {!visible ? (
        <p role="status" className="text-[13px] text-ink-muted">
          Solving the cases…
        </p>
      ) : (
        <div className="overflow-x-auto">
          <table aria-label="Study cases compared" className="w-full text-[12px]">
            <thead>
              <tr>
                <th scope="col" className="text-left">
                  Quantity
                </th>
                {visible.map((o) => (
                  <th key={o.id} scope="col" className="text-right">
                    {o.label}
                    {o.error ? <span className="block font-normal text-danger">does not solve: {o.error}</span> : null}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.key}>
                  <th scope="row" className="text-left font-normal">
                    {r.label}
                  </th>
                  {r.values.map((v, i) => (
                    <td key={i} className={`num text-right${r.worst === i ? ' font-semibold text-danger' : ''}`} aria-label={r.worst === i ? `${fmt(v, r.unit)}, worst case` : undefined}>
                      {fmt(v, r.unit)}
                      {i > 0 && r.deltas[i] !== null ? <span className="ml-1 text-ink-muted">({fmtDelta(r.deltas[i], r.unit)})</span> : null}
                      {r.worst === i ? <span aria-hidden="true"> ▲</span> : null}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
          <p className="text-[11px] text-ink-muted">Deltas are against the base; ▲ marks the worst case of each row (furthest from nominal for voltages, largest otherwise).</p>
        </div>
      )}
      <ResultsCaution />
    </section>
  );
}
