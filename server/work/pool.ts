/**
 * Heavy work off the request thread: a small piscina pool of worker threads runs the jobs of
 * tasks.ts (circuit checks, solves for revision summaries, diffs), so one 2 MB import or a large
 * diff does not stall every other request. Each job has a time limit (WORK_TIMEOUT_MS, default
 * 20 s): past it the thread is stopped and the request is answered 503 with a plain message; so is
 * a request that finds the queue full. Small circuits run inline: handing them to a thread costs
 * more than solving them.
 *
 * Workers are TypeScript files loaded through tsx (`--import tsx`, as the server itself runs).
 */
import { MessageChannel, type TransferListItem } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { RevisionDiff, DiffSide } from '../../shared/review/diff.ts';
import { AppError } from '../errors.ts';
import type { CsvInput } from '../report/csv.ts';
import type { ReportInput } from '../report/pdf.ts';
import type { BalanceOutcome, BalanceProgressMessage, BalanceTask } from './balance-task.ts';
import type { SweepOutputSpec, SweepPointRow } from '../../shared/engine/index.ts';
import { readStudyFile, type ImportTask, type StudyFileReading } from './import-file.ts';
import { prepare, runTask, type Prepared, type SweepOutputsAnswer, type Task } from './tasks.ts';

/** Jobs on circuits with fewer elements than this run inline (they take well under a millisecond). */
export const INLINE_ELEMENTS = 60;

/** Uploaded files shorter than this (characters) are read inline. */
export const INLINE_FILE_CHARS = 32 * 1024;

export interface WorkPoolOptions {
  /** Worker threads (default 1: the machine has few cores and the request thread needs one). */
  threads?: number;
  /** Time limit of one job in milliseconds. */
  timeoutMs?: number;
  /** Jobs that may wait for a thread before new ones are refused with 503. */
  maxQueue?: number;
}

export interface WorkPool {
  prepare(circuit: unknown): Promise<Prepared>;
  /**
   * An uploaded study file from its bytes (UTF-8) or text to what is stored (import-file.ts). Bytes
   * are moved to the thread, not copied: the caller must not use them afterwards.
   */
  readStudyFile(body: Uint8Array | string | undefined): Promise<StudyFileReading>;
  diff(from: DiffSide, to: DiffSide): Promise<RevisionDiff>;
  /**
   * Phase balancing, always on a worker thread; `signal` cancels it (the thread's job is stopped);
   * `onProgress` hears its stage and exact solves (through a MessagePort, at most every 100 ms).
   */
  balance(task: BalanceTask, signal?: AbortSignal, onProgress?: (p: BalanceProgressMessage) => void): Promise<BalanceOutcome>;
  /** The PDF report of a revision (server/report/pdf.ts). */
  report(input: ReportInput): Promise<Uint8Array>;
  /** One results table as CSV (server/report/csv.ts). */
  csv(input: CsvInput): Promise<{ ok: true; csv: string } | { ok: false; message: string }>;
  /** What a sweep of the circuit may record (always in a thread: it solves the circuit). */
  sweepOutputs(circuit: unknown): Promise<SweepOutputsAnswer>;
  /** One batch of sweep points (always in a thread). */
  sweep(circuit: unknown, paths: string[], points: number[][], outputs: SweepOutputSpec[]): Promise<SweepPointRow[]>;
  close(): Promise<void>;
}

function elementCount(circuit: unknown): number {
  const elements = (circuit as { elements?: unknown } | null)?.elements;
  return Array.isArray(elements) ? elements.length : 0;
}

export function createWorkPool({ threads = 1, timeoutMs = 20_000, maxQueue = 64 }: WorkPoolOptions = {}): WorkPool {
  let pool: Piscina | null = null;
  const getPool = () =>
    (pool ??= new Piscina({
      filename: new URL('./worker.ts', import.meta.url).href,
      execArgv: ['--import', 'tsx'],
      minThreads: 0,
      maxThreads: threads,
      idleTimeout: 60_000,
      maxQueue,
    }));

  async function run<T>(task: Task | BalanceTask | ImportTask, cancel?: AbortSignal, limitMs = timeoutMs, transferList?: TransferListItem[]): Promise<T> {
    const p = getPool();
    if (p.queueSize >= maxQueue) {
      throw new AppError(503, 'unavailable', 'The server is busy with other large studies; try again in a moment.', { retryAfterSeconds: 5 });
    }
    try {
      const signal = cancel ? AbortSignal.any([AbortSignal.timeout(limitMs), cancel]) : AbortSignal.timeout(limitMs);
      return (await p.run(task, { signal, ...(transferList ? { transferList } : {}) })) as T;
    } catch (err) {
      if (cancel?.aborted) throw new AppError(503, 'unavailable', 'The balancing was cancelled.');
      if (err instanceof Error && (err.name === 'AbortError' || /aborted/i.test(err.message))) {
        throw new AppError(
          503,
          'unavailable',
          `This study took longer than ${Math.round(limitMs / 1000)} s to ${task.kind === 'report' ? 'lay out as a report' : 'check and solve'}, so it was stopped. Split it into smaller studies, or try again when the server is less busy.`,
          { retryAfterSeconds: 30 },
        );
      }
      throw err;
    }
  }

  return {
    async prepare(circuit) {
      if (elementCount(circuit) < INLINE_ELEMENTS) return prepare(circuit);
      return run<Prepared>({ kind: 'prepare', circuit });
    },
    async readStudyFile(body) {
      if (body === undefined || body.length < INLINE_FILE_CHARS) return readStudyFile(body);
      if (typeof body === 'string') return run<StudyFileReading>({ kind: 'import', body });
      // Moved, not cloned: a view of part of a larger buffer is first copied into one of its own.
      const own = body.byteOffset === 0 && body.byteLength === body.buffer.byteLength && body.buffer instanceof ArrayBuffer ? body : new Uint8Array(body);
      return run<StudyFileReading>({ kind: 'import', body: own }, undefined, timeoutMs, [own.buffer as ArrayBuffer]);
    },
    async balance(task, signal, onProgress) {
      if (!onProgress) return run<BalanceOutcome>(task, signal);
      const channel = new MessageChannel();
      channel.port1.on('message', (m: BalanceProgressMessage) => onProgress(m));
      try {
        return await run<BalanceOutcome>({ ...task, progress: channel.port2 }, signal, timeoutMs, [channel.port2]);
      } finally {
        channel.port1.close();
      }
    },
    async diff(from, to) {
      const size = Math.max(elementCount((from.content as { circuit?: unknown }).circuit), elementCount((to.content as { circuit?: unknown }).circuit));
      if (size < INLINE_ELEMENTS) return runTask({ kind: 'diff', from, to }) as RevisionDiff;
      return run<RevisionDiff>({ kind: 'diff', from, to });
    },
    async report(input) {
      // A report lays out pages and embeds fonts besides solving: only the smallest studies run inline.
      // pdfmake is loaded here on the first inline report, not when the server starts (tasks.ts).
      if (elementCount(input.content.circuit) < INLINE_ELEMENTS) return (await import('../report/pdf.ts')).renderReportPdf(input);
      // A report lays out dozens of pages besides solving: three times the time limit of a check.
      return run<Uint8Array>({ kind: 'report', input }, undefined, timeoutMs * 3);
    },
    async csv(input) {
      if (elementCount(input.content.circuit) < INLINE_ELEMENTS) return runTask({ kind: 'csv', input }) as Awaited<ReturnType<WorkPool['csv']>>;
      return run({ kind: 'csv', input });
    },
    sweepOutputs(circuit) {
      return run<SweepOutputsAnswer>({ kind: 'sweep-outputs', circuit });
    },
    sweep(circuit, paths, points, outputs) {
      return run<SweepPointRow[]>({ kind: 'sweep', circuit, paths, points, outputs });
    },
    async close() {
      const p = pool;
      pool = null;
      await p?.destroy();
    },
  };
}
