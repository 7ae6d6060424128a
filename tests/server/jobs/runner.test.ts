/**
 * Background jobs from the shared jobs table: each job runs once however many runners (app
 * instances) poll the same database; a failing job is retried with back-off and ends `failed`
 * after its last attempt without stopping the others; a claim whose instance died is taken over
 * once its lease ends; a long job extends its lease while it holds the claim and learns when it
 * lost it; a job given back on shutdown is due again at once without counting the attempt.
 */
import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { closeDb, type Db } from '../../../server/db/index.ts';
import { jobs } from '../../../server/db/schema.ts';
import { createJobRunner } from '../../../server/jobs/index.ts';
import { backoffMs, claim, enqueue, extendLease, release } from '../../../server/jobs/queue.ts';
import { openTestDb } from '../test-db.ts';

let db: Db;

beforeAll(async () => {
  db = await openTestDb();
});

afterAll(async () => {
  await closeDb(db);
});

beforeEach(async () => {
  await db.delete(jobs);
});

/** Seconds from the database's now until the job's `run_at` (the queue counts time by the database clock). */
async function secondsUntil(id: string): Promise<number> {
  const [{ s }] = await db.select({ s: sql<string>`extract(epoch from ${jobs.runAt} - now())` }).from(jobs).where(eq(jobs.id, id));
  return Number(s);
}

describe('the jobs queue', () => {
  it('runs every job exactly once when two runners share the database', async () => {
    const ran: string[] = [];
    const runners = ['one', 'two'].map((name) => {
      const r = createJobRunner(db);
      r.handle('count', async (payload) => {
        ran.push(`${(payload as { n: number }).n}`);
        await new Promise((res) => setImmediate(res)); // let the other runner ask in between
      });
      return { name, r };
    });
    for (let n = 0; n < 30; n++) await enqueue(db, 'count', { n });
    await Promise.all(runners.map(({ r }) => r.drain()));
    expect(ran.toSorted((a, b) => Number(a) - Number(b))).toEqual(Array.from({ length: 30 }, (_, n) => `${n}`));
    expect(await db.select().from(jobs)).toEqual([]);
    for (const { r } of runners) await r.close();
  });

  it('claims only kinds it has a handler for, and one claim at a time per job', async () => {
    await enqueue(db, 'sweep', {});
    expect(await claim(db, ['mail.deliver'], 60_000)).toBeNull();
    const first = await claim(db, ['sweep'], 60_000);
    expect(first).toMatchObject({ kind: 'sweep', status: 'running', attempts: 1 });
    expect(await claim(db, ['sweep'], 60_000)).toBeNull(); // held by the first claim's lease
  });

  it('takes over a job whose instance died once its lease has ended', async () => {
    const id = await enqueue(db, 'sweep', { study: 'MILL' });
    const held = await claim(db, ['sweep'], 60_000);
    expect(held?.id).toBe(id);
    // The instance holding it is gone; its lease ends (moved to the past rather than waited for).
    await db.update(jobs).set({ lockedUntil: sql`now() - interval '1 second'` }).where(eq(jobs.id, id));
    const ran: unknown[] = [];
    const r = createJobRunner(db);
    r.handle('sweep', async (payload) => {
      ran.push(payload);
    });
    await r.drain();
    expect(ran).toEqual([{ study: 'MILL' }]);
    expect(await db.select().from(jobs)).toEqual([]);
    await r.close();
  });

  it('retries a failing job with growing back-off, ends it failed after its last attempt, and keeps running the others', async () => {
    const warnings: string[] = [];
    const original = console.error;
    console.error = (line: unknown) => warnings.push(String(line));
    const r = createJobRunner(db, { backoffBaseMs: 30_000, backoffMaxMs: 600_000 });
    const done: number[] = [];
    r.handle('flaky', async () => {
      throw new Error('the SMTP server said no');
    });
    r.handle('fine', async (payload) => {
      done.push((payload as { n: number }).n);
    });
    try {
      const [id] = await db.insert(jobs).values({ kind: 'flaky', payload: {}, maxAttempts: 3 }).returning({ id: jobs.id }).then((rows) => rows.map((x) => x.id));
      await enqueue(db, 'fine', { n: 1 });
      await r.drain();
      expect(done).toEqual([1]);
      let [job] = await db.select().from(jobs).where(eq(jobs.id, id));
      expect(job).toMatchObject({ status: 'queued', attempts: 1, lastError: 'Error: the SMTP server said no' });
      const first = await secondsUntil(id);
      expect(first).toBeGreaterThan(25); // 30 s after the first failure
      expect(first).toBeLessThanOrEqual(30);

      // Time passes (the wait is moved to now rather than waited for): the second attempt fails too.
      await db.update(jobs).set({ runAt: sql`now()` }).where(eq(jobs.id, id));
      await r.drain();
      [job] = await db.select().from(jobs).where(eq(jobs.id, id));
      expect(job).toMatchObject({ status: 'queued', attempts: 2 });
      expect(await secondsUntil(id)).toBeGreaterThan(55); // 60 s: doubled

      await db.update(jobs).set({ runAt: sql`now()` }).where(eq(jobs.id, id));
      await enqueue(db, 'fine', { n: 2 });
      await r.drain();
      [job] = await db.select().from(jobs).where(eq(jobs.id, id));
      expect(job).toMatchObject({ status: 'failed', attempts: 3, lastError: 'Error: the SMTP server said no' });
      expect(done).toEqual([1, 2]);
      expect(warnings.filter((w) => w.includes('"job-failed"'))).toHaveLength(3);
      expect(warnings.at(-1)).toContain('"outcome":"failed"');
      expect(warnings.join('\n')).not.toContain('said no'); // the log names the error, never its text
    } finally {
      console.error = original;
      await r.close();
    }
  });

  it('a long job extends its lease while it holds the claim, and learns when another instance took it over', async () => {
    const id = await enqueue(db, 'sweep', {});
    const held = (await claim(db, ['sweep'], 1_000))!;
    expect(await extendLease(db, held, 600_000)).toBe(true);
    const [{ s }] = await db.select({ s: sql<string>`extract(epoch from ${jobs.lockedUntil} - now())` }).from(jobs).where(eq(jobs.id, id));
    expect(Number(s)).toBeGreaterThan(500); // about 600 s from now
    await db.update(jobs).set({ lockedUntil: sql`now() - interval '1 second'` }).where(eq(jobs.id, id));
    const taken = await claim(db, ['sweep'], 60_000);
    expect(taken).toMatchObject({ id, attempts: 2 });
    expect(await extendLease(db, held, 600_000)).toBe(false); // the first holder stops
    expect(await extendLease(db, taken!, 600_000)).toBe(true);
  });

  it('a job its handler gives back (shutting down) is due again at once, its attempt not counted', async () => {
    const id = await enqueue(db, 'sweep', { n: 7 });
    const r = createJobRunner(db);
    r.handle('sweep', async (_payload, job) => {
      await release(db, job);
      return 'released';
    });
    await r.drain();
    await r.close();
    const [job] = await db.select().from(jobs).where(eq(jobs.id, id));
    expect(job).toMatchObject({ status: 'queued', attempts: 0, lockedUntil: null });
    expect(await secondsUntil(id)).toBeLessThanOrEqual(0);
    const again = createJobRunner(db);
    const ran: unknown[] = [];
    again.handle('sweep', async (payload) => {
      ran.push(payload);
    });
    await again.drain();
    await again.close();
    expect(ran).toEqual([{ n: 7 }]);
    expect(await db.select().from(jobs)).toEqual([]);
  });

  it('back-off doubles from its base up to its ceiling', () => {
    // 5 s, 10 s, 20 s … capped at 15 min (P: exponential back-off).
    expect([1, 2, 3, 4].map((a) => backoffMs(a, 5_000, 900_000))).toEqual([5_000, 10_000, 20_000, 40_000]);
    expect(backoffMs(20, 5_000, 900_000)).toBe(900_000);
  });
});
