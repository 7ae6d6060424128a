/**
 * Server sweep jobs: a sweep on a study case runs in the work threads, its progress only grows, its
 * points are stored in the database and every one equals the engine's solve of the same circuit
 * computed here; bad requests are refused in words (4xx); a running job is cancelled through the
 * database and stores nothing after that; roles and teams as for studies. (Limits, kept jobs, a
 * restart and a dead instance's job taken over: sweep-jobs.test.ts.)
 */
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, queryRows, type Db } from '../../server/db/index.ts';
import { applyCase, demoCircuits, solveCircuit, sweepCircuit, type CircuitInput } from '../../shared/engine/index.ts';
import { outputValue, availableOutputs } from '../../shared/review/sweep-outputs.ts';
import type { SweepJob } from '../../shared/api/sweeps.ts';
import { circuitWith, makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const circuit = {
  ...demo,
  elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)),
  cases: [{ id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] }],
} as CircuitInput;

let db: Db;
let t: TestApp;
let engineer: TestAgent;
let viewer: TestAgent;
let stranger: TestAgent;
let studyId: string;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Sweeps team');
  engineer = await signedIn(t.app, (await makeUser(db, team, 'engineer')).email);
  viewer = await signedIn(t.app, (await makeUser(db, team, 'viewer')).email);
  stranger = await signedIn(t.app, (await makeUser(db, await makeTeam(db, 'Other'), 'owner')).email);
  const res = await engineer.post('/api/studies').send({ name: 'Lane 14 sweeps', content: { circuit } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  studyId = res.body.id;
});

afterAll(async () => {
  await closeDb(db);
});

/** Polls the job (bounded) until `done` holds; every state read is passed to `seen`. */
async function until(agent: TestAgent, job: string, done: (j: SweepJob) => boolean, query = '', seen: (j: SweepJob) => void = () => {}): Promise<SweepJob> {
  for (let i = 0; i < 600; i++) {
    const res = await agent.get(`/api/studies/${studyId}/sweeps/${job}${query}`);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    seen(res.body);
    if (done(res.body)) return res.body;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error('the sweep did not finish');
}

/** Waits (bounded) until no sweep is left in the jobs queue: the instance running one has seen it end. */
async function queueEmpty() {
  for (let i = 0; i < 600; i++) {
    const [{ n }] = await queryRows<{ n: number }>(db, `select count(*)::int as n from jobs where kind = 'sweep.run'`);
    if (n === 0) return;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('a sweep stayed in the jobs queue');
}

/** The stored chunks of a job: where each starts and how many points it holds. */
const chunksOf = (id: string) => queryRows<{ start: number; count: number }>(db, 'select start, count from sweep_chunks where sweep_id = $1 order by start', [id]);

describe('server sweep jobs', () => {
  it('sweeps a load on a case in the work threads; every point equals the engine on the same circuit', async () => {
    const start = await engineer.post(`/api/studies/${studyId}/sweeps`).send({ case: 'lost-n', parameters: [{ path: 'KITCHEN.each.kw', from: 0.5, to: 6, points: 12 }] });
    expect(start.status, JSON.stringify(start.body)).toBe(202);
    expect(start.body).toMatchObject({ status: 'running', total: 12, revision: 1, caseName: 'Neutral lost', parameters: ['KITCHEN.each.kw'] });
    expect(start.body.caution).toMatch(/neutral/);
    const progress: number[] = [];
    const job = await until(engineer, start.body.id, (j) => j.status !== 'running', '?limit=100', (j) => {
      progress.push(j.done);
      expect(j.points).toHaveLength(j.done); // every point counted is there to read
    });
    expect(job.status, job.error ?? '').toBe('done');
    expect(job.points).toHaveLength(12);
    expect(progress).toEqual(progress.toSorted((a, b) => a - b));
    expect(job.finishedAt).not.toBeNull();
    // Kept in the database with the revision it ran on, in chunks of consecutive points.
    const [row] = await queryRows<{ revision: number; status: string; done: number; claims: number }>(db, 'select revision, status, done, claims from sweep_jobs where id = $1', [job.id]);
    expect(row).toEqual({ revision: 1, status: 'done', done: 12, claims: 1 });
    const chunks = await chunksOf(job.id);
    expect(chunks[0].start).toBe(0);
    chunks.forEach((c, k) => k > 0 && expect(c.start).toBe(chunks[k - 1].start + chunks[k - 1].count));
    expect(chunks.reduce((n, c) => n + c.count, 0)).toBe(12);
    const onCase = applyCase(circuit, 'lost-n');
    const specs = availableOutputs(solveCircuit(onCase));
    expect(job.outputs.map((o) => o.key)).toEqual(specs.slice(0, job.outputs.length).map((o) => o.key));
    for (const p of job.points) {
      // (C) the engine's solve of the same circuit with the value written
      const direct = solveCircuit(sweepCircuit(onCase, ['KITCHEN.each.kw'], p.values));
      job.outputs.forEach((o, k) => expect(p.outputs[k]).toBeCloseTo(outputValue(direct, specs.find((s) => s.key === o.key)!.spec)!, 9));
    }
    const page = await engineer.get(`/api/studies/${studyId}/sweeps/${job.id}?offset=10&limit=5`);
    expect(page.body.points.map((p: { values: number[] }) => p.values[0])).toEqual(job.points.slice(10).map((p) => p.values[0]));
  });

  it('refuses bad requests in words, before running anything', async () => {
    const post = (body: object) => engineer.post(`/api/studies/${studyId}/sweeps`).send(body);
    const tooMany = await post({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 1000 }, { path: 'HEATER.each.kw', from: 1, to: 2, points: 201 }] });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.message).toBe('A sweep of 201,000 points is more than the 200,000 a server sweep runs; use fewer points.');
    const noElement = await post({ parameters: [{ path: 'FRIDGE.each.kw', from: 1, to: 2, points: 3 }] });
    expect(noElement.status).toBe(400);
    expect(noElement.body.error.message).toMatch(/no element "FRIDGE"/);
    const noCase = await post({ case: 'flood', parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 3 }] });
    expect(noCase.status).toBe(400);
    expect(noCase.body.error.message).toMatch(/no case "flood"/);
    const notNumber = await post({ parameters: [{ path: 'DROP.impedance', from: 1, to: 2, points: 3 }] });
    expect(notNumber.status).toBe(400);
    expect(notNumber.body.error.message).toMatch(/not a number/);
    const log = await post({ parameters: [{ path: 'ROD.ohms', from: 0, to: 10, points: 3, scale: 'log' }] });
    expect(log.status).toBe(400);
    expect(log.body.error.message).toMatch(/logarithmic/);
    const noOutput = await post({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 3 }], outputs: ['load:FRIDGE:an'] });
    expect(noOutput.status).toBe(400);
    expect(noOutput.body.error.message).toMatch(/^No output "load:FRIDGE:an" in this circuit/);
    const noPoints = await post({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 0 }] });
    expect(noPoints.status).toBe(400);
    expect(noPoints.body.error.message).toMatch(/At least one point/);
    const three = await post({ parameters: [1, 2, 3].map(() => ({ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 2 })) });
    expect(three.status).toBe(400);
    expect(three.body.error.message).toMatch(/Sweep one or two parameters/);
    // A study whose circuit does not solve (loads on a bus with no source).
    const unsolvable = await engineer.post('/api/studies').send({ name: 'No source', content: circuitWith(2) });
    expect(unsolvable.status).toBe(201);
    const noSolve = await engineer.post(`/api/studies/${unsolvable.body.id}/sweeps`).send({ parameters: [{ path: 'LOAD-1.each.kw', from: 1, to: 2, points: 3 }] });
    expect(noSolve.status).toBe(400);
    expect(noSolve.body.error.message).toMatch(/^The circuit does not solve, so nothing can be swept: /);
    for (const r of [tooMany, noElement, noCase, notNumber, log, noOutput, noPoints, three, noSolve]) expect(r.body.error.message).not.toMatch(/[{}~]/);
    // Nothing was queued or stored for any of them.
    expect(await queryRows(db, `select id from sweep_jobs where study_id = $1 and status <> 'done'`, [studyId])).toEqual([]);
    expect(await queryRows(db, `select id from sweep_jobs where study_id = $1`, [unsolvable.body.id])).toEqual([]);
  });

  it('a running sweep is cancelled; roles and teams as for studies', async () => {
    const start = await engineer.post(`/api/studies/${studyId}/sweeps`).send({ parameters: [{ path: 'ROD.ohms', from: 0.1, to: 1e5, points: 100_000, scale: 'log' }] });
    expect(start.status).toBe(202);
    const cancelled = await engineer.delete(`/api/studies/${studyId}/sweeps/${start.body.id}`);
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.status).toBe('cancelled');
    expect(cancelled.body.finishedAt).not.toBeNull();
    // The instance running it noticed (its queue row is gone) and stored nothing after the cancel.
    await queueEmpty();
    const after = await engineer.get(`/api/studies/${studyId}/sweeps/${start.body.id}`);
    expect(after.body.status).toBe('cancelled');
    expect(after.body.done).toBe(cancelled.body.done);
    expect(after.body.done).toBeLessThan(100_000);
    expect((await chunksOf(start.body.id)).reduce((n, c) => n + c.count, 0)).toBe(after.body.done);
    // Cancelling a finished job changes nothing.
    const again = await engineer.delete(`/api/studies/${studyId}/sweeps/${start.body.id}`);
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ status: 'cancelled', done: after.body.done, finishedAt: cancelled.body.finishedAt });

    expect((await viewer.post(`/api/studies/${studyId}/sweeps`).send({ parameters: [{ path: 'ROD.ohms', from: 1, to: 2, points: 2 }] })).status).toBe(403);
    expect((await viewer.get(`/api/studies/${studyId}/sweeps/${start.body.id}`)).status).toBe(200);
    expect((await stranger.get(`/api/studies/${studyId}/sweeps/${start.body.id}`)).status).toBe(404);
    expect((await stranger.delete(`/api/studies/${studyId}/sweeps/${start.body.id}`)).status).toBe(404);
    const strangers = await stranger.post(`/api/studies/${studyId}/sweeps`).send({ parameters: [{ path: 'ROD.ohms', from: 1, to: 2, points: 2 }] });
    expect(strangers.status).toBe(404);
    expect(strangers.body.error.message).toBe('Study not found.');
    expect((await engineer.get(`/api/studies/${studyId}/sweeps/not-a-job`)).status).toBe(404);
  });
});
