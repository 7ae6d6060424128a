/**
 * Sign-off knows the danger: the review state, the approval, the review and approval e-mails and
 * the template gallery state a revision's violations (count and the worst one, in the words of
 * the diagram) with the caution; approving a revision with violations needs an acknowledgement,
 * refused (400) without it and recorded in the review history and the audit trail.
 */
import { randomUUID } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import { summarizeCircuit } from '../../shared/review/summary.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const repaired = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };
/** The open-neutral demo's violations, counted by the engine itself (the test does not hard-code them). */
const summary = summarizeCircuit(openNeutral);
const VIOLATIONS = summary.ok ? summary.flags.filter((f) => f.severity === 'violation').length : -1;

let db: Db;
let t: TestApp;
let teamId: string;
let engineer: TestAgent;
let reviewer: TestAgent;
let owner: TestAgent;
let people: Record<'engineer' | 'reviewer' | 'owner', { id: string; email: string }>;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  teamId = await makeTeam(db, 'Sign-off team');
  const e = await makeUser(db, teamId, 'engineer', 'Edda Engineer');
  const r = await makeUser(db, teamId, 'reviewer', 'Rhea Reviewer');
  const o = await makeUser(db, teamId, 'owner', 'Orla Owner');
  people = { engineer: e, reviewer: r, owner: o };
  engineer = await signedIn(t.app, e.email);
  reviewer = await signedIn(t.app, r.email);
  owner = await signedIn(t.app, o.email);
});

afterAll(async () => {
  await t.mailer.close();
  await closeDb(db);
});

async function submitted(circuit: object) {
  const res = await engineer.post('/api/studies').send({ name: `Sign-off ${randomUUID().slice(0, 6)}`, content: { circuit } });
  expect(res.status).toBe(201);
  const id = res.body.id as string;
  expect((await engineer.post(`/api/studies/${id}/review`).send({ action: 'request', reviewers: [people.reviewer.id] })).status).toBe(200);
  return id;
}

const INTERNAL = /~|switch3|[{}]|[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}/;

describe('approving a revision with violations', () => {
  it('the open-neutral demo has violations (P: a lost neutral overvolts the lightly loaded phase)', () => {
    expect(VIOLATIONS).toBeGreaterThan(0);
  });

  it('states them in the review state: count and the worst one, an over-voltage, in words', async () => {
    const id = await submitted(openNeutral);
    const state = await reviewer.get(`/api/studies/${id}/review`);
    expect(state.body.risk).toMatchObject({ revision: 1, solved: true, violationCount: VIOLATIONS });
    // (P) The worst violation of a lost neutral is the over-voltage on the lightly loaded phase.
    expect(state.body.risk.worst).toMatch(/^bus HOUSE [abc]-n: \d+\.\d V = 1\.\d{3} pu is above the violation limit/);
  });

  it('is refused (400) without the acknowledgement, and nothing changes', async () => {
    const id = await submitted(openNeutral);
    const res = await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve', message: 'ok' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    expect(res.body.error.fields.acknowledgeViolations).toMatch(new RegExp(`^Revision 1 has ${VIOLATIONS} violations; the worst: bus HOUSE`));
    expect((await reviewer.get(`/api/studies/${id}`)).body.status).toBe('in-review');
    const refused = await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve', acknowledgeViolations: false });
    expect(refused.status).toBe(400);
  });

  it('with the acknowledgement: approved, the count recorded in the review history and the audit trail', async () => {
    const id = await submitted(openNeutral);
    const res = await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve', acknowledgeViolations: true, message: 'Known hazard, study of the fault' });
    expect(res.status).toBe(200);
    expect(res.body.status).toBe('approved');
    expect(res.body.events.at(-1)).toMatchObject({ action: 'approve', acknowledgedViolations: VIOLATIONS });
    const audit = await owner.get(`/api/audit?studyId=${id}&action=review.approve`);
    expect(audit.body.items[0].text).toBe(`approved revision 1, acknowledging ${VIOLATIONS} violations`);
  });

  it('needs no acknowledgement for a revision without violations (and records none)', async () => {
    const id = await submitted(repaired);
    const state = await reviewer.get(`/api/studies/${id}/review`);
    expect(state.body.risk).toMatchObject({ violationCount: 0, worst: null });
    const res = await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve' });
    expect(res.status).toBe(200);
    expect(res.body.events.at(-1).acknowledgedViolations).toBeNull();
  });
});

describe('e-mails and the template gallery state the danger', () => {
  it('review-request and approval mails give the count, the worst violation and the caution', async () => {
    const id = await submitted(openNeutral);
    await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve', acknowledgeViolations: true });
    const name = (await reviewer.get(`/api/studies/${id}`)).body.name;
    const mails = await t.mailer.list(teamId);
    const request = mails.find((m) => m.subject === `Review requested: ${name}`)!;
    const approval = mails.find((m) => m.subject === `Approved: ${name}`)!;
    for (const m of [request, approval]) {
      const full = (await t.mailer.get(teamId, m.id))!;
      expect(full.text).toContain(`Revision 1 has ${VIOLATIONS} violations; the worst: bus HOUSE`);
      expect(full.text).toContain('A lost or open neutral puts dangerous voltages on equipment and people.');
      expect(full.html).toContain(`Revision 1 has ${VIOLATIONS} violations`);
      // Links may carry ids; the words may not.
      expect(full.text.replace(/https?:\/\/\S+/g, '')).not.toMatch(INTERNAL);
    }
    expect((await t.mailer.get(teamId, approval.id))!.text).toContain(`acknowledging ${VIOLATIONS} violations`);
  });

  it('GET /api/templates gives each template the violations of the revision a copy starts from', async () => {
    const id = await submitted(openNeutral);
    await reviewer.post(`/api/studies/${id}/review`).send({ action: 'approve', acknowledgeViolations: true });
    const s = (await engineer.get(`/api/studies/${id}`)).body;
    expect((await engineer.patch(`/api/studies/${id}`).send({ version: s.version, isTemplate: true })).status).toBe(200);
    const gallery = await reviewer.get('/api/templates');
    const item = gallery.body.items.find((x: { id: string }) => x.id === id);
    expect(item.risk).toMatchObject({ revision: 1, solved: true, violationCount: VIOLATIONS });
    expect(item.risk.worst).toMatch(/^bus HOUSE/);
    // The same on the study and in the list, where "Start from template" is offered too; other studies carry none.
    expect((await reviewer.get(`/api/studies/${id}`)).body.risk).toEqual(item.risk);
    const list = (await reviewer.get('/api/studies?pageSize=100')).body.items as { id: string; isTemplate: boolean; risk?: unknown }[];
    expect(list.find((x) => x.id === id)!.risk).toEqual(item.risk);
    expect(list.filter((x) => !x.isTemplate).every((x) => x.risk === undefined)).toBe(true);
  });
});
