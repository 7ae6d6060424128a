/** Studies API behaviour: versioned updates without lost writes, listing, clone/template, soft delete, audit, and error shapes. */
import { randomUUID } from 'node:crypto';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { JSON_LIMIT } from '../../server/app.ts';
import { closeDb, queryRows, type Db } from '../../server/db/index.ts';
import { circuitWith, makeApp, markApproved, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

let db: Db;
let t: TestApp;
let engineer: TestAgent;
let owner: TestAgent;
let viewer: TestAgent;
let ownerAgentId: string;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Studies team');
  const o = await makeUser(db, team, 'owner', 'Ola Owner');
  const e = await makeUser(db, team, 'engineer', 'Edda Engineer');
  const v = await makeUser(db, team, 'viewer', 'Vik Viewer');
  ownerAgentId = o.id;
  owner = await signedIn(t.app, o.email);
  engineer = await signedIn(t.app, e.email);
  viewer = await signedIn(t.app, v.email);
});

afterAll(async () => {
  await closeDb(db);
});

async function create(agent: TestAgent, body: object) {
  const res = await agent.post('/api/studies').send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as { id: string; version: number };
}

describe('create and read', () => {
  it('creates a study with an empty 60 Hz circuit when no content is given', async () => {
    const { id, version } = await create(engineer, { name: '  Millbrook lateral  ', description: 'Open-neutral check' });
    expect(version).toBe(1);
    const res = await viewer.get(`/api/studies/${id}`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      id,
      name: 'Millbrook lateral',
      description: 'Open-neutral check',
      status: 'draft',
      isTemplate: false,
      version: 1,
      elementCount: 0,
      createdBy: { name: 'Edda Engineer' },
      updatedBy: { name: 'Edda Engineer' },
      clonedFrom: null,
      content: { circuit: { format: 'wyeward-circuit', version: 1, frequencyHz: 60, elements: [] } },
    });
    expect(Date.parse(res.body.createdAt)).not.toBeNaN();
  });

  it('keeps the given content and counts its elements', async () => {
    const content = { ...circuitWith(3), layout: { nodes: [{ id: 'el0', x: 10, y: 20 }] } };
    const { id } = await create(engineer, { name: 'With content', content });
    const res = await engineer.get(`/api/studies/${id}`);
    expect(res.body.elementCount).toBe(3);
    expect(res.body.content).toEqual(content);
  });
});

describe('versioned update', () => {
  it('increments the version by one and records who changed it', async () => {
    const { id } = await create(engineer, { name: 'Versioned' });
    const res = await owner.patch(`/api/studies/${id}`).send({ version: 1, description: 'checked' });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(2);
    expect(res.body.description).toBe('checked');
    expect(res.body.updatedBy).toEqual({ id: ownerAgentId, name: 'Ola Owner' });
    expect(res.body.createdBy.name).toBe('Edda Engineer');
  });

  it('refuses a stale version with 409 and the current study, and loses neither write', async () => {
    const { id } = await create(engineer, { name: 'Contested', description: 'original' });
    // Both open version 1; the owner saves first.
    const first = await owner.patch(`/api/studies/${id}`).send({ version: 1, description: 'owner edit' });
    expect(first.status).toBe(200);
    const stale = await engineer.patch(`/api/studies/${id}`).send({ version: 1, name: 'Engineer rename' });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('version-conflict');
    expect(stale.body.error.message).toMatch(/Ola Owner/);
    expect(stale.body.current).toMatchObject({ id, version: 2, name: 'Contested', description: 'owner edit' });
    // Nothing of the stale edit was written; the owner's edit is intact.
    const now = await viewer.get(`/api/studies/${id}`);
    expect(now.body).toMatchObject({ version: 2, name: 'Contested', description: 'owner edit' });
    // Re-applied on the current version, the engineer's edit lands on top of the owner's.
    const retry = await engineer.patch(`/api/studies/${id}`).send({ version: 2, name: 'Engineer rename' });
    expect(retry.status).toBe(200);
    expect(retry.body).toMatchObject({ version: 3, name: 'Engineer rename', description: 'owner edit' });
  });

  it('lets exactly one of two concurrent saves of the same version win', async () => {
    const { id } = await create(engineer, { name: 'Race' });
    const [a, b] = await Promise.all([
      owner.patch(`/api/studies/${id}`).send({ version: 1, description: 'A' }),
      engineer.patch(`/api/studies/${id}`).send({ version: 1, description: 'B' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const winner = a.status === 200 ? 'A' : 'B';
    const now = await viewer.get(`/api/studies/${id}`);
    expect(now.body).toMatchObject({ version: 2, description: winner });
  });
});

describe('list', () => {
  let ids: Record<string, string>;
  beforeAll(async () => {
    const team = await makeTeam(db, 'List team');
    const e = await makeUser(db, team, 'engineer');
    const a = await signedIn(t.app, e.email);
    ids = {};
    for (const name of ['Delta bank Ridgeway', 'Ashgrove open neutral', 'cedar split-phase', '100%_literal']) {
      ids[name] = (await create(a, { name })).id;
    }
    await markApproved(db, ids['Delta bank Ridgeway']);
    expect((await a.patch(`/api/studies/${ids['Delta bank Ridgeway']}`).send({ version: 1, isTemplate: true })).status).toBe(200);
    await a.delete(`/api/studies/${ids['cedar split-phase']}`);
    listAgent = a;
  });
  let listAgent: TestAgent;
  const names = (body: { items: { name: string }[] }) => body.items.map((i) => i.name);

  it('sorts by name case-insensitively and excludes deleted studies', async () => {
    const res = await listAgent.get('/api/studies?sort=name&dir=asc');
    expect(res.status).toBe(200);
    expect(names(res.body)).toEqual(['100%_literal', 'Ashgrove open neutral', 'Delta bank Ridgeway']);
    expect(res.body).toMatchObject({ total: 3, page: 1, pageSize: 20 });
  });

  it('lists the most recently changed first by default', async () => {
    const res = await listAgent.get('/api/studies');
    expect(names(res.body)[0]).toBe('Delta bank Ridgeway');
  });

  it('searches names case-insensitively and treats % and _ literally', async () => {
    expect(names((await listAgent.get('/api/studies?q=OPEN')).body)).toEqual(['Ashgrove open neutral']);
    expect(names((await listAgent.get('/api/studies?q=%25_')).body)).toEqual(['100%_literal']);
    expect((await listAgent.get('/api/studies?q=cedar')).body.total).toBe(0);
  });

  it('filters templates', async () => {
    expect(names((await listAgent.get('/api/studies?template=true')).body)).toEqual(['Delta bank Ridgeway']);
    expect((await listAgent.get('/api/studies?template=false')).body.total).toBe(2);
  });

  it('paginates with the total of all pages', async () => {
    const p1 = await listAgent.get('/api/studies?sort=name&dir=asc&pageSize=2&page=1');
    const p2 = await listAgent.get('/api/studies?sort=name&dir=asc&pageSize=2&page=2');
    expect(names(p1.body)).toEqual(['100%_literal', 'Ashgrove open neutral']);
    expect(names(p2.body)).toEqual(['Delta bank Ridgeway']);
    expect(p2.body).toMatchObject({ total: 3, page: 2, pageSize: 2 });
  });

  it('answers 400 with fields to a bad query', async () => {
    const res = await listAgent.get('/api/studies?pageSize=0&sort=colour');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['pageSize', 'sort']);
  });
});

describe('templates, clone and delete', () => {
  it('starts a study from a template: a draft copy that records its source and is not a template', async () => {
    const { id } = await create(engineer, { name: 'Service template', content: circuitWith(2) });
    await markApproved(db, id);
    const marked = await engineer.patch(`/api/studies/${id}`).send({ version: 1, isTemplate: true });
    expect(marked.body.isTemplate).toBe(true);
    const clone = await engineer.post(`/api/studies/${id}/clone`).send({ name: 'Service at 14 Quarry Lane' });
    expect(clone.status).toBe(201);
    expect(clone.body.version).toBe(1);
    const copy = await engineer.get(`/api/studies/${clone.body.id}`);
    expect(copy.body).toMatchObject({
      name: 'Service at 14 Quarry Lane',
      isTemplate: false,
      status: 'draft',
      elementCount: 2,
      clonedFrom: { id, name: 'Service template' },
    });
  });

  it('names an unnamed copy after its source', async () => {
    const { id } = await create(engineer, { name: 'Feeder 7' });
    const clone = await owner.post(`/api/studies/${id}/clone`);
    expect(clone.status).toBe(201);
    expect((await owner.get(`/api/studies/${clone.body.id}`)).body.name).toBe('Feeder 7 (copy)');
  });

  it('keeps "(copy)" on the copy of a study whose name is as long as allowed, cutting whole characters', async () => {
    const long = `${'Wrenfold pillar '.repeat(12)}🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌🔌`.slice(0, 200);
    const { id } = await create(engineer, { name: long });
    const clone = await owner.post(`/api/studies/${id}/clone`);
    expect(clone.status).toBe(201);
    const name = (await owner.get(`/api/studies/${clone.body.id}`)).body.name as string;
    expect(name.endsWith(' (copy)')).toBe(true);
    expect(name.length).toBeLessThanOrEqual(200);
    expect(long.startsWith(name.slice(0, -' (copy)'.length))).toBe(true);
    expect(name).not.toMatch(/[\uD800-\uDBFF](?![\uDC00-\uDFFF])/); // no half of a surrogate pair
  });

  it('soft-deletes: the study disappears from reads and writes, and the row stays', async () => {
    const { id } = await create(engineer, { name: 'To delete' });
    expect((await engineer.delete(`/api/studies/${id}`)).status).toBe(204);
    expect((await engineer.get(`/api/studies/${id}`)).status).toBe(404);
    expect((await engineer.patch(`/api/studies/${id}`).send({ version: 1, name: 'x' })).status).toBe(404);
    expect((await engineer.delete(`/api/studies/${id}`)).status).toBe(404);
    const rows = await queryRows<{ deleted_at: Date | null }>(db, 'select deleted_at from studies where id = $1', [id]);
    expect(rows).toHaveLength(1);
    expect(rows[0].deleted_at).toBeInstanceOf(Date);
  });
});

describe('audit trail', () => {
  it('records create, update, template change, clone and delete with the actor and study', async () => {
    const { id } = await create(engineer, { name: 'Audited' });
    await markApproved(db, id);
    await engineer.patch(`/api/studies/${id}`).send({ version: 1, name: 'Audited 2', isTemplate: true });
    const clone = await engineer.post(`/api/studies/${id}/clone`).send({});
    await engineer.delete(`/api/studies/${id}`);
    const res = await owner.get(`/api/audit?studyId=${id}`);
    expect(res.status).toBe(200);
    const actions = res.body.items.map((e: { action: string }) => e.action).sort();
    expect(actions).toEqual(['revision.create', 'study.create', 'study.delete', 'study.template', 'study.update']);
    expect(res.body.items.every((e: { actor: { name: string }; studyId: string }) => e.actor.name === 'Edda Engineer' && e.studyId === id)).toBe(true);
    const cloned = await owner.get(`/api/audit?studyId=${clone.body.id}`);
    expect(cloned.body.items.find((e: { action: string }) => e.action === 'study.clone')).toMatchObject({ detail: { sourceId: id } });
  });
});

describe('errors', () => {
  it('answers 400 with per-field messages to invalid bodies', async () => {
    const res = await engineer.post('/api/studies').send({ name: '', content: { circuit: { format: 'other', version: 1, frequencyHz: -5, elements: [] } } });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    expect(res.body.error.fields).toMatchObject({
      name: 'Name is required',
      'content.circuit.format': expect.any(String),
      'content.circuit.frequencyHz': expect.any(String),
    });
  });

  it('answers 400 to a PATCH without a version, and to a non-JSON body', async () => {
    const { id } = await create(engineer, { name: 'Needs version' });
    const noVersion = await engineer.patch(`/api/studies/${id}`).send({ name: 'x' });
    expect(noVersion.status).toBe(400);
    expect(noVersion.body.error.fields).toHaveProperty('version');
    const text = await engineer.post('/api/studies').set('Content-Type', 'text/plain').send('name=hello');
    expect(text.status).toBe(400);
    expect(text.body.error.code).toBe('validation');
  });

  it('answers 400 in the contract shape to malformed JSON', async () => {
    const res = await engineer.post('/api/studies').set('Content-Type', 'application/json').send('{"name": "unterminated');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({ error: { code: 'validation', message: 'The request body is not valid JSON.', fields: { _: 'Malformed JSON' } } });
  });

  it(`answers 413 in the contract shape to a body over ${JSON_LIMIT}`, async () => {
    const huge = JSON.stringify({ name: 'big', description: 'x'.repeat(3 * 1024 * 1024) });
    const res = await engineer.post('/api/studies').set('Content-Type', 'application/json').send(huge);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload-too-large');
    expect(res.body.error.message).toMatch(/too large/);
  });

  it('answers 400 in the contract shape to an undecodable %-escape in the path', async () => {
    const res = await engineer.get('/api/studies/%E0%A4%A');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({ error: { code: 'validation', message: 'The address contains an invalid %-escape.' } });
  });

  it('answers unknown API routes with 404 JSON, also for other methods', async () => {
    for (const res of [await engineer.get('/api/studies-typo'), await engineer.put(`/api/studies/${randomUUID()}`).send({})]) {
      expect(res.status).toBe(404);
      expect(res.headers['content-type']).toMatch(/application\/json/);
      expect(res.body.error.code).toBe('not-found');
    }
  });
});

describe('circuit validation by the engine', () => {
  it('refuses a circuit the engine cannot read, naming the element and field', async () => {
    const content = circuitWith(2);
    (content.circuit.elements[1] as Record<string, unknown>).each = { kw: 'lots', kvar: 0 };
    content.circuit.elements.push({ ...content.circuit.elements[0], type: 'flux-capacitor' } as (typeof content.circuit.elements)[number]);
    const res = await engineer.post('/api/studies').send({ name: 'Bad circuit', content });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    const keys = Object.keys(res.body.error.fields);
    expect(keys.some((k) => k.startsWith('content.circuit.elements[1].each'))).toBe(true);
    expect(res.body.error.fields['content.circuit.elements[2].type']).toMatch(/unknown element type "flux-capacitor"/);
  });

  it('refuses invalid circuit content on PATCH and keeps the stored study', async () => {
    const { id } = await create(engineer, { name: 'Keeps content', content: circuitWith(1) });
    const bad = { circuit: { ...circuitWith(1).circuit, elements: [{ type: 'load', id: 'X' }] } };
    const res = await engineer.patch(`/api/studies/${id}`).send({ version: 1, content: bad });
    expect(res.status).toBe(400);
    const now = await engineer.get(`/api/studies/${id}`);
    expect(now.body.version).toBe(1);
    expect(now.body.content).toEqual(circuitWith(1));
  });
});
