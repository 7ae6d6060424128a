/**
 * The heavy, pure jobs of the server (run in worker threads by pool.ts, or inline): checking a
 * circuit with the engine's parser, solving it for a revision's results summary, and diffing two
 * revisions. Results are plain data so they cross a thread boundary; nothing here touches the
 * database or a request.
 */
import { InvalidCircuitError, parseCircuit } from '../../shared/engine/index.ts';
import { diffRevisions, type DiffSide, type RevisionDiff } from '../../shared/review/diff.ts';
import { summarizeCircuit, type ResultsSummary } from '../../shared/review/summary.ts';
import { resultsCsv, type CsvInput } from '../report/csv.ts';
import { renderReportPdf, type ReportInput } from '../report/pdf.ts';

export interface CircuitIssue {
  /** Path inside the circuit (`elements.3.r`), or "(root)". */
  path: string;
  message: string;
}

export type Task =
  | { kind: 'prepare'; circuit: unknown }
  | { kind: 'diff'; from: DiffSide; to: DiffSide }
  | { kind: 'report'; input: ReportInput }
  | { kind: 'csv'; input: CsvInput };

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

/** Runs one task. */
export function runTask(task: Task): Prepared | RevisionDiff | ReturnType<typeof resultsCsv> | Promise<Uint8Array> {
  switch (task.kind) {
    case 'prepare':
      return prepare(task.circuit);
    case 'diff':
      return diffRevisions(task.from, task.to);
    case 'report':
      return renderReportPdf(task.input);
    case 'csv':
      return resultsCsv(task.input);
  }
}
