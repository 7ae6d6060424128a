/**
 * Server sweep jobs: a sweep of one or two parameters on a study's latest revision (or one of its
 * cases), run batch by batch in the work pool's threads (never on the request thread; each batch
 * sized to take about 1.5 s at the pace of the last, so it stays inside the work time limit), with
 * progress, paged points and cancel. The request is checked here in words (an unknown case or
 * element, a value that is not a number, too many points → 400) before anything runs. Jobs live
 * in this process's memory with the revision they ran on (a restart forgets them); at most
 * MAX_RUNNING_SWEEPS run at once and the last MAX_KEPT_SWEEPS finished ones are kept.
 */
import { randomUUID } from 'node:crypto';
import type { Db } from '../db/index.ts';
import type { Actor } from '../auth/index.ts';
import { applyCase, BASE_CASE_ID, caseLabel, circuitCases, getPath, InvalidCircuitError, sweepPoints, type CircuitInput, type SweepPointRow } from '../../shared/engine/index.ts';
import { MAX_SERVER_SWEEP_POINTS, MAX_SWEEP_OUTPUTS, type CreateSweepRequest, type SweepJob } from '../../shared/api/sweeps.ts';
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { AppError, isUuid, notFound } from '../errors.ts';
import { logEvent } from '../log.ts';
import { work } from '../work/index.ts';
import { getStudy } from './studies.ts';

export const MAX_RUNNING_SWEEPS = 2;
export const MAX_KEPT_SWEEPS = 20;

interface Job {
  id: string;
  teamId: string;
  studyId: string;
  status: SweepJob['status'];
  revision: number | null;
  caseName: string | null;
  paths: string[];
  outputs: SweepJob['outputs'];
  points: number[][];
  rows: SweepPointRow[];
  error: string | null;
  startedAt: string;
  finishedAt: string | null;
}

const jobs = new Map<string, Job>();

const bad = (message: string) => new AppError(400, 'validation', message);

/** Wall time one batch should take in a thread: well inside the work time limit, even on a busy machine. */
const BATCH_TARGET_MS = 1500;

/** Points of the first batch: fewer on large studies; later batches are sized from the time the last one took. */
function firstBatch(circuit: CircuitInput): number {
  return Math.max(1, Math.min(200, Math.floor(10_000 / Math.max(1, circuit.elements.length))));
}

function view(job: Job, offset = 0, limit = 0): SweepJob {
  const end = Math.min(job.rows.length, offset + limit);
  const points = [];
  for (let i = offset; i < end; i++) points.push({ values: job.points[i], outputs: job.rows[i].outputs, ...(job.rows[i].error ? { error: job.rows[i].error } : {}) });
  return {
    id: job.id,
    status: job.status,
    revision: job.revision,
    caseName: job.caseName,
    parameters: job.paths,
    outputs: job.outputs,
    total: job.points.length,
    done: job.rows.length,
    error: job.error,
    startedAt: job.startedAt,
    finishedAt: job.finishedAt,
    offset,
    points,
    caution: SAFETY_CAUTION,
  };
}

/** Forgets the oldest finished jobs beyond MAX_KEPT_SWEEPS. */
function prune() {
  const finished = [...jobs.values()].filter((j) => j.status !== 'running');
  for (const j of finished.slice(0, Math.max(0, finished.length - MAX_KEPT_SWEEPS))) jobs.delete(j.id);
}

async function runJob(job: Job, circuit: CircuitInput, keys: string[] | undefined): Promise<void> {
  try {
    const answer = await work().sweepOutputs(circuit);
    if (!answer.ok) throw bad(`The circuit does not solve, so nothing can be swept: ${answer.message}`);
    let outs = answer.outputs;
    if (keys) {
      const unknown = keys.filter((k) => !outs.some((o) => o.key === k));
      if (unknown.length) throw bad(`No output "${unknown[0]}" in this circuit; outputs are written load:<load>:<branch>, bus:<bus>:<phase>, shift:<bus> or unbalance:<bus>.`);
      outs = keys.map((k) => outs.find((o) => o.key === k)!);
    } else outs = outs.slice(0, MAX_SWEEP_OUTPUTS);
    job.outputs = outs.map(({ key, label, unit }) => ({ key, label, unit }));
    const specs = outs.map((o) => o.spec);
    let size = firstBatch(circuit);
    for (let start = 0; start < job.points.length; start += size) {
      if (job.status !== 'running') return;
      const t0 = performance.now();
      const rows = await work().sweep(circuit, job.paths, job.points.slice(start, start + size), specs);
      if (job.status !== 'running') return;
      job.rows.push(...rows);
      // the next batch sized to take about BATCH_TARGET_MS at the pace of this one (at most doubling)
      size = Math.max(1, Math.min(2 * size, 5000, Math.round((size * BATCH_TARGET_MS) / Math.max(1, performance.now() - t0))));
    }
    job.status = 'done';
  } catch (err) {
    if (job.status !== 'running') return;
    job.status = 'failed';
    job.error = err instanceof AppError ? err.message : 'The sweep stopped unexpectedly; try again, or with fewer points.';
    if (!(err instanceof AppError)) logEvent('error', { event: 'sweep-failed', name: err instanceof Error ? err.name : 'unknown' });
  } finally {
    if (job.finishedAt === null) job.finishedAt = new Date().toISOString();
    prune();
  }
}

/** Checks the request against the study's latest revision and starts the job (202 with its first state). */
export async function startSweep(db: Db, actor: Actor, studyId: string, body: CreateSweepRequest): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  const stored = study.content.circuit as CircuitInput;
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
  let points: number[][];
  try {
    for (const p of body.parameters) {
      const v = getPath(circuit, p.path);
      if (v !== undefined && typeof v !== 'number') throw new InvalidCircuitError(`parameter "${p.path}": the value there is not a number (name a numeric part of it)`, [{ path: 'parameter', message: 'not a number' }]);
    }
    points = sweepPoints(body.parameters.map((p) => ({ from: p.from, to: p.to, steps: p.points, scale: p.scale })));
  } catch (err) {
    if (err instanceof InvalidCircuitError) throw bad(names.text(err.message));
    throw err;
  }
  if ([...jobs.values()].filter((j) => j.status === 'running').length >= MAX_RUNNING_SWEEPS) {
    throw new AppError(503, 'unavailable', `${MAX_RUNNING_SWEEPS} sweeps are already running on the server; try again when one has finished.`, { retryAfterSeconds: 30 });
  }
  const job: Job = {
    id: randomUUID(),
    teamId: actor.teamId,
    studyId: study.id,
    status: 'running',
    revision: study.revision ?? null,
    caseName,
    paths: body.parameters.map((p) => p.path),
    outputs: [],
    points,
    rows: [],
    error: null,
    startedAt: new Date().toISOString(),
    finishedAt: null,
  };
  jobs.set(job.id, job);
  void runJob(job, circuit, body.outputs);
  return view(job);
}

function findJob(actor: Actor, studyId: string, jobId: string): Job {
  const job = isUuid(jobId) ? jobs.get(jobId) : undefined;
  if (!job || job.teamId !== actor.teamId || job.studyId !== studyId) throw notFound('Sweep');
  return job;
}

/** A job's state and its solved points from `offset` (at most `limit`). */
export async function getSweep(db: Db, actor: Actor, studyId: string, jobId: string, q: { offset: number; limit: number }): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  return view(findJob(actor, study.id, jobId), q.offset, q.limit);
}

/** Cancels a running job (the batch in a thread finishes and is dropped); a finished job is returned as it is. */
export async function cancelSweep(db: Db, actor: Actor, studyId: string, jobId: string): Promise<SweepJob> {
  const study = await getStudy(db, actor, studyId);
  const job = findJob(actor, study.id, jobId);
  if (job.status === 'running') {
    job.status = 'cancelled';
    job.finishedAt = new Date().toISOString();
  }
  return view(job);
}
