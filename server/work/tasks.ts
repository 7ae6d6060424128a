/**
 * The heavy, pure jobs of the server (run in worker threads by pool.ts, or inline): checking a
 * circuit with the engine's parser, solving it for a revision's results summary, and diffing two
 * revisions. Results are plain data so they cross a thread boundary; nothing here touches the
 * database or a request.
 */
import { createSweepSolver, InvalidCircuitError, parseCircuit, solveCircuit, type CircuitInput, type SweepOutputSpec, type SweepPointRow } from '../../shared/engine/index.ts';
import { availableOutputs, type SweepOutput } from '../../shared/review/sweep-outputs.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { diffRevisions, type DiffSide, type RevisionDiff } from '../../shared/review/diff.ts';
import { summarizeCircuit, type ResultsSummary } from '../../shared/review/summary.ts';
import { resultsCsv, type CsvInput } from '../report/csv.ts';
import type { ReportInput } from '../report/pdf.ts';

export interface CircuitIssue {
  /** Path inside the circuit (`elements.3.r`), or "(root)". */
  path: string;
  message: string;
}

export type Task =
  | { kind: 'prepare'; circuit: unknown }
  | { kind: 'diff'; from: DiffSide; to: DiffSide }
  | { kind: 'report'; input: ReportInput }
  | { kind: 'csv'; input: CsvInput }
  | { kind: 'sweep-outputs'; circuit: unknown }
  | { kind: 'sweep'; circuit: unknown; paths: string[]; points: number[][]; outputs: SweepOutputSpec[] };

/** Answer of `sweep-outputs`: what a sweep of the circuit may record (labels and units, no bands), or why it does not solve. */
export type SweepOutputsAnswer = { ok: true; outputs: Pick<SweepOutput, 'key' | 'label' | 'unit' | 'spec'>[] } | { ok: false; message: string };

/** Answer of `prepare`: the engine's issues with the circuit, or its results summary. */
export type Prepared = { ok: false; message: string; issues: CircuitIssue[] } | { ok: true; summary: ResultsSummary };

export type TaskResult<T extends Task> = T extends { kind: 'prepare' } ? Prepared : RevisionDiff;

/** Checks a circuit with the engine's parser and, when it is valid, solves it for the summary a revision keeps. */
export function prepare(circuit: unknown): Prepared {
  try {
    parseCircuit(circuit);
  } catch (err) {
    if (!(err instanceof InvalidCircuitError)) throw err;
    return { ok: false, message: err.message, issues: err.issues.map((i) => ({ path: i.path, message: i.message })) };
  }
  return { ok: true, summary: summarizeCircuit(circuit) };
}

/** The outputs a sweep of this circuit may record (from a solve of it), messages in the user's names. */
export function sweepOutputs(circuit: unknown): SweepOutputsAnswer {
  try {
    return { ok: true, outputs: availableOutputs(solveCircuit(circuit)).map(({ key, label, unit, spec }) => ({ key, label, unit, spec })) };
  } catch (err) {
    return { ok: false, message: circuitNames(circuit).text((err as Error).message) };
  }
}

let sweepSolver: ReturnType<typeof createSweepSolver> | null = null;

/** One batch of sweep points (the solver's network is kept by the thread between batches); refusals in the user's names. */
export function sweepBatch(task: Extract<Task, { kind: 'sweep' }>): SweepPointRow[] {
  sweepSolver ??= createSweepSolver();
  const rows = sweepSolver(task.circuit as CircuitInput, task.paths, task.points, task.outputs);
  if (!rows.some((r) => r.error)) return rows;
  const names = circuitNames(task.circuit);
  return rows.map((r) => (r.error ? { ...r, error: names.text(r.error) } : r));
}

/**
 * Runs one task other than a report. Reports (pdfmake and its PDF and font libraries) are made by
 * renderReportPdf, imported where it runs: statically in the work threads (worker.ts), on the first
 * inline report in the request thread (pool.ts), so an idle server does not hold pdfmake.
 */
export function runTask(task: Exclude<Task, { kind: 'report' }>): Prepared | RevisionDiff | ReturnType<typeof resultsCsv> | SweepOutputsAnswer | SweepPointRow[] {
  switch (task.kind) {
    case 'sweep-outputs':
      return sweepOutputs(task.circuit);
    case 'sweep':
      return sweepBatch(task);
    case 'prepare':
      return prepare(task.circuit);
    case 'diff':
      return diffRevisions(task.from, task.to);
    case 'csv':
      return resultsCsv(task.input);
  }
}
