/**
 * Server sweep jobs as database jobs (services/sweep-run.ts, sweep-store.ts): the limits are counted
 * in the database (unfinished sweeps per team and on the whole server, finished ones kept per
 * study); an instance shutting down gives its sweep back to the queue and one that died leaves it
 * to be taken over after its lease, and either way the next instance goes on from the points stored
 * (which stay as they were) to an answer equal to the engine's; a restarted app on the same
 * database still reads a finished sweep and its points.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { readConfig } from '../../server/config.ts';
import { closeDb, queryRows, type Db } from '../../server/db/index.ts';
import { claim } from '../../server/jobs/queue.ts';
import { prepareDatabase } from '../../server/runtime.ts';
import { createSweepRunner, runSweep } from '../../server/services/sweep-run.ts';
import { MAX_ACTIVE_SWEEPS, MAX_KEPT_SWEEPS, MAX_RUNNING_SWEEPS } from '../../server/services/sweeps.ts';
import { SWEEP_JOB } from '../../server/services/sweep-store.ts';
import type { SweepJob } from '../../shared/api/sweeps.ts';
import { demoCircuits, solveCircuit, sweepCircuit, sweepPoints, type CircuitInput } from '../../shared/engine/index.ts';
import { availableOutputs, outputValue } from '../../shared/review/sweep-outputs.ts';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { freshStoreEnv, openTestDb } from './test-db.ts';

const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
const quiet = () => {};

let db: Db;
let t: TestApp;
/** The same app with no sweep runner of its own: what it queues waits until a runner claims it. */
let idle: TestApp['app'];
const dirs: string[] = [];

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  idle = createApp({ db, config: t.config, mailer: t.mailer, objects: t.objects });
});

afterAll(async () => {
  await t.mailer.close();
  await closeDb(db);
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

/** A team with an engineer signed in on `app`, and a study of the demo circuit. */
async function teamWithStudy(app: TestApp['app'], name: string) {
  const team = await makeTeam(db, name);
  const engineer = await signedIn(app, (await makeUser(db, team, 'engineer')).email);
  const made = await engineer.post('/api/studies').send({ name: `${name} study`, content: { circuit } });
  expect(made.status, JSON.stringify(made.body)).toBe(201);
  return { engineer, studyId: made.body.id as string };
}

const sweepOf = (points: number) => ({ parameters: [{ path: 'KITCHEN.each.kw', from: 0.5, to: 6, points }], outputs: ['load:KITCHEN:an', 'shift:HOUSE'] });

/** Every point of a finished job equals the engine's solve of the circuit with the value written (C). */
function expectEngineAnswers(job: SweepJob, c: CircuitInput) {
  const specs = availableOutputs(solveCircuit(c));
  const expected = sweepPoints([{ from: 0.5, to: 6, steps: job.total }]);
  expect(job.points.map((p) => p.values)).toEqual(expected);
  for (const p of job.points) {
    const direct = solveCircuit(sweepCircuit(c, job.parameters, p.values));
    job.outputs.forEach((o, k) => expect(p.outputs[k]).toBeCloseTo(outputValue(direct, specs.find((s) => s.key === o.key)!.spec)!, 9));
  }
}

describe('limits counted in the database', () => {
  it(`a team has at most ${MAX_RUNNING_SWEEPS} unfinished sweeps and the server ${MAX_ACTIVE_SWEEPS}; refused in words with 503`, async () => {
    const teams = [];
    for (let k = 0; k < MAX_ACTIVE_SWEEPS / MAX_RUNNING_SWEEPS; k++) teams.push(await teamWithStudy(idle, `Limits ${k}`));
    const started: { agent: TestAgent; studyId: string; id: string }[] = [];
    for (const { engineer, studyId } of teams) {
      for (let n = 0; n < MAX_RUNNING_SWEEPS; n++) {
        const res = await engineer.post(`/api/studies/${studyId}/sweeps`).send(sweepOf(50));
        expect(res.status, JSON.stringify(res.body)).toBe(202);
        expect(res.body).toMatchObject({ status: 'running', done: 0, total: 50 }); // queued: nobody runs it yet
        started.push({ agent: engineer, studyId, id: res.body.id });
      }
      if (started.length < MAX_ACTIVE_SWEEPS) {
        const third = await engineer.post(`/api/studies/${studyId}/sweeps`).send(sweepOf(50));
        expect(third.status).toBe(503);
        expect(third.body.error.message).toBe(`Your team already has ${MAX_RUNNING_SWEEPS} sweeps running on the server; try again when one has finished, or cancel one.`);
      }
    }
    const other = await teamWithStudy(idle, 'Limits last');
    const full = await other.engineer.post(`/api/studies/${other.studyId}/sweeps`).send(sweepOf(50));
    expect(full.status).toBe(503);
    expect(full.body.error.message).toBe(`The server already has ${MAX_ACTIVE_SWEEPS} sweeps to run; try again in a few minutes.`);
    // A cancelled sweep frees its place.
    const first = started[0];
    expect((await first.agent.delete(`/api/studies/${first.studyId}/sweeps/${first.id}`)).body.status).toBe('cancelled');
    const now = await other.engineer.post(`/api/studies/${other.studyId}/sweeps`).send(sweepOf(50));
    expect(now.status).toBe(202);
    for (const s of [...started.slice(1), { agent: other.engineer, studyId: other.studyId, id: now.body.id as string }]) {
      expect((await s.agent.delete(`/api/studies/${s.studyId}/sweeps/${s.id}`)).body.status).toBe('cancelled');
    }
    // A runner that claims the cancelled sweeps' queue rows finds nothing to do and clears them.
    await t.sweeps.drain();
    expect(await queryRows(db, `select id from jobs where kind = $1`, [SWEEP_JOB])).toEqual([]);
    expect(await queryRows(db, `select id from sweep_chunks`)).toEqual([]);
  });

  it('deleting a study cancels its unfinished sweeps, freeing their places', async () => {
    const { engineer, studyId } = await teamWithStudy(idle, 'Deleted');
    const ids: string[] = [];
    for (let n = 0; n < MAX_RUNNING_SWEEPS; n++) ids.push((await engineer.post(`/api/studies/${studyId}/sweeps`).send(sweepOf(50))).body.id);
    expect((await engineer.delete(`/api/studies/${studyId}`)).status).toBe(204);
    const rows = await queryRows<{ status: string }>(db, 'select status from sweep_jobs where id = any($1::uuid[])', [ids]);
    expect(rows.map((r) => r.status)).toEqual(ids.map(() => 'cancelled'));
    const other = await engineer.post('/api/studies').send({ name: 'Deleted again', content: { circuit } });
    expect((await engineer.post(`/api/studies/${other.body.id}/sweeps`).send(sweepOf(2))).status).toBe(202);
    await t.sweeps.drain();
    expect(await queryRows(db, `select id from jobs where kind = $1`, [SWEEP_JOB])).toEqual([]);
  });

  it(`a study keeps its last ${MAX_KEPT_SWEEPS} finished sweeps`, async () => {
    const { engineer, studyId } = await teamWithStudy(t.app, 'Kept');
    const ids: string[] = [];
    for (let n = 0; n < MAX_KEPT_SWEEPS + 2; n++) {
      const res = await engineer.post(`/api/studies/${studyId}/sweeps`).send(sweepOf(2));
      expect(res.status, JSON.stringify(res.body)).toBe(202);
      ids.push(res.body.id);
      await t.sweeps.drain();
    }
    const kept = await queryRows<{ id: string }>(db, 'select id from sweep_jobs where study_id = $1', [studyId]);
    expect(kept.map((r) => r.id).sort()).toEqual(ids.slice(2).sort());
    expect((await engineer.get(`/api/studies/${studyId}/sweeps/${ids[0]}`)).status).toBe(404);
    expect((await engineer.get(`/api/studies/${studyId}/sweeps/${ids.at(-1)}`)).body).toMatchObject({ status: 'done', done: 2 });
    // Their points went with them.
    expect(await queryRows(db, 'select id from sweep_chunks where sweep_id = any($1::uuid[])', [ids.slice(0, 2)])).toEqual([]);
  });
});

describe('a sweep outlives the instance that ran it', () => {
  it('one instance shuts down mid-sweep, the next claims it and dies, a third takes it over after the lease and goes on from the points stored', async () => {
    const { engineer, studyId } = await teamWithStudy(idle, 'Takeover');
    const posted = await engineer.post(`/api/studies/${studyId}/sweeps`).send(sweepOf(2000));
    expect(posted.status).toBe(202);
    const id = posted.body.id as string;

    // Instance one runs two batches, then shuts down: the job goes back to the queue at once.
    const one = await claim(db, [SWEEP_JOB], 60_000);
    expect(one).not.toBeNull();
    let asked = 0;
    expect(await runSweep(db, one!, { name: 'one', leaseMs: 60_000, stopping: () => ++asked > 2 })).toBe('released');
    const [afterOne] = await queryRows<{ done: number; status: string; runner: string }>(db, 'select done, status, runner from sweep_jobs where id = $1', [id]);
    expect(afterOne.status).toBe('running');
    expect(afterOne.runner).toBe('one');
    expect(afterOne.done).toBeGreaterThan(0);
    expect(afterOne.done).toBeLessThan(2000);
    const storedByOne = await queryRows<{ id: string; start: number; created_at: Date }>(db, 'select id, start, created_at from sweep_chunks where sweep_id = $1 order by start', [id]);
    expect((await engineer.get(`/api/studies/${studyId}/sweeps/${id}`)).body).toMatchObject({ status: 'running', done: afterOne.done });

    // Instance two claims it and dies at once; its lease ends (moved to the past rather than waited for).
    const two = await claim(db, [SWEEP_JOB], 60_000);
    expect(two?.id).toBe(one!.id);
    expect(await claim(db, [SWEEP_JOB], 60_000)).toBeNull(); // held while the lease lasts
    await queryRows(db, `update jobs set locked_until = now() - interval '1 second' where id = $1`, [two!.id]);

    // Instance three takes it over and finishes it from where one stopped.
    const three = createSweepRunner(db, { name: 'three' });
    await three.drain();
    await three.close();
    const [row] = await queryRows<{ done: number; status: string; runner: string; claims: number }>(db, 'select done, status, runner, claims from sweep_jobs where id = $1', [id]);
    expect(row).toEqual({ done: 2000, status: 'done', runner: 'three', claims: 2 });
    const chunks = await queryRows<{ id: string; start: number; count: number; created_at: Date }>(db, 'select id, start, count, created_at from sweep_chunks where sweep_id = $1 order by start', [id]);
    expect(chunks.slice(0, storedByOne.length)).toMatchObject(storedByOne.map(({ id: cid, start, created_at }) => ({ id: cid, start, created_at }))); // kept, not solved again
    chunks.forEach((c, k) => expect(c.start).toBe(k === 0 ? 0 : chunks[k - 1].start + chunks[k - 1].count));
    expect(await queryRows(db, `select id from jobs where kind = $1`, [SWEEP_JOB])).toEqual([]);

    const job = (await engineer.get(`/api/studies/${studyId}/sweeps/${id}?limit=10000`)).body as SweepJob;
    expect(job).toMatchObject({ status: 'done', done: 2000, total: 2000 });
    expect(job.points).toHaveLength(2000);
    expectEngineAnswers(job, circuit);
  });

  it('a restarted app on the same database reads a finished sweep and its points', async () => {
    const dataDir = mkdtempSync(path.join(tmpdir(), 'wyeward-sweep-restart-'));
    dirs.push(dataDir);
    const config = readConfig({ DATA_DIR: dataDir, DEMO: '0', APP_URL: 'http://localhost:3000', ...(await freshStoreEnv(dataDir)) });
    let store = await prepareDatabase(config, quiet);
    let app = makeApp(store);
    const team = await makeTeam(store, 'Restart');
    const user = await makeUser(store, team, 'engineer');
    let engineer = await signedIn(app.app, user.email);
    const made = await engineer.post('/api/studies').send({ name: 'Restart study', content: { circuit } });
    const posted = await engineer.post(`/api/studies/${made.body.id}/sweeps`).send(sweepOf(30));
    expect(posted.status, JSON.stringify(posted.body)).toBe(202);
    await app.sweeps.drain();
    const before = (await engineer.get(`/api/studies/${made.body.id}/sweeps/${posted.body.id}?limit=100`)).body as SweepJob;
    expect(before.status).toBe('done');
    await app.mailer.close();
    await closeDb(store);

    store = await prepareDatabase(config, quiet);
    app = makeApp(store);
    engineer = await signedIn(app.app, user.email);
    const after = await engineer.get(`/api/studies/${made.body.id}/sweeps/${posted.body.id}?limit=100`);
    expect(after.status).toBe(200);
    expect(after.body).toEqual(before);
    expect(after.body.points).toHaveLength(30);
    expectEngineAnswers(after.body, circuit);
    await app.mailer.close();
    await closeDb(store);
  });
});
