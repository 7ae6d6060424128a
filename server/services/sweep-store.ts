/**
 * Server sweep jobs in the database: a `sweep_jobs` row per sweep (what it sweeps, on which study
 * revision, its state) and its solved points in `sweep_chunks`, consecutive points per row as jsonb
 * (outputs only: a point's parameter values follow from the parameters asked, so they are derived,
 * never stored). Any instance reads a job from here; the one running it writes here.
 */
import { and, asc, desc, eq, gt, inArray, lt, notInArray, sql } from 'drizzle-orm';
import type { Db } from '../db/index.ts';
import { sweepChunks, sweepJobs } from '../db/schema.ts';
import { sweepValues, type SweepOutputSpec, type SweepPointRow } from '../../shared/engine/index.ts';
import type { SweepJob } from '../../shared/api/sweeps.ts';
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';

/** Kind of the jobs-table row that runs a sweep. */
export const SWEEP_JOB = 'sweep.run';
/** Finished sweeps kept per study (older ones are removed with their points). */
export const MAX_KEPT_SWEEPS = 20;
/** Most points one stored chunk holds (a page of points reads one or a few chunks). */
export const CHUNK_POINTS = 1000;

export type SweepRow = typeof sweepJobs.$inferSelect;
/** A sweep parameter as asked (`parameters` column). */
export interface StoredParameter {
  path: string;
  from: number;
  to: number;
  points: number;
  scale: 'linear' | 'log';
}
/** An output as stored (`outputs` column): what the API shows, and the spec the solver reads. */
export interface StoredOutput {
  key: string;
  label: string;
  unit: string;
  spec: SweepOutputSpec;
}

/** Statuses of a sweep that is not finished. */
export const UNFINISHED: ('queued' | 'running')[] = ['queued', 'running'];

/** The values of each parameter over its range (linear or log), in the engine's order. */
export function parameterValues(params: readonly StoredParameter[]): number[][] {
  return params.map((p) => sweepValues({ from: p.from, to: p.to, steps: p.points, scale: p.scale }));
}

/** The parameter values of point `i` (the first parameter varies slowest, as in the engine's sweepPoints). */
export function pointValues(lists: readonly number[][], i: number): number[] {
  if (lists.length === 1) return [lists[0][i]];
  const n = lists[1].length;
  return [lists[0][Math.floor(i / n)], lists[1][i % n]];
}

/** Points `start` … `start + count − 1` of a sweep. */
export function pointRange(lists: readonly number[][], start: number, count: number): number[][] {
  const out: number[][] = [];
  for (let i = start; i < start + count; i++) out.push(pointValues(lists, i));
  return out;
}

/** Solved points from `start` as chunk rows (at most CHUNK_POINTS points each). */
export function toChunks(sweepId: string, start: number, rows: readonly SweepPointRow[]): (typeof sweepChunks.$inferInsert)[] {
  const chunks: (typeof sweepChunks.$inferInsert)[] = [];
  for (let at = 0; at < rows.length; at += CHUNK_POINTS) {
    const part = rows.slice(at, at + CHUNK_POINTS);
    const errors: Record<string, string> = {};
    part.forEach((r, k) => {
      if (r.error) errors[k] = r.error;
    });
    // JSON has no NaN or infinity: such a value is stored (and read) as null, as the API has always sent it.
    const values = part.map((r) => r.outputs.map((v) => (v === null || Number.isFinite(v) ? v : null)));
    chunks.push({ sweepId, start: start + at, count: part.length, rows: values, errors: Object.keys(errors).length ? errors : null });
  }
  return chunks;
}

/** The solved points `offset` … `offset + limit − 1` (those stored so far). */
export async function readPoints(db: Db, row: SweepRow, offset: number, limit: number): Promise<SweepJob['points']> {
  const end = Math.min(row.done, offset + limit);
  if (end <= offset) return [];
  const chunks = await db
    .select({ start: sweepChunks.start, count: sweepChunks.count, rows: sweepChunks.rows, errors: sweepChunks.errors })
    .from(sweepChunks)
    .where(and(eq(sweepChunks.sweepId, row.id), lt(sweepChunks.start, end), gt(sql`${sweepChunks.start} + ${sweepChunks.count}`, offset)))
    .orderBy(asc(sweepChunks.start));
  const lists = parameterValues(row.parameters as StoredParameter[]);
  const points: SweepJob['points'] = [];
  for (const c of chunks) {
    const rows = c.rows as (number | null)[][];
    const errors = (c.errors ?? {}) as Record<string, string>;
    for (let k = Math.max(0, offset - c.start); k < c.count && c.start + k < end; k++) {
      const error = errors[k];
      points.push({ values: pointValues(lists, c.start + k), outputs: rows[k], ...(error ? { error } : {}) });
    }
  }
  return points;
}

/** The API's view of a sweep: its state, and its solved points from `offset` (at most `limit`). */
export async function sweepView(db: Db, row: SweepRow, offset = 0, limit = 0): Promise<SweepJob> {
  return {
    id: row.id,
    // A queued sweep is one the server has taken on: to the people waiting for it, it is running.
    status: row.status === 'queued' ? 'running' : row.status,
    revision: row.revision,
    caseName: row.caseName,
    parameters: (row.parameters as StoredParameter[]).map((p) => p.path),
    outputs: (row.outputs as StoredOutput[]).map(({ key, label, unit }) => ({ key, label, unit })),
    total: row.total,
    done: row.done,
    error: row.error,
    startedAt: row.createdAt.toISOString(),
    finishedAt: row.finishedAt ? row.finishedAt.toISOString() : null,
    offset,
    points: await readPoints(db, row, offset, limit),
    caution: SAFETY_CAUTION,
  };
}

/** Removes a study's finished sweeps beyond the newest MAX_KEPT_SWEEPS (their chunks go with them). */
export async function pruneFinished(db: Db, studyId: string): Promise<void> {
  const keep = db
    .select({ id: sweepJobs.id })
    .from(sweepJobs)
    .where(and(eq(sweepJobs.studyId, studyId), notInArray(sweepJobs.status, UNFINISHED)))
    .orderBy(desc(sweepJobs.finishedAt), desc(sweepJobs.createdAt))
    .limit(MAX_KEPT_SWEEPS);
  await db.delete(sweepJobs).where(and(eq(sweepJobs.studyId, studyId), notInArray(sweepJobs.status, UNFINISHED), notInArray(sweepJobs.id, keep)));
}

/** Marks an unfinished sweep finished with `status` (and why, for `failed`); false when it was finished already. */
export async function finishSweep(db: Db, id: string, status: 'done' | 'failed', error: string | null = null): Promise<boolean> {
  const rows = await db
    .update(sweepJobs)
    .set({ status, error, finishedAt: sql`now()`, updatedAt: sql`now()` })
    .where(and(eq(sweepJobs.id, id), inArray(sweepJobs.status, UNFINISHED)))
    .returning({ studyId: sweepJobs.studyId });
  if (rows.length) await pruneFinished(db, rows[0].studyId);
  return rows.length > 0;
}

/** Cancels a study's unfinished sweeps (the study is being deleted); the instances running them stop at their next batch. */
export async function cancelStudySweeps(db: Pick<Db, 'update'>, studyId: string): Promise<void> {
  await db
    .update(sweepJobs)
    .set({ status: 'cancelled', finishedAt: sql`now()`, updatedAt: sql`now()` })
    .where(and(eq(sweepJobs.studyId, studyId), inArray(sweepJobs.status, UNFINISHED)));
}
