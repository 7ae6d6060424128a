/**
 * Authorization matrix: every API route × every caller (the four roles of team A, anonymous, and
 * the owner of another team B) with the expected status. Team A's records are never visible to
 * team B: its study routes answer 404, not 403, so existence does not leak.
 */
import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, type Db } from '../../server/db/index.ts';
import { invites } from '../../server/db/schema.ts';
import { hashInviteToken } from '../../server/services/invites-token.ts';
import { demoCircuits } from '../../shared/engine/index.ts';
import { APP_URL, makeApp, makeStudy, makeTeam, makeUser, PASSWORD, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const CALLERS = ['owner', 'engineer', 'reviewer', 'viewer', 'anonymous', 'otherOwner'] as const;
type Caller = (typeof CALLERS)[number];

let db: Db;
let t: TestApp;
let teamA: string;
let teamB: string;
const people = {} as Record<Exclude<Caller, 'anonymous'>, { id: string; email: string }>;
const agents = {} as Record<Caller, TestAgent>;
let studyA: string;
let mailA: string;
/** A study of team A made through the API, with two revisions, a comment and an attachment. */
let studyR: string;
let attachmentR: string;
/** A one-point sweep job on studyR, started by the engineer. */
let sweepR: string;

const circuitA = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const PDF = Buffer.from('%PDF-1.4\n%%EOF\n');

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  teamA = await makeTeam(db, 'Team A');
  teamB = await makeTeam(db, 'Team B');
  for (const role of ['owner', 'engineer', 'reviewer', 'viewer'] as const) people[role] = await makeUser(db, teamA, role);
  people.otherOwner = await makeUser(db, teamB, 'owner');
  for (const c of CALLERS) agents[c] = c === 'anonymous' ? request.agent(t.app).set('Origin', APP_URL) : await signedIn(t.app, people[c].email);
  studyA = (await makeStudy(db, teamA, people.engineer.id, 'Team A feeder study')).id;
  mailA = await t.mailer.send({ teamId: teamA, to: 'someone@example.test', subject: 'Team A message', text: 'hello' });
  const r = await apiStudy();
  studyR = r.id;
  await agents.engineer.patch(`/api/studies/${studyR}`).send({ version: 1, content: { circuit: { ...circuitA, frequencyHz: 50 } } });
  attachmentR = (await agents.engineer.post(`/api/studies/${studyR}/attachments`).attach('file', PDF, 'a.pdf')).body.id;
  sweepR = (await agents.engineer.post(`/api/studies/${studyR}/sweeps`).send({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 1, points: 1 }] })).body.id;
});

/** A new study of team A through the API (so it has revision 1), by the engineer. */
async function apiStudy(): Promise<{ id: string; version: number }> {
  const res = await agents.engineer.post('/api/studies').send({ name: `Matrix ${randomUUID().slice(0, 6)}`, content: { circuit: circuitA } });
  if (res.status !== 201) throw new Error(JSON.stringify(res.body));
  return res.body;
}

/** A study submitted for review by the engineer, with the reviewer chosen. */
async function inReview(): Promise<string> {
  const { id } = await apiStudy();
  const res = await agents.engineer.post(`/api/studies/${id}/review`).send({ action: 'request', reviewers: [people.reviewer.id] });
  if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  return id;
}

/** A comment by the reviewer on studyR. */
async function reviewerComment(): Promise<string> {
  return (await agents.reviewer.post(`/api/studies/${studyR}/comments`).send({ body: 'matrix comment' })).body.id;
}

afterAll(async () => {
  await t.mailer.close();
});

afterAll(async () => {
  await closeDb(db);
});

/** One row of the matrix: how to make the request, and the status per caller. */
interface Row {
  name: string;
  expect: Record<Caller, number>;
  /** Builds the request; runs once per caller, so destructive routes get a fresh target each time. */
  send: (agent: TestAgent, caller: Caller) => Promise<request.Response>;
  /** Use a newly signed-in agent of the caller (for routes that replace or end the session). */
  freshAgent?: boolean;
}

const all = (s: number): Record<Caller, number> => ({ owner: s, engineer: s, reviewer: s, viewer: s, anonymous: s, otherOwner: s });
/** Member roles get `member`, anonymous 401, another team's owner `other`. */
const m = (owner: number, engineer: number, reviewer: number, viewer: number, other: number): Record<Caller, number> => ({
  owner,
  engineer,
  reviewer,
  viewer,
  anonymous: 401,
  otherOwner: other,
});

async function freshInvite(): Promise<{ id: string; token: string }> {
  const token = randomUUID();
  const [row] = await db
    .insert(invites)
    .values({
      teamId: teamA,
      email: `invitee-${randomUUID().slice(0, 8)}@example.test`,
      role: 'viewer',
      tokenHash: hashInviteToken(token),
      invitedBy: people.owner.id,
      expiresAt: new Date(Date.now() + 86_400_000),
    })
    .returning({ id: invites.id });
  return { id: row.id, token };
}

const rows: Row[] = [
  { name: 'GET /api/health', expect: all(200), send: (a) => a.get('/api/health') },
  { name: 'GET /api/auth/demo', expect: all(200), send: (a) => a.get('/api/auth/demo') },
  { name: 'GET /api/auth/me', expect: m(200, 200, 200, 200, 200), send: (a) => a.get('/api/auth/me') },
  {
    name: 'POST /api/auth/sign-up',
    expect: all(202),
    freshAgent: true,
    send: (a) =>
      a.post('/api/auth/sign-up').send({ name: 'New Person', email: `new-${randomUUID()}@example.test`, password: PASSWORD, teamName: 'New team' }),
  },
  {
    name: 'POST /api/auth/sign-up/confirm',
    expect: all(404),
    freshAgent: true,
    send: (a) => a.post('/api/auth/sign-up/confirm').send({ token: 'not-a-mailed-token' }),
  },
  {
    name: 'POST /api/auth/sign-in',
    expect: all(200),
    freshAgent: true,
    send: (a) => a.post('/api/auth/sign-in').send({ email: people.viewer.email, password: PASSWORD }),
  },
  { name: 'POST /api/auth/sign-out', expect: all(204), freshAgent: true, send: (a) => a.post('/api/auth/sign-out') },
  { name: 'GET /api/studies', expect: m(200, 200, 200, 200, 200), send: (a) => a.get('/api/studies') },
  { name: 'POST /api/studies', expect: m(201, 201, 403, 403, 201), send: (a) => a.post('/api/studies').send({ name: 'Matrix study' }) },
  { name: 'GET /api/studies/:id', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyA}`) },
  {
    name: 'PATCH /api/studies/:id',
    expect: m(200, 200, 403, 403, 404),
    send: async (a) => {
      const s = await makeStudy(db, teamA, people.engineer.id);
      return a.patch(`/api/studies/${s.id}`).send({ version: s.version, name: 'Renamed' });
    },
  },
  {
    name: 'DELETE /api/studies/:id',
    expect: m(204, 204, 403, 403, 404),
    send: async (a) => a.delete(`/api/studies/${(await makeStudy(db, teamA, people.engineer.id)).id}`),
  },
  {
    name: 'POST /api/studies/:id/clone',
    expect: m(201, 201, 403, 403, 404),
    send: (a) => a.post(`/api/studies/${studyA}/clone`).send({}),
  },
  {
    name: 'POST /api/studies/:id/balance',
    expect: m(200, 200, 200, 200, 404),
    send: (a) => a.post(`/api/studies/${studyR}/balance`).send({ objective: 'unbalance', maxMoves: 1 }),
  },
  {
    // a body refused for its size (400) once the role and the study pass: no job is started by the matrix
    name: 'POST /api/studies/:id/sweeps',
    expect: m(400, 400, 403, 403, 404),
    send: (a) => a.post(`/api/studies/${studyR}/sweeps`).send({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 2, points: 1000 }, { path: 'HEATER.each.kw', from: 1, to: 2, points: 1000 }] }),
  },
  { name: 'GET /api/studies/:id/sweeps/:job', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/sweeps/${sweepR}`) },
  { name: 'DELETE /api/studies/:id/sweeps/:job', expect: m(200, 200, 403, 403, 404), send: (a) => a.delete(`/api/studies/${studyR}/sweeps/${sweepR}`) },
  { name: 'GET /api/team', expect: m(200, 200, 200, 200, 200), send: (a) => a.get('/api/team') },
  {
    name: 'POST /api/team/invites',
    expect: m(201, 403, 403, 403, 201),
    send: (a) => a.post('/api/team/invites').send({ email: `inv-${randomUUID().slice(0, 8)}@example.test`, role: 'viewer' }),
  },
  {
    name: 'DELETE /api/team/invites/:id',
    expect: m(204, 403, 403, 403, 404),
    send: async (a) => a.delete(`/api/team/invites/${(await freshInvite()).id}`),
  },
  { name: 'GET /api/invites/:token', expect: all(200), send: async (a) => a.get(`/api/invites/${(await freshInvite()).token}`) },
  {
    name: 'PATCH /api/team/members/:userId',
    expect: m(200, 403, 403, 403, 404),
    send: async (a) => a.patch(`/api/team/members/${(await makeUser(db, teamA, 'viewer')).id}`).send({ role: 'reviewer' }),
  },
  {
    name: 'DELETE /api/team/members/:userId',
    expect: m(204, 403, 403, 403, 404),
    send: async (a) => a.delete(`/api/team/members/${(await makeUser(db, teamA, 'viewer')).id}`),
  },
  { name: 'GET /api/mail', expect: m(200, 403, 403, 403, 200), send: (a) => a.get('/api/mail') },
  { name: 'GET /api/mail/:id', expect: m(200, 403, 403, 403, 404), send: (a) => a.get(`/api/mail/${mailA}`) },
  { name: 'GET /api/audit', expect: m(200, 403, 403, 403, 200), send: (a) => a.get('/api/audit') },
  { name: 'GET /api/studies/:id/revisions', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/revisions`) },
  {
    name: 'POST /api/studies/:id/revisions',
    expect: m(201, 201, 403, 403, 404),
    send: async (a) => {
      const s = await apiStudy();
      return a.post(`/api/studies/${s.id}/revisions`).send({ version: s.version, content: { circuit: { ...circuitA, frequencyHz: 50 } }, message: 'm' });
    },
  },
  { name: 'GET /api/studies/:id/revisions/:n', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/revisions/1`) },
  {
    name: 'POST /api/studies/:id/revisions/:n/restore',
    expect: m(201, 201, 403, 403, 404),
    send: async (a) => {
      const s = await apiStudy();
      await agents.engineer.patch(`/api/studies/${s.id}`).send({ version: 1, content: { circuit: { ...circuitA, frequencyHz: 50 } } });
      return a.post(`/api/studies/${s.id}/revisions/1/restore`).send({ version: 2 });
    },
  },
  { name: 'GET /api/studies/:id/diff', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/diff?from=1&to=2`) },
  { name: 'GET /api/studies/:id/review', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/review`) },
  {
    name: 'POST /api/studies/:id/review (request)',
    expect: m(200, 200, 403, 403, 404),
    send: async (a) => a.post(`/api/studies/${(await apiStudy()).id}/review`).send({ action: 'request', reviewers: [people.reviewer.id] }),
  },
  {
    name: 'POST /api/studies/:id/review (approve)',
    expect: m(200, 403, 200, 403, 404),
    send: async (a) => a.post(`/api/studies/${await inReview()}/review`).send({ action: 'approve', acknowledgeViolations: true }),
  },
  {
    name: 'POST /api/studies/:id/review (request-changes)',
    expect: m(200, 403, 200, 403, 404),
    send: async (a) => a.post(`/api/studies/${await inReview()}/review`).send({ action: 'request-changes', message: 'more data' }),
  },
  { name: 'GET /api/studies/:id/comments', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/comments`) },
  { name: 'POST /api/studies/:id/comments', expect: m(201, 201, 201, 403, 404), send: (a) => a.post(`/api/studies/${studyR}/comments`).send({ body: 'Looks fine' }) },
  {
    name: 'PATCH /api/studies/:id/comments/:commentId (resolve)',
    expect: m(200, 200, 200, 403, 404),
    send: async (a) => a.patch(`/api/studies/${studyR}/comments/${await reviewerComment()}`).send({ resolved: true }),
  },
  {
    name: 'DELETE /api/studies/:id/comments/:commentId (the reviewer\'s)',
    expect: m(204, 403, 204, 403, 404),
    send: async (a) => a.delete(`/api/studies/${studyR}/comments/${await reviewerComment()}`),
  },
  { name: 'GET /api/notifications', expect: m(200, 200, 200, 200, 200), send: (a) => a.get('/api/notifications') },
  { name: 'POST /api/notifications/read', expect: m(200, 200, 200, 200, 200), send: (a) => a.post('/api/notifications/read').send({}) },
  { name: 'GET /api/templates', expect: m(200, 200, 200, 200, 200), send: (a) => a.get('/api/templates') },
  { name: 'GET /api/studies/:id/attachments', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/attachments`) },
  {
    name: 'POST /api/studies/:id/attachments',
    expect: m(201, 201, 201, 403, 404),
    send: (a) => a.post(`/api/studies/${studyR}/attachments`).attach('file', PDF, 'notes.pdf'),
  },
  { name: 'GET /api/studies/:id/attachments/:attachmentId', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/attachments/${attachmentR}`) },
  {
    name: "DELETE /api/studies/:id/attachments/:attachmentId (the engineer's)",
    expect: m(204, 204, 403, 403, 404),
    send: async (a) => {
      const up = await agents.engineer.post(`/api/studies/${studyR}/attachments`).attach('file', PDF, 'del.pdf');
      return a.delete(`/api/studies/${studyR}/attachments/${up.body.id}`);
    },
  },
  { name: 'GET /api/studies/:id/export', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/export`) },
  { name: 'GET /api/studies/:id/report.pdf', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/report.pdf`) },
  { name: 'GET /api/studies/:id/results.csv', expect: m(200, 200, 200, 200, 404), send: (a) => a.get(`/api/studies/${studyR}/results.csv?table=buses`) },
  {
    name: 'POST /api/studies/import',
    expect: m(201, 201, 403, 403, 201),
    send: (a) => a.post('/api/studies/import').send({ format: 'wyeward-study', version: 1, name: 'Imported', circuit: circuitA }),
  },
  { name: 'GET /api/no-such-route', expect: all(404), send: (a) => a.get('/api/no-such-route') },
];

describe.each(rows)('$name', (row) => {
  it.each(CALLERS)('as %s', async (caller) => {
    const agent = !row.freshAgent
      ? agents[caller]
      : caller === 'anonymous'
        ? request.agent(t.app).set('Origin', APP_URL)
        : await signedIn(t.app, people[caller].email);
    const res = await row.send(agent, caller);
    expect(res.status, JSON.stringify(res.body)).toBe(row.expect[caller]);
    if (res.status >= 400) {
      expect(res.body.error.code).toEqual(expect.any(String));
      expect(res.body.error.message).toEqual(expect.any(String));
    }
  });
});

describe('another team', () => {
  it('sees none of team A in its study list, team page, mail or audit trail', async () => {
    const a = agents.otherOwner;
    const list = await a.get('/api/studies');
    expect(list.body.items.map((s: { id: string }) => s.id)).not.toContain(studyA);
    const team = await a.get('/api/team');
    expect(team.body.team.id).toBe(teamB);
    expect(team.body.members.map((x: { userId: string }) => x.userId)).toEqual([people.otherOwner.id]);
    const mail = await a.get('/api/mail');
    expect(mail.body.items.map((x: { id: string }) => x.id)).not.toContain(mailA);
    const audit = await a.get(`/api/audit?studyId=${studyA}`);
    expect(audit.body).toEqual({ items: [], total: 0 });
  });

  it('gets the same 404 body for team A study as for a study that does not exist', async () => {
    const foreign = await agents.otherOwner.get(`/api/studies/${studyA}`);
    const missing = await agents.otherOwner.get(`/api/studies/${randomUUID()}`);
    expect(foreign.status).toBe(404);
    expect(foreign.body).toEqual(missing.body);
    expect(foreign.body.error.code).toBe('not-found');
  });

  it('cannot change team A study through any write route, and the study is unchanged', async () => {
    const before = await agents.owner.get(`/api/studies/${studyA}`);
    const o = agents.otherOwner;
    expect((await o.patch(`/api/studies/${studyA}`).send({ version: before.body.version, name: 'hijack' })).status).toBe(404);
    expect((await o.delete(`/api/studies/${studyA}`)).status).toBe(404);
    expect((await o.post(`/api/studies/${studyA}/clone`).send({})).status).toBe(404);
    const after = await agents.owner.get(`/api/studies/${studyA}`);
    expect(after.body.name).toBe('Team A feeder study');
    expect(after.body.version).toBe(before.body.version);
  });

  it('answers 404 to a malformed study id instead of a database error', async () => {
    for (const send of [
      (a: TestAgent) => a.get('/api/studies/not-a-uuid'),
      (a: TestAgent) => a.patch('/api/studies/not-a-uuid').send({ version: 1 }),
      (a: TestAgent) => a.delete('/api/studies/not-a-uuid'),
      (a: TestAgent) => a.post('/api/studies/not-a-uuid/clone').send({}),
      (a: TestAgent) => a.post('/api/studies/not-a-uuid/balance').send({}),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/revisions'),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/diff'),
      (a: TestAgent) => a.post('/api/studies/not-a-uuid/review').send({ action: 'approve' }),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/comments'),
      (a: TestAgent) => a.patch(`/api/studies/${studyR}/comments/not-a-uuid`).send({ resolved: true }),
      (a: TestAgent) => a.get(`/api/studies/${studyR}/attachments/not-a-uuid`),
      (a: TestAgent) => a.post('/api/studies/not-a-uuid/attachments').attach('file', PDF, 'x.pdf'),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/export'),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/report.pdf'),
      (a: TestAgent) => a.get('/api/studies/not-a-uuid/results.csv?table=flags'),
    ]) {
      const res = await send(agents.owner);
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('not-found');
    }
  });
});
