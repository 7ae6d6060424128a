/**
 * Server sweep jobs, as the API sees them: a sweep of one or two parameters on a study's latest
 * revision (or one of its cases). The request is checked here in words (an unknown case, element or
 * output, a value that is not a number, a circuit that does not solve, too many points → 400) before
 * anything is queued; then the sweep is a row of `sweep_jobs` and a `sweep.run` job of the jobs
 * table (sweep-run.ts runs it on exactly one instance), its points stored in the database with the
 * revision it runs on (sweep-store.ts). Any instance answers GET and DELETE from the database.
 *
 * Limits, counted in the database: a team has at most MAX_RUNNING_SWEEPS unfinished sweeps (its
 * row is locked while one is added, so two instances cannot both take the last place), the whole
 * server at most MAX_ACTIVE_SWEEPS; each study keeps its last MAX_KEPT_SWEEPS finished ones.
 */
import { and, count, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../db/index.ts';
import { sweepJobs, teams } from '../db/schema.ts';
import type { Actor } from '../auth/index.ts';
import { applyCase, BASE_CASE_ID, caseLabel, circuitCases, getPath, InvalidCircuitError, sweepValues, type CircuitInput } from '../../shared/engine/index.ts';
import { MAX_SERVER_SWEEP_POINTS, MAX_SWEEP_OUTPUTS, type CreateSweepRequest, type SweepJob } from '../../shared/api/sweeps.ts';
import type { StudyContent } from '../../shared/api/studies.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { AppError, isUuid, notFound } from '../errors.ts';
import { enqueue } from '../jobs/queue.ts';
import { work } from '../work/index.ts';
import { ensureRevision } from './revisions.ts';
import { getStudy } from './studies.ts';
import { SWEEP_MAX_ATTEMPTS } from './sweep-run.ts';
import { pruneFinished, sweepView, SWEEP_JOB, UNFINISHED, type StoredOutput, type StoredParameter } from './sweep-store.ts';

export { MAX_KEPT_SWEEPS } from './sweep-store.ts';
/** Unfinished (queued or running) sweeps one team may have. */
export const MAX_RUNNING_SWEEPS = 2;
/** Unfinished sweeps on the whole server (every team). */
export const MAX_ACTIVE_SWEEPS = 8;

const bad = (message: string) => new AppError(400, 'validation', message);

/** Checks the request against the study's latest revision and queues the job (202 with its first state). */
export async function startSweep(db: Db, actor: Actor, studyId: string, body: CreateSweepRequest): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  const revision = await ensureRevision(db, { id: study.id, teamId: actor.teamId, content: study.content, updatedBy: actor.userId });
  const stored = (revision.content as StudyContent).circuit as CircuitInput;
  const names = circuitNames(stored);
  let circuit: CircuitInput;
  let caseName: string | null = null;
  try {
    circuit = applyCase(stored, body.case ?? BASE_CASE_ID);
    if (body.case) caseName = caseLabel(circuitCases(stored).find((c) => c.id === body.case)!).replace(/^case "(.*)"$/, '$1');
  } catch (err) {
    if (err instanceof InvalidCircuitError) throw bad(names.text(err.message));
    throw err;
  }
  const total = body.parameters.reduce((n, p) => n * p.points, 1);
  if (total > MAX_SERVER_SWEEP_POINTS) throw bad(`A sweep of ${total.toLocaleString('en')} points is more than the ${MAX_SERVER_SWEEP_POINTS.toLocaleString('en')} a server sweep runs; use fewer points.`);
  const parameters: StoredParameter[] = body.parameters.map((p) => ({ path: p.path, from: p.from, to: p.to, points: p.points, scale: p.scale }));
  try {
    for (const p of parameters) {
      const v = getPath(circuit, p.path);
      if (v !== undefined && typeof v !== 'number') throw new InvalidCircuitError(`parameter "${p.path}": the value there is not a number (name a numeric part of it)`, [{ path: 'parameter', message: 'not a number' }]);
      sweepValues({ from: p.from, to: p.to, steps: p.points, scale: p.scale });
    }
  } catch (err) {
    if (err instanceof InvalidCircuitError) throw bad(names.text(err.message));
    throw err;
  }
  // What the points record: from a solve of the circuit, in a work thread (never on the request thread).
  const answer = await work().sweepOutputs(circuit);
  if (!answer.ok) throw bad(`The circuit does not solve, so nothing can be swept: ${answer.message}`);
  let outputs: StoredOutput[] = answer.outputs;
  if (body.outputs) {
    const unknown = body.outputs.filter((k) => !outputs.some((o) => o.key === k));
    if (unknown.length) throw bad(`No output "${unknown[0]}" in this circuit; outputs are written load:<load>:<branch>, bus:<bus>:<phase>, shift:<bus> or unbalance:<bus>.`);
    outputs = body.outputs.map((k) => outputs.find((o) => o.key === k)!);
  } else outputs = outputs.slice(0, MAX_SWEEP_OUTPUTS);

  const row = await db.transaction(async (tx) => {
    // The team's row, locked until commit: instances adding a sweep for one team take turns, so the count below holds.
    await tx.select({ id: teams.id }).from(teams).where(eq(teams.id, actor.teamId)).for('no key update');
    const [mine] = await tx.select({ n: count() }).from(sweepJobs).where(and(eq(sweepJobs.teamId, actor.teamId), inArray(sweepJobs.status, UNFINISHED)));
    if (mine.n >= MAX_RUNNING_SWEEPS) {
      throw new AppError(503, 'unavailable', `Your team already has ${MAX_RUNNING_SWEEPS} sweeps running on the server; try again when one has finished, or cancel one.`, { retryAfterSeconds: 30 });
    }
    const [all] = await tx.select({ n: count() }).from(sweepJobs).where(inArray(sweepJobs.status, UNFINISHED));
    if (all.n >= MAX_ACTIVE_SWEEPS) {
      throw new AppError(503, 'unavailable', `The server already has ${MAX_ACTIVE_SWEEPS} sweeps to run; try again in a few minutes.`, { retryAfterSeconds: 60 });
    }
    const [made] = await tx
      .insert(sweepJobs)
      .values({
        teamId: actor.teamId,
        studyId: study.id,
        revisionId: revision.id,
        revision: revision.number,
        caseId: body.case ?? null,
        caseName,
        parameters,
        outputs,
        total,
        createdBy: actor.userId,
      })
      .returning();
    await enqueue(tx, SWEEP_JOB, { sweepId: made.id }, { maxAttempts: SWEEP_MAX_ATTEMPTS });
    return made;
  });
  return sweepView(db, row);
}

async function findJob(db: Db, actor: Actor, studyId: string, jobId: string) {
  if (!isUuid(jobId)) throw notFound('Sweep');
  const [row] = await db
    .select()
    .from(sweepJobs)
    .where(and(eq(sweepJobs.id, jobId), eq(sweepJobs.teamId, actor.teamId), eq(sweepJobs.studyId, studyId)));
  if (!row) throw notFound('Sweep');
  return row;
}

/** A job's state and its solved points from `offset` (at most `limit`). */
export async function getSweep(db: Db, actor: Actor, studyId: string, jobId: string, q: { offset: number; limit: number }): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  return sweepView(db, await findJob(db, actor, study.id, jobId), q.offset, q.limit);
}

/**
 * Cancels an unfinished job: its row says so at once, and the instance running it notices before
 * storing its next batch (which is dropped). A finished job is returned as it is.
 */
export async function cancelSweep(db: Db, actor: Actor, studyId: string, jobId: string): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  const job = await findJob(db, actor, study.id, jobId);
  const [cancelled] = await db
    .update(sweepJobs)
    .set({ status: 'cancelled', finishedAt: sql`now()`, updatedAt: sql`now()` })
    .where(and(eq(sweepJobs.id, job.id), inArray(sweepJobs.status, UNFINISHED)))
    .returning();
  if (!cancelled) return sweepView(db, await findJob(db, actor, study.id, jobId));
  await pruneFinished(db, study.id);
  return sweepView(db, cancelled);
}
