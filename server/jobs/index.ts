/**
 * Background jobs run by every app instance from the shared jobs table (queue.ts): each instance
 * polls for due jobs (JOBS_POLL_MS) and is woken at once when it queues one itself; one job at a
 * time per instance. A handler that throws is retried with back-off; nothing a job does can stop
 * the server (errors are logged, the loop goes on).
 *
 * The table and `FOR UPDATE SKIP LOCKED` are used rather than pg-boss or graphile-worker: both of
 * those need a PostgreSQL server of their own (connection strings, LISTEN/NOTIFY, advisory locks
 * on many connections) and would not run on the embedded single-connection PGlite, whereas one
 * table through Drizzle runs the same on both.
 */
import type { Db } from '../db/index.ts';
import { logEvent } from '../log.ts';
import { backoffMs, claim, complete, enqueue, fail, type Job } from './queue.ts';

/** Runs one job; resolving `'released'` means the handler gave the job back to the queue (queue.ts release) rather than finishing it. */
export type JobHandler = (payload: unknown, job: Job) => Promise<void | 'released'>;

export interface JobRunnerOptions {
  /** How often an idle instance looks for due jobs queued by others (ms). */
  pollMs?: number;
  /** How long a claim holds a job before another instance may take it over (ms). */
  leaseMs?: number;
  /** First back-off after a failure (ms); it doubles with each attempt. */
  backoffBaseMs?: number;
  /** Longest back-off (ms). */
  backoffMaxMs?: number;
}

export interface JobRunner {
  /** Registers what runs jobs of `kind` (before start). */
  handle(kind: string, handler: JobHandler): void;
  /** Queues a job and wakes this instance's loop. */
  add(kind: string, payload: unknown): Promise<string>;
  /** Queues a job inside a transaction (call wake() after it commits). */
  enqueueIn(tx: Pick<Db, 'insert'>, kind: string, payload: unknown): Promise<string>;
  /** Looks for due jobs now (after queueing one in a transaction of one's own). */
  wake(): void;
  /** Runs due jobs until none is left; resolves when done (tests, shutdown). */
  drain(): Promise<void>;
  /** Starts polling. */
  start(): void;
  /** Stops polling and waits for the job in hand. */
  close(): Promise<void>;
}

export function createJobRunner(db: Db, { pollMs = 1_000, leaseMs = 5 * 60_000, backoffBaseMs = 5_000, backoffMaxMs = 15 * 60_000 }: JobRunnerOptions = {}): JobRunner {
  const handlers = new Map<string, JobHandler>();
  let timer: NodeJS.Timeout | null = null;
  let closed = false;
  let current: Promise<void> | null = null;
  let again = false;

  /** Runs one claimed job; true when its handler gave it back (its instance is stopping: claim no more). */
  async function runOne(job: Job): Promise<boolean> {
    try {
      if ((await handlers.get(job.kind)!(job.payload, job)) === 'released') return true;
      await complete(db, job);
    } catch (err) {
      const error = err instanceof Error ? `${err.name}: ${err.message}` : String(err);
      const outcome = await fail(db, job, error.slice(0, 500), backoffMs(job.attempts, backoffBaseMs, backoffMaxMs));
      logEvent('warn', { event: 'job-failed', kind: job.kind, jobId: job.id, attempt: job.attempts, of: job.maxAttempts, outcome, error: err instanceof Error ? err.name : typeof err });
    }
    return false;
  }

  async function loop(): Promise<void> {
    do {
      again = false;
      for (;;) {
        if (closed) return;
        const job = await claim(db, [...handlers.keys()], leaseMs);
        if (!job) break;
        if (await runOne(job)) return;
      }
    } while (again && !closed);
  }

  function drain(): Promise<void> {
    if (current) {
      again = true;
      return current;
    }
    current = loop()
      .catch((err: unknown) => {
        // The database is unreachable or closing: try again at the next poll.
        logEvent('warn', { event: 'jobs-poll-failed', error: err instanceof Error ? err.name : typeof err });
      })
      .finally(() => {
        current = null;
      });
    return current;
  }

  return {
    handle(kind, handler) {
      handlers.set(kind, handler);
    },
    async add(kind, payload) {
      const id = await enqueue(db, kind, payload);
      void drain();
      return id;
    },
    enqueueIn: (tx, kind, payload) => enqueue(tx, kind, payload),
    wake() {
      if (!closed) void drain();
    },
    drain,
    start() {
      if (timer || closed) return;
      timer = setInterval(() => void drain(), pollMs);
      timer.unref();
      void drain();
    },
    async close() {
      closed = true;
      if (timer) clearInterval(timer);
      timer = null;
      await current;
    },
  };
}
