/**
 * User names only, through the API: a study whose neutral was opened with one click (the
 * workspace stores a hidden switch `<element>~<field>~sw` and a private terminal bus) is counted,
 * compared, commented and audited in the names the user drew.
 */
import { randomUUID } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const repaired = { ...demo, elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };
/** The repaired service with the source's neutral opened as the workspace writes it. */
const opened = {
  ...repaired,
  elements: [
    ...repaired.elements.map((e) => (e.id === 'XFMR-SEC' ? { ...e, bus: 'XFMR-SEC~bus' } : e)),
    { type: 'switch3', id: 'XFMR-SEC~bus~sw', from: 'PAD', to: 'XFMR-SEC~bus', conductors: ['a', 'b', 'c', 'n'], closed: true, open: ['n'] },
  ],
};
const INTERNAL = /~|switch3|[{}]|[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}/;

let db: Db;
let t: TestApp;
let engineer: TestAgent;
let owner: TestAgent;
let reviewerId: string;
let teamId: string;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Names team');
  teamId = team;
  const e = await makeUser(db, team, 'engineer', 'Edda Engineer');
  const o = await makeUser(db, team, 'owner', 'Orla Owner');
  reviewerId = (await makeUser(db, team, 'reviewer', 'Rhea Reviewer')).id;
  engineer = await signedIn(t.app, e.email);
  owner = await signedIn(t.app, o.email);
});

afterAll(async () => {
  await t.mailer.close();
  await closeDb(db);
});

async function studyWithOpening() {
  const res = await engineer.post('/api/studies').send({ name: `Opened ${randomUUID().slice(0, 6)}`, content: { circuit: repaired } });
  expect(res.status).toBe(201);
  const id = res.body.id as string;
  const saved = await engineer.patch(`/api/studies/${id}`).send({ version: 1, content: { circuit: opened }, message: 'Source neutral opened' });
  expect(saved.status).toBe(200);
  return id;
}

describe('a study with a neutral opened by one click', () => {
  it('counts the elements drawn: 6, not the 7 stored (list, detail, templates)', async () => {
    const id = await studyWithOpening();
    expect((await engineer.get(`/api/studies/${id}`)).body.elementCount).toBe(6);
    const list = await engineer.get('/api/studies?pageSize=100');
    expect(list.body.items.find((s: { id: string }) => s.id === id).elementCount).toBe(6);
  });

  it('diffs as "neutral of the connection opened" on the source, never as a new switch', async () => {
    const id = await studyWithOpening();
    const d = (await engineer.get(`/api/studies/${id}/diff`)).body;
    expect(d.elements.added).toEqual([]);
    expect(d.elements.changed).toEqual([
      {
        id: 'XFMR-SEC',
        type: 'source',
        typeLabel: 'source',
        changes: [{ path: 'opened.bus', from: null, to: ['n'], label: 'opened conductors of the connection XFMR-SEC–PAD', fromText: 'none', toText: 'neutral' }],
      },
    ]);
    const read = [...d.results.map((r: { text: string }) => r.text), ...d.flags.added.map((f: { text: string }) => f.text), ...d.flags.removed.map((f: { text: string }) => f.text)];
    expect(read.length).toBeGreaterThan(0);
    for (const x of read) expect(x).not.toMatch(INTERNAL);
  });

  it('anchors a comment on the hidden switch to the element the user drew', async () => {
    const id = await studyWithOpening();
    const res = await engineer.post(`/api/studies/${id}/comments`).send({ body: 'Why is the source neutral open?', anchor: { elementId: 'XFMR-SEC~bus~sw' } });
    expect(res.status).toBe(201);
    expect(res.body.anchor).toEqual({ elementId: 'XFMR-SEC' });
    // A mention on a result row of the private terminal bus says where, in words.
    await engineer.post(`/api/studies/${id}/comments`).send({ body: '@Rhea what does the source see?', anchor: { resultRow: { table: 'bus-voltages', key: 'XFMR-SEC~bus' } } });
    const mails = (await t.mailer.list(teamId)).filter((m) => m.subject.startsWith('Edda Engineer mentioned you'));
    expect(mails.length).toBeGreaterThan(0);
    const full = (await t.mailer.get(teamId, mails[0].id))!;
    expect(full.text).toContain('Edda Engineer mentioned you in a comment on bus voltages at XFMR-SEC terminals at PAD of "Opened ');
    expect(full.text.replace(/https?:\/\/\S+/g, '')).not.toMatch(INTERNAL);
  });

  it('writes the audit trail in words: member and study names, revision numbers, no ids or JSON', async () => {
    const id = await studyWithOpening();
    await engineer.post(`/api/studies/${id}/comments`).send({ body: 'Check', anchor: { resultRow: { table: 'bus-voltages', key: 'XFMR-SEC~bus' } } });
    await engineer.post(`/api/studies/${id}/review`).send({ action: 'request', reviewers: [reviewerId] });
    const items = (await owner.get(`/api/audit?studyId=${id}`)).body.items as { actionLabel: string; text: string; study: { name: string } }[];
    const texts = items.map((e) => e.text);
    expect(texts).toContain('asked Rhea Reviewer to review revision 2');
    expect(texts).toContain('commented on bus voltages at XFMR-SEC terminals at PAD');
    expect(texts).toContain('saved revision 2');
    expect(texts).toContain('changed the circuit');
    expect(items.map((e) => e.actionLabel)).toContain('review requested');
    for (const e of items) {
      expect(e.study.name).toMatch(/^Opened /);
      expect(e.text).not.toMatch(INTERNAL);
    }
  });

  it('names an unsolvable revision’s error without internal names in the history', async () => {
    const broken = { ...opened, elements: opened.elements.filter((e) => e.type !== 'source') };
    const res = await engineer.post('/api/studies').send({ name: 'No source', content: { circuit: broken } });
    const list = await engineer.get(`/api/studies/${res.body.id}/revisions`);
    const r = list.body.items[0].results;
    expect(r.ok).toBe(false);
    expect(r.error.message).not.toMatch(INTERNAL);
  });
});
