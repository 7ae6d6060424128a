/**
 * Review and reuse through the API: revisions and diffs, the review state machine (every
 * transition × every role, self-approval refused, approval bound to a revision, edit after
 * approval → draft), comments (permissions, anchors, verbatim text, escaped e-mail, mentions),
 * notifications, templates and the audit filters. Mail goes over SMTP to the local fake server.
 */
import { randomUUID } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { circuitWith, makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
/** The demo service with the neutral repaired (DROP no longer open). */
const repaired = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };

type Who = 'owner' | 'owner2' | 'engineer' | 'engineer2' | 'reviewer' | 'reviewer2' | 'viewer';
const WHO: Who[] = ['owner', 'owner2', 'engineer', 'engineer2', 'reviewer', 'reviewer2', 'viewer'];

let db: Db;
let t: TestApp;
let teamId: string;
const people = {} as Record<Who, { id: string; email: string; name: string }>;
const as = {} as Record<Who, TestAgent>;
let outsider: TestAgent;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  teamId = await makeTeam(db, 'Review team');
  const names: Record<Who, string> = {
    owner: 'Orla Owner',
    owner2: 'Otto Second',
    engineer: 'Edda Engineer',
    engineer2: 'Emil Other',
    reviewer: 'Rhea Reviewer',
    reviewer2: 'Ruben Other',
    viewer: 'Vik Viewer',
  };
  for (const w of WHO) {
    const role = w.replace(/2$/, '') as 'owner' | 'engineer' | 'reviewer' | 'viewer';
    people[w] = await makeUser(db, teamId, role, names[w]);
    as[w] = await signedIn(t.app, people[w].email);
  }
  const other = await makeUser(db, await makeTeam(db, 'Other team'), 'owner');
  outsider = await signedIn(t.app, other.email);
});

afterAll(async () => {
  await t.mailer.close();
  await closeDb(db);
});

async function newStudy(by: Who = 'engineer', circuit: object = openNeutral) {
  const res = await as[by].post('/api/studies').send({ name: `Study ${randomUUID().slice(0, 6)}`, content: { circuit } });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { id: string; version: number };
}

async function study(id: string) {
  return (await as.owner.get(`/api/studies/${id}`)).body;
}

async function review(by: Who, id: string, body: object) {
  return as[by].post(`/api/studies/${id}/review`).send(body);
}

async function mailTo(who: Who) {
  return (await t.mailer.list(teamId)).filter((m) => m.to === people[who].email);
}

describe('revisions', () => {
  it('makes revision 1 on create with the engine summary, and one per content change', async () => {
    const s = await newStudy();
    const list = await as.viewer.get(`/api/studies/${s.id}/revisions`);
    expect(list.status).toBe(200);
    expect(list.body.items).toHaveLength(1);
    expect(list.body.items[0]).toMatchObject({ number: 1, author: { name: 'Edda Engineer' }, restoredFrom: null, results: { ok: true } });
    expect(list.body.items[0].engineVersion).toMatch(/^wyeward-engine \d+\.\d+\.\d+/);
    expect(list.body.items[0].results.violationCount).toBeGreaterThan(0); // the open neutral is flagged

    const one = await as.viewer.get(`/api/studies/${s.id}/revisions/1`);
    expect(one.body.content.circuit).toEqual(openNeutral);
    expect(one.body.summary.ok).toBe(true);
    expect(one.body.summary.flags.some((f: { code: string }) => f.code === 'neutral-shift')).toBe(true);

    // PATCH with content and a message makes revision 2; a rename or the same content makes none.
    const p = await as.engineer.patch(`/api/studies/${s.id}`).send({ version: 1, content: { circuit: repaired }, message: 'Neutral repaired' });
    expect(p.status).toBe(200);
    expect(p.body.revision).toBe(2);
    await as.engineer.patch(`/api/studies/${s.id}`).send({ version: 2, name: 'Renamed' });
    await as.engineer.patch(`/api/studies/${s.id}`).send({ version: 3, content: { circuit: repaired } });
    const after = await as.viewer.get(`/api/studies/${s.id}/revisions`);
    expect(after.body.items.map((r: { number: number; message: string }) => [r.number, r.message])).toEqual([
      [2, 'Neutral repaired'],
      [1, 'Created'],
    ]);
  });

  it('POST /revisions refuses a stale version and an unchanged content; restore makes a new revision', async () => {
    const s = await newStudy();
    const saved = await as.engineer.post(`/api/studies/${s.id}/revisions`).send({ version: 1, content: { circuit: repaired }, message: 'fix' });
    expect(saved.status).toBe(201);
    expect(saved.body.revision).toMatchObject({ number: 2, message: 'fix' });
    expect(saved.body.study.version).toBe(2);
    const stale = await as.engineer.post(`/api/studies/${s.id}/revisions`).send({ version: 1, content: { circuit: openNeutral } });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('version-conflict');
    expect(stale.body.current.version).toBe(2);
    const same = await as.engineer.post(`/api/studies/${s.id}/revisions`).send({ version: 2, content: { circuit: repaired } });
    expect(same.status).toBe(409);
    expect(same.body.error).toMatchObject({ code: 'conflict', message: expect.stringContaining('Nothing changed since revision 2') });

    const restored = await as.engineer.post(`/api/studies/${s.id}/revisions/1/restore`).send({ version: 2 });
    expect(restored.status).toBe(201);
    expect(restored.body.revision).toMatchObject({ number: 3, restoredFrom: 1, message: 'Restored revision 1' });
    expect(restored.body.study.content.circuit).toEqual(openNeutral);
    expect((await as.engineer.get(`/api/studies/${s.id}/revisions/99`)).status).toBe(404);
    expect((await as.engineer.get(`/api/studies/${s.id}/revisions/abc`)).status).toBe(404);
    expect((await as.engineer.post(`/api/studies/${s.id}/revisions/99/restore`).send({ version: 3 })).status).toBe(404);
  });

  it('keeps the engine error of a circuit that cannot be solved', async () => {
    const s = await newStudy('engineer', circuitWith(2).circuit);
    const list = await as.engineer.get(`/api/studies/${s.id}/revisions`);
    expect(list.body.items[0].results).toMatchObject({ ok: false, error: { code: expect.any(String), message: expect.any(String) } });
  });

  it('keeps study cases through save, export and import, and the diff says what changed in them', async () => {
    const s = await newStudy();
    const lost = { id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] };
    const withCases = { ...repaired, cases: [lost] };
    const saved = await as.engineer.post(`/api/studies/${s.id}/revisions`).send({ version: 1, content: { circuit: withCases }, message: 'lost-neutral case' });
    expect(saved.status).toBe(201);
    expect((await as.viewer.get(`/api/studies/${s.id}`)).body.content.circuit.cases).toEqual([lost]);
    const d = await as.viewer.get(`/api/studies/${s.id}/diff`);
    expect(d.body.cases.map((c: { text: string }) => c.text)).toEqual(['case "Neutral lost" added (1 change)', 'case "Neutral lost": DROP open n added']);
    expect(d.body.circuit).toEqual([]);
    // export, then import: the cases come back as they were
    const file = JSON.parse((await as.viewer.get(`/api/studies/${s.id}/export`)).text);
    expect(file.circuit.cases).toEqual([lost]);
    const imported = await as.engineer.post('/api/studies/import').send(file);
    expect(imported.status).toBe(201);
    expect((await as.engineer.get(`/api/studies/${imported.body.id}`)).body.content.circuit.cases).toEqual([lost]);
    // a malformed case is refused with its path
    const bad = await as.engineer.post(`/api/studies/${s.id}/revisions`).send({ version: 2, content: { circuit: { ...repaired, cases: [lost, lost] } } });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields)).toContain('content.circuit.cases[1].id');
  });

  it('diffs two revisions with element changes and result deltas with units', async () => {
    const s = await newStudy();
    await as.engineer.patch(`/api/studies/${s.id}`).send({ version: 1, content: { circuit: repaired } });
    const d = await as.viewer.get(`/api/studies/${s.id}/diff`);
    expect(d.status).toBe(200);
    expect(d.body).toMatchObject({ from: 1, to: 2, elements: { added: [], removed: [], changed: [{ id: 'DROP' }] } });
    const texts = d.body.results.map((r: { text: string }) => r.text);
    expect(texts.some((x: string) => /^neutral current at HOUSE \(DROP\): 0\.0 A → \d+\.\d A$/.test(x))).toBe(true);
    expect(d.body.flags.removed.length).toBeGreaterThan(0);
    const back = await as.viewer.get(`/api/studies/${s.id}/diff?from=2&to=1`);
    expect(back.body.flags.added.map((f: { text: string }) => f.text)).toContainEqual(expect.stringMatching(/^flag added: bus HOUSE/));
    expect((await as.viewer.get(`/api/studies/${s.id}/diff?from=5&to=1`)).status).toBe(404);
    expect((await as.viewer.get(`/api/studies/${s.id}/diff?from=x`)).status).toBe(400);
    expect((await outsider.get(`/api/studies/${s.id}/diff`)).status).toBe(404);
  });
});

/** Brings a new study (authored and submitted by `engineer`, reviewer `reviewer`) to `state`. */
async function studyIn(state: 'draft' | 'in-review' | 'changes-requested' | 'approved') {
  const s = await newStudy('engineer');
  if (state === 'draft') return s.id;
  expect((await review('engineer', s.id, { action: 'request', reviewers: [people.reviewer.id] })).status).toBe(200);
  if (state === 'in-review') return s.id;
  const action = state === 'approved' ? { action: 'approve', acknowledgeViolations: true } : { action: 'request-changes', message: 'Add the rod resistance' };
  expect((await review('reviewer', s.id, action)).status).toBe(200);
  return s.id;
}

describe('review state machine: every transition × every role', () => {
  // engineer is the author (created the revision and requested review); reviewer is the chosen reviewer.
  const cases: { from: 'draft' | 'in-review' | 'changes-requested' | 'approved'; action: 'request' | 'approve' | 'request-changes'; expect: Record<Who, number>; to?: string }[] = [
    { from: 'draft', action: 'request', to: 'in-review', expect: { owner: 200, owner2: 200, engineer: 200, engineer2: 200, reviewer: 403, reviewer2: 403, viewer: 403 } },
    { from: 'changes-requested', action: 'request', to: 'in-review', expect: { owner: 200, owner2: 200, engineer: 200, engineer2: 200, reviewer: 403, reviewer2: 403, viewer: 403 } },
    { from: 'in-review', action: 'approve', to: 'approved', expect: { owner: 200, owner2: 200, engineer: 403, engineer2: 403, reviewer: 200, reviewer2: 403, viewer: 403 } },
    { from: 'in-review', action: 'request-changes', to: 'changes-requested', expect: { owner: 200, owner2: 200, engineer: 403, engineer2: 403, reviewer: 200, reviewer2: 403, viewer: 403 } },
    { from: 'in-review', action: 'request', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 403, reviewer2: 403, viewer: 403 } },
    { from: 'approved', action: 'request', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 403, reviewer2: 403, viewer: 403 } },
    { from: 'draft', action: 'approve', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 409, reviewer2: 409, viewer: 403 } },
    { from: 'changes-requested', action: 'approve', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 409, reviewer2: 409, viewer: 403 } },
    { from: 'approved', action: 'approve', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 409, reviewer2: 409, viewer: 403 } },
    { from: 'draft', action: 'request-changes', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 409, reviewer2: 409, viewer: 403 } },
    { from: 'approved', action: 'request-changes', expect: { owner: 409, owner2: 409, engineer: 409, engineer2: 409, reviewer: 409, reviewer2: 409, viewer: 403 } },
  ];
  describe.each(cases)('$action from $from', (c) => {
    it.each(WHO)('as %s', async (who) => {
      const id = await studyIn(c.from);
      const reviewers = [who === 'reviewer2' ? people.reviewer.id : people.reviewer2.id];
      const body = c.action === 'request' ? { action: 'request', reviewers } : c.action === 'approve' ? { action: 'approve', acknowledgeViolations: true } : { action: 'request-changes', message: 'Check the rod' };
      const res = await review(who, id, body);
      expect(res.status, JSON.stringify(res.body)).toBe(c.expect[who]);
      const after = await study(id);
      if (res.status === 200) {
        expect(res.body.status).toBe(c.to);
        expect(after.status).toBe(c.to);
        expect(res.body.events.at(-1)).toMatchObject({ action: c.action, fromStatus: c.from, toStatus: c.to, actor: { id: people[who].id } });
      } else {
        expect(after.status).toBe(c.from); // nothing changed
        expect(res.body.error.code).toBe(res.status === 409 ? 'conflict' : 'forbidden');
      }
    });
  });
});

describe('review rules', () => {
  it('refuses self-approval: neither the requester nor the author of the revision under review may approve', async () => {
    // An owner submits their own study, naming another owner too: they still cannot approve it.
    const mine = await newStudy('owner');
    expect((await review('owner', mine.id, { action: 'request', reviewers: [people.owner2.id] })).status).toBe(200);
    const self = await review('owner', mine.id, { action: 'approve', acknowledgeViolations: true });
    expect(self.status).toBe(403);
    expect(self.body.error.message).toBe('You cannot approve your own study; another reviewer or owner must.');

    // owner2 wrote the revision; engineer requests review from owner2: owner2 is its author all the same.
    const s = await newStudy('engineer');
    const edit = await as.owner2.patch(`/api/studies/${s.id}`).send({ version: 1, content: { circuit: repaired } });
    expect(edit.status).toBe(200);
    expect((await review('engineer', s.id, { action: 'request', reviewers: [people.owner2.id] })).status).toBe(200);
    expect((await review('owner2', s.id, { action: 'approve', acknowledgeViolations: true })).status).toBe(403);
    expect((await review('owner2', s.id, { action: 'request-changes', message: 'x' })).status).toBe(403);
    expect((await review('owner', s.id, { action: 'approve', acknowledgeViolations: true })).status).toBe(200);
  });

  it('validates the reviewers of a request', async () => {
    const s = await newStudy('engineer');
    const none = await review('engineer', s.id, { action: 'request' });
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toHaveProperty('reviewers');
    for (const reviewers of [[people.engineer.id], [people.viewer.id], [randomUUID()]]) {
      const res = await review('engineer', s.id, { action: 'request', reviewers });
      expect(res.status).toBe(400);
      expect(res.body.error.fields).toHaveProperty('reviewers');
    }
    const noMessage = await review('reviewer', await studyIn('in-review'), { action: 'request-changes' });
    expect(noMessage.status).toBe(400);
    expect(noMessage.body.error.fields).toHaveProperty('message');
  });

  it('binds an approval to the revision under review; an edit afterwards returns to draft and keeps the record', async () => {
    const id = await studyIn('in-review');
    const wrong = await review('reviewer', id, { action: 'approve', acknowledgeViolations: true, revision: 7 });
    expect(wrong.status).toBe(409);
    const ok = await review('reviewer', id, { action: 'approve', acknowledgeViolations: true, revision: 1, message: 'Matches the field readings' });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: 'approved', approvedRevision: 1, review: { revision: 1, requestedBy: { id: people.engineer.id }, reviewers: [{ id: people.reviewer.id }] } });

    const before = await study(id);
    expect(before).toMatchObject({ status: 'approved', approvedRevision: 1, revision: 1 });
    const edit = await as.engineer.patch(`/api/studies/${id}`).send({ version: before.version, content: { circuit: repaired } });
    expect(edit.body).toMatchObject({ status: 'draft', approvedRevision: null, revision: 2 });
    const state = await as.viewer.get(`/api/studies/${id}/review`);
    expect(state.body.events.map((e: { action: string }) => e.action)).toEqual(['request', 'approve', 'reset']);
    expect(state.body.events[1]).toMatchObject({ revision: 1, message: 'Matches the field readings', actor: { name: 'Rhea Reviewer' } });
    expect(state.body.events[2]).toMatchObject({ revision: 1, fromStatus: 'approved', toStatus: 'draft' });

    // A rename does not disturb an approval.
    const id2 = await studyIn('approved');
    const s2 = await study(id2);
    const renamed = await as.engineer.patch(`/api/studies/${id2}`).send({ version: s2.version, name: 'Renamed after approval' });
    expect(renamed.body.status).toBe('approved');
  });

  it('mails and notifies each step: request → reviewers, changes requested and approval → the author', async () => {
    const s = await newStudy('engineer');
    const name = (await study(s.id)).name;
    await review('engineer', s.id, { action: 'request', reviewers: [people.reviewer2.id], message: 'Please look at <the> neutral' });
    const toReviewer = (await mailTo('reviewer2')).filter((m) => m.subject === `Review requested: ${name}`);
    expect(toReviewer).toHaveLength(1);
    const full = await t.mailer.get(teamId, toReviewer[0].id);
    expect(full!.text).toContain('> Please look at <the> neutral');
    expect(full!.html).toContain('Please look at &lt;the&gt; neutral');

    await review('reviewer2', s.id, { action: 'request-changes', message: 'Add the rod' });
    expect((await mailTo('engineer')).map((m) => m.subject)).toContain(`Changes requested: ${name}`);
    const fixed = await as.engineer.patch(`/api/studies/${s.id}`).send({ version: 1, content: { circuit: repaired }, message: 'Rod added' });
    expect(fixed.body.status).toBe('draft');
    await review('engineer', s.id, { action: 'request', reviewers: [people.reviewer2.id] });
    expect((await study(s.id)).review.revision).toBe(2);
    await review('reviewer2', s.id, { action: 'approve', acknowledgeViolations: true, revision: 2 });
    expect((await mailTo('engineer')).map((m) => m.subject)).toContain(`Approved: ${name}`);

    const notes = await as.engineer.get('/api/notifications');
    expect(notes.status).toBe(200);
    const kinds = notes.body.items.filter((n: { study: { id: string } | null }) => n.study?.id === s.id).map((n: { kind: string }) => n.kind);
    expect(kinds).toEqual(['approved', 'changes-requested']);
    expect(notes.body.unread).toBeGreaterThanOrEqual(2);
    const one = await as.engineer.post('/api/notifications/read').send({ ids: [notes.body.items[0].id] });
    expect(one.body.unread).toBe(notes.body.unread - 1);
    expect((await as.engineer.post('/api/notifications/read').send({})).body.unread).toBe(0);
    expect((await as.engineer.get('/api/notifications')).body.items.every((n: { read: boolean }) => n.read)).toBe(true);
  });
});

describe('comments', () => {
  let id: string;
  beforeAll(async () => {
    id = (await newStudy('engineer')).id;
  });

  it('lets viewers read but not comment', async () => {
    expect((await as.viewer.get(`/api/studies/${id}/comments`)).status).toBe(200);
    const res = await as.viewer.post(`/api/studies/${id}/comments`).send({ body: 'hi' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('returns a comment with <script> verbatim as JSON text, mails the mention escaped', async () => {
    const body = `<script>alert("x")</script> @${people.engineer.email.split('@')[0]} the neutral & the rod`;
    const res = await as.reviewer.post(`/api/studies/${id}/comments`).send({ body, anchor: { elementId: 'DROP' } });
    expect(res.status).toBe(201);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    expect(res.body).toMatchObject({ body, anchor: { elementId: 'DROP' }, revision: 1, mentions: [{ id: people.engineer.id }], resolved: false, deleted: false });
    const list = await as.viewer.get(`/api/studies/${id}/comments`);
    expect(list.body.items.find((c: { id: string }) => c.id === res.body.id).body).toBe(body);

    const mails = (await mailTo('engineer')).filter((m) => m.subject.startsWith('Rhea Reviewer mentioned you'));
    expect(mails).toHaveLength(1);
    const mail = await t.mailer.get(teamId, mails[0].id);
    expect(mail!.text).toContain(body);
    expect(mail!.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
    expect(mail!.html).not.toContain('<script');
    const notes = await as.engineer.get('/api/notifications');
    expect(notes.body.items[0]).toMatchObject({ kind: 'mention', actor: { name: 'Rhea Reviewer' }, study: { id } });
  });

  it('anchors to elements of the study or to result rows, and keeps the anchor when the layout moves', async () => {
    const bad = await as.reviewer.post(`/api/studies/${id}/comments`).send({ body: 'where?', anchor: { elementId: 'NOPE' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty(['anchor.elementId']);
    const row = await as.reviewer.post(`/api/studies/${id}/comments`).send({ body: 'this value', anchor: { resultRow: { table: 'buses', key: 'HOUSE' } } });
    expect(row.status).toBe(201);
    const s = await study(id);
    await as.engineer.patch(`/api/studies/${id}`).send({ version: s.version, content: { ...s.content, layout: { DROP: { x: 300, y: 40 } } } });
    const list = await as.viewer.get(`/api/studies/${id}/comments`);
    expect(list.body.items.find((c: { id: string }) => c.id === row.body.id).anchor).toEqual({ resultRow: { table: 'buses', key: 'HOUSE' } });
    expect(list.body.items.filter((c: { anchor: unknown }) => JSON.stringify(c.anchor) === '{"elementId":"DROP"}')).toHaveLength(1);
  });

  it('threads replies under the root, resolves threads, edits and deletes own comments', async () => {
    const root = (await as.reviewer.post(`/api/studies/${id}/comments`).send({ body: 'Root' })).body;
    const reply = (await as.engineer.post(`/api/studies/${id}/comments`).send({ body: 'Reply', parentId: root.id })).body;
    const nested = await as.owner.post(`/api/studies/${id}/comments`).send({ body: 'Reply to reply', parentId: reply.id });
    expect(nested.body.parentId).toBe(root.id);
    expect((await as.owner.post(`/api/studies/${id}/comments`).send({ body: 'x', parentId: root.id, anchor: { elementId: 'DROP' } })).status).toBe(400);
    expect((await as.owner.post(`/api/studies/${id}/comments`).send({ body: 'x', parentId: randomUUID() })).status).toBe(400);
    expect((await as.owner.post(`/api/studies/${id}/comments`).send({ body: '   ' })).status).toBe(400);

    expect((await as.engineer.patch(`/api/studies/${id}/comments/${root.id}`).send({ body: 'Hijacked' })).status).toBe(403);
    const edited = await as.reviewer.patch(`/api/studies/${id}/comments/${root.id}`).send({ body: 'Root, edited' });
    expect(edited.body).toMatchObject({ body: 'Root, edited', editedAt: expect.any(String) });
    const resolved = await as.engineer.patch(`/api/studies/${id}/comments/${root.id}`).send({ resolved: true });
    expect(resolved.body).toMatchObject({ resolved: true, resolvedBy: { id: people.engineer.id } });
    expect((await as.engineer.patch(`/api/studies/${id}/comments/${reply.id}`).send({ resolved: true })).status).toBe(400);
    expect((await as.reviewer2.patch(`/api/studies/${id}/comments/${root.id}`).send({ resolved: false })).body.resolved).toBe(false);
    expect((await as.viewer.patch(`/api/studies/${id}/comments/${root.id}`).send({ resolved: true })).status).toBe(403);

    expect((await as.reviewer.delete(`/api/studies/${id}/comments/${reply.id}`)).status).toBe(403);
    expect((await as.engineer.delete(`/api/studies/${id}/comments/${reply.id}`)).status).toBe(204);
    expect((await as.owner.delete(`/api/studies/${id}/comments/${root.id}`)).status).toBe(204); // owners moderate
    expect((await as.owner.delete(`/api/studies/${id}/comments/${root.id}`)).status).toBe(404);
    const list = await as.viewer.get(`/api/studies/${id}/comments`);
    expect(list.body.items.find((c: { id: string }) => c.id === reply.id)).toMatchObject({ deleted: true, body: '' });
    expect((await outsider.get(`/api/studies/${id}/comments`)).status).toBe(404);
    expect((await outsider.patch(`/api/studies/${id}/comments/${nested.body.id}`).send({ resolved: true })).status).toBe(404);
  });
});

describe('templates', () => {
  it('marks only approved studies; the gallery matches the list filter; new-from-template records its origin', async () => {
    const draft = await newStudy('engineer');
    const refused = await as.engineer.patch(`/api/studies/${draft.id}`).send({ version: 1, isTemplate: true });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toBe('Only an approved study can be marked as a template (this one is draft).');

    const id = await studyIn('approved');
    const s = await study(id);
    const marked = await as.owner.patch(`/api/studies/${id}`).send({ version: s.version, isTemplate: true });
    expect(marked.status).toBe(200);
    const gallery = await as.viewer.get('/api/templates');
    const listed = await as.viewer.get('/api/studies?template=true&pageSize=100');
    expect(gallery.body.items.map((x: { id: string }) => x.id).sort()).toEqual(listed.body.items.map((x: { id: string }) => x.id).sort());
    expect(gallery.body.items.map((x: { id: string }) => x.id)).toContain(id);

    const copy = await as.engineer2.post(`/api/studies/${id}/clone`).send({ name: 'Lane 16 from template' });
    expect(copy.status).toBe(201);
    const c = await study(copy.body.id);
    expect(c).toMatchObject({ status: 'draft', isTemplate: false, revision: 1, clonedFrom: { id }, clonedFromRevision: 1 });
    expect(c.content).toEqual(s.content);
    const history = await as.viewer.get(`/api/studies/${copy.body.id}/revisions`);
    expect(history.body.items[0].message).toMatch(/^New from template ".*" revision 1$/);

    // Editing the template's content returns it to draft and unmarks it.
    const edited = await as.engineer.patch(`/api/studies/${id}`).send({ version: marked.body.version, content: { circuit: repaired } });
    expect(edited.body).toMatchObject({ status: 'draft', isTemplate: false });
    expect((await as.viewer.get('/api/templates')).body.items.map((x: { id: string }) => x.id)).not.toContain(id);
  });
});

describe('audit', () => {
  it('records revisions, review actions, comments and template changes; owners filter by action prefix and actor', async () => {
    const id = await studyIn('approved');
    const res = await as.owner.get(`/api/audit?studyId=${id}&action=review.`);
    expect(res.body.items.map((e: { action: string }) => e.action).sort()).toEqual(['review.approve', 'review.request']);
    const byReviewer = await as.owner.get(`/api/audit?studyId=${id}&actor=${people.reviewer.id}`);
    expect(byReviewer.body.items.map((e: { action: string }) => e.action)).toEqual(['review.approve']);
    const revisions = await as.owner.get(`/api/audit?studyId=${id}&action=revision.create`);
    expect(revisions.body.total).toBe(1);
    expect((await as.owner.get('/api/audit?action=comment.')).body.total).toBeGreaterThan(0);
    expect((await as.owner.get('/api/audit?action=%25')).body.total).toBe(0); // % is literal, never a wildcard
  });
});
