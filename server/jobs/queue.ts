/**
 * The jobs table as a queue shared by every app instance on one database. A job is claimed by one
 * UPDATE over `SELECT … FOR UPDATE SKIP LOCKED`: two instances asking at once get different jobs
 * (or one gets none), on PostgreSQL and on PGlite alike. The claim takes a lease (`locked_until`,
 * database time): a job whose instance died while running it is claimed again once the lease ends.
 */
import { and, asc, eq, inArray, lte, or, sql } from 'drizzle-orm';
import type { Db } from '../db/index.ts';
import { jobs } from '../db/schema.ts';

export type Job = typeof jobs.$inferSelect;

/** Anything that runs queries: the database or a transaction on it. */
type Runner = Pick<Db, 'insert'>;

/** Queues a job of `kind`; returns its id. Pass a transaction to queue it with the change that causes it. */
export async function enqueue(db: Runner, kind: string, payload: unknown, { maxAttempts }: { maxAttempts?: number } = {}): Promise<string> {
  const [row] = await db
    .insert(jobs)
    .values({ kind, payload, ...(maxAttempts ? { maxAttempts } : {}) })
    .returning({ id: jobs.id });
  return row.id;
}

/** Claims the oldest due job of one of `kinds` for `leaseMs`, or returns null. */
export async function claim(db: Db, kinds: string[], leaseMs: number): Promise<Job | null> {
  if (kinds.length === 0) return null;
  const due = db
    .select({ id: jobs.id })
    .from(jobs)
    .where(
      and(
        inArray(jobs.kind, kinds),
        or(and(eq(jobs.status, 'queued'), lte(jobs.runAt, sql`now()`)), and(eq(jobs.status, 'running'), lte(jobs.lockedUntil, sql`now()`))),
      ),
    )
    .orderBy(asc(jobs.runAt))
    .limit(1)
    .for('update', { skipLocked: true });
  const [job] = await db
    .update(jobs)
    .set({ status: 'running', attempts: sql`${jobs.attempts} + 1`, lockedUntil: sql`now() + ${`${Math.ceil(leaseMs)} milliseconds`}::interval` })
    .where(inArray(jobs.id, due))
    .returning();
  return job ?? null;
}

/**
 * Extends the lease of a job in hand (long jobs call this as they go); false when the claim was
 * lost (the lease ended and another instance took the job over), so the caller stops. Pass a
 * transaction to make the job's own writes depend on still holding it.
 */
export async function extendLease(db: Pick<Db, 'update'>, job: Job, leaseMs: number): Promise<boolean> {
  const rows = await db
    .update(jobs)
    .set({ lockedUntil: sql`now() + ${`${Math.ceil(leaseMs)} milliseconds`}::interval` })
    .where(and(eq(jobs.id, job.id), eq(jobs.attempts, job.attempts), eq(jobs.status, 'running')))
    .returning({ id: jobs.id });
  return rows.length > 0;
}

/** Gives a job in hand back to the queue at once, not counting this attempt (its instance is shutting down). */
export async function release(db: Db, job: Job): Promise<void> {
  await db
    .update(jobs)
    .set({ status: 'queued', lockedUntil: null, runAt: sql`now()`, attempts: sql`${jobs.attempts} - 1` })
    .where(and(eq(jobs.id, job.id), eq(jobs.attempts, job.attempts), eq(jobs.status, 'running')));
}

/** A finished job leaves the table (only while this claim still holds it). */
export async function complete(db: Db, job: Job): Promise<void> {
  await db.delete(jobs).where(and(eq(jobs.id, job.id), eq(jobs.attempts, job.attempts)));
}

/** Back-off before attempt `attempts + 1`: base × 2^(attempts − 1), at most `maxMs`. */
export function backoffMs(attempts: number, baseMs: number, maxMs: number): number {
  return Math.min(maxMs, baseMs * 2 ** Math.max(0, attempts - 1));
}

/** A failed attempt: due again after the back-off, or `failed` for good after its last attempt. */
export async function fail(db: Db, job: Job, error: string, delayMs: number): Promise<'retry' | 'failed'> {
  const last = job.attempts >= job.maxAttempts;
  await db
    .update(jobs)
    .set(
      last
        ? { status: 'failed', lockedUntil: null, lastError: error }
        : { status: 'queued', lockedUntil: null, lastError: error, runAt: sql`now() + ${`${Math.ceil(delayMs)} milliseconds`}::interval` },
    )
    .where(and(eq(jobs.id, job.id), eq(jobs.attempts, job.attempts)));
  return last ? 'failed' : 'retry';
}
