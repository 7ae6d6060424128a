/**
 * Running server sweep jobs. A sweep is a `sweep.run` row of the jobs table (server/jobs), so
 * exactly one instance holds it at a time: that instance solves it batch by batch in its work
 * threads (never on the request thread; each batch sized to take about 1.5 s at the pace of the
 * last, well inside the work time limit) and stores each batch's points in one transaction that
 * also extends its lease and checks that the sweep is still running and still at the point it
 * started the batch from. So a cancel (any instance's DELETE sets the row `cancelled`) is noticed
 * at the next batch, whose points are dropped; a claim lost to another instance writes nothing
 * more; and an instance that died leaves the points it stored: once its lease ends another instance
 * claims the job and goes on from there. On shutdown the instance gives the job back to the queue
 * between batches, for another (or the next start) to go on with.
 *
 * Each instance runs one sweep at a time (a separate runner from mail delivery, so a long sweep
 * never holds up mail); further sweeps wait queued, in order.
 */
import { hostname } from 'node:os';
import { and, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/index.ts';
import { studyRevisions, sweepChunks, sweepJobs } from '../db/schema.ts';
import { applyCase, BASE_CASE_ID, type CircuitInput } from '../../shared/engine/index.ts';
import { createJobRunner, type JobRunner } from '../jobs/index.ts';
import { extendLease, release, type Job } from '../jobs/queue.ts';
import { AppError } from '../errors.ts';
import { logEvent } from '../log.ts';
import { work } from '../work/index.ts';
import { finishSweep, parameterValues, pointRange, SWEEP_JOB, toChunks, UNFINISHED, type StoredOutput, type StoredParameter } from './sweep-store.ts';

/** Wall time one batch should take in a thread: well inside the work time limit, even on a busy machine. */
const BATCH_TARGET_MS = 1500;
/** How long a claim on a sweep holds without news from its instance (each stored batch extends it). */
export const SWEEP_LEASE_MS = 60_000;
/** Attempts at a sweep that keeps failing for reasons other than its input (the work pool busy, the database away). */
export const SWEEP_MAX_ATTEMPTS = 3;
const STOPPED = 'The sweep stopped unexpectedly; try again, or with fewer points.';

/** Points of the first batch: fewer on large studies; later batches are sized from the time the last one took. */
function firstBatch(circuit: CircuitInput): number {
  return Math.max(1, Math.min(200, Math.floor(10_000 / Math.max(1, circuit.elements.length))));
}

export interface SweepRunOptions {
  /** Names this instance in the sweep's row (`runner`). */
  name: string;
  /** Lease of a claim, extended with every stored batch (ms). */
  leaseMs: number;
  /** True once this instance is shutting down: the job goes back to the queue before the next batch. */
  stopping: () => boolean;
}

/** Runs (or goes on with) the sweep of one claimed `sweep.run` job. */
export async function runSweep(db: Db, job: Job, { name, leaseMs, stopping }: SweepRunOptions): Promise<void | 'released'> {
  const sweepId = (job.payload as { sweepId?: unknown } | null)?.sweepId;
  if (typeof sweepId !== 'string') return;
  const [row] = await db
    .update(sweepJobs)
    .set({ status: 'running', claims: sql`${sweepJobs.claims} + 1`, runner: name, updatedAt: sql`now()` })
    .where(and(eq(sweepJobs.id, sweepId), inArray(sweepJobs.status, UNFINISHED)))
    .returning();
  if (!row) return; // cancelled before it started, or gone with its study
  try {
    const [rev] = await db.select({ content: studyRevisions.content }).from(studyRevisions).where(eq(studyRevisions.id, row.revisionId));
    if (!rev) return;
    const circuit = applyCase((rev.content as { circuit: CircuitInput }).circuit, row.caseId ?? BASE_CASE_ID);
    const params = row.parameters as StoredParameter[];
    const paths = params.map((p) => p.path);
    const specs = (row.outputs as StoredOutput[]).map((o) => o.spec);
    const lists = parameterValues(params);
    let size = firstBatch(circuit);
    for (let start = row.done; start < row.total; ) {
      if (stopping()) {
        await release(db, job);
        return 'released';
      }
      const t0 = performance.now();
      const rows = await work().sweep(circuit, paths, pointRange(lists, start, Math.min(size, row.total - start)), specs);
      const stored = await db.transaction(async (tx) => {
        if (!(await extendLease(tx, job, leaseMs))) return false;
        const moved = await tx
          .update(sweepJobs)
          .set({ done: start + rows.length, updatedAt: sql`now()` })
          .where(and(eq(sweepJobs.id, row.id), eq(sweepJobs.status, 'running'), eq(sweepJobs.done, start)))
          .returning({ id: sweepJobs.id });
        if (!moved.length) return false;
        await tx.insert(sweepChunks).values(toChunks(row.id, start, rows));
        return true;
      });
      if (!stored) return; // cancelled, or another instance holds it now
      start += rows.length;
      // the next batch sized to take about BATCH_TARGET_MS at the pace of this one (at most doubling)
      size = Math.max(1, Math.min(2 * size, 5000, Math.round((size * BATCH_TARGET_MS) / Math.max(1, performance.now() - t0))));
    }
    await finishSweep(db, row.id, 'done');
  } catch (err) {
    // Its input: stopped for good, in words. Anything else: tried again (from the points stored) until the last attempt.
    const input = err instanceof AppError && err.status < 500;
    if (!input && job.attempts < job.maxAttempts) throw err;
    await finishSweep(db, row.id, 'failed', err instanceof AppError ? err.message : STOPPED);
    if (!(err instanceof AppError)) logEvent('error', { event: 'sweep-failed', sweepId: row.id, name: err instanceof Error ? err.name : 'unknown' });
  }
}

export interface SweepRunnerOptions {
  /** How often an idle instance looks for queued sweeps (ms). */
  pollMs?: number;
  leaseMs?: number;
  /** Names this instance in a sweep's row (default: host and process id). */
  name?: string;
}

/** This instance's runner of sweep jobs: start() polls, wake() looks now, close() hands a sweep in progress back to the queue. */
export function createSweepRunner(db: Db, { pollMs, leaseMs = SWEEP_LEASE_MS, name = `${hostname()}:${process.pid}` }: SweepRunnerOptions = {}): JobRunner {
  let stopping = false;
  const runner = createJobRunner(db, { pollMs, leaseMs });
  runner.handle(SWEEP_JOB, (_payload, job) => runSweep(db, job, { name, leaseMs, stopping: () => stopping }));
  return {
    ...runner,
    async close() {
      stopping = true;
      await runner.close();
    },
  };
}
