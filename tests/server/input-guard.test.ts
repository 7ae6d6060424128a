/**
 * The input boundary (server/input-guard.ts, shared/api/limits.ts, the error middleware): one
 * regression test per case that used to answer 500, each now a 4xx with a field message.
 */
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { INT32_MAX, JSON_MAX_DEPTH } from '../../shared/api/limits.ts';
import type { Db } from '../../server/db/index.ts';
import { accountMail, APP_URL, type TestApp } from './helpers.ts';
import { closeTeamStudy, openTeamStudy, teamStudyCircuit } from './team-study.ts';
import { deep, toJson } from './fuzz/fuzz-kit.ts';

const circuit = teamStudyCircuit;

let db: Db, t: TestApp, owner: TestAgent, engineer: TestAgent, studyId: string;
beforeAll(async () => void ({ db, t, owner, engineer, studyId } = await openTeamStudy('Boundary team', 'Boundary study')));

afterAll(() => closeTeamStudy({ db, t }));

const json = (agent: TestAgent, method: 'post' | 'patch', url: string, body: string) =>
  agent[method](url).set('Origin', APP_URL).set('Content-Type', 'application/json').send(body);

describe('NUL characters and lone surrogates are refused with 400 and a field message', () => {
  it('in a study name (NUL and a lone high or low surrogate)', async () => {
    for (const name of ['\u0000', 'Feeder\u0000 7', 'Feeder \ud800', '\udc00 Feeder']) {
      const res = await json(engineer, 'post', '/api/studies', JSON.stringify({ name }));
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.code).toBe('validation');
      expect(res.body.error.fields.name).toMatch(/cannot be stored/);
    }
    // A whole surrogate pair (an emoji) is fine.
    expect((await json(engineer, 'post', '/api/studies', JSON.stringify({ name: 'Feeder 🙂' }))).status).toBe(201);
  });

  it('in ?q= and the audit filters', async () => {
    const q = await engineer.get('/api/studies?q=%00');
    expect(q.status).toBe(400);
    expect(q.body.error.fields).toHaveProperty('q');
    for (const filter of ['action=%00', 'actor=%00', 'studyId=a%00b']) {
      const res = await owner.get(`/api/audit?${filter}`);
      expect(res.status, filter).toBe(400);
      expect(Object.keys(res.body.error.fields)).toEqual([filter.split('=')[0]]);
    }
  });

  it('in the sign-up team name', async () => {
    const res = await json(request.agent(t.app).set('Origin', APP_URL), 'post', '/api/auth/sign-up', JSON.stringify({ name: 'N', email: 'nul-team@example.test', password: 'a long passphrase here', teamName: 'Team\u0000' }));
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('teamName');
  });

  it('in layout JSON, keys included', async () => {
    const bad = await json(engineer, 'post', '/api/studies', JSON.stringify({ name: 'L', content: { circuit, layout: { nodes: { A: { label: 'x\u0000' } } } } }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty(['content.layout.nodes.A.label']);
    const key = await json(engineer, 'post', '/api/studies', JSON.stringify({ name: 'L', content: { circuit, layout: { '\ud800': 1 } } }));
    expect(key.status).toBe(400);
  });

  it('in a path parameter', async () => {
    const res = await engineer.get('/api/studies/%00');
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('path');
  });

  it('a session cookie holding a NUL or broken text is no session (401), and is cleared', async () => {
    for (const value of ['%00', 'abc%00def', '%ED%A0%80', 'a'.repeat(500)]) {
      const res = await request(t.app).get('/api/auth/me').set('Cookie', `wyeward_session=${value}`);
      expect(res.status, value).toBe(401);
      expect(String(res.headers['set-cookie'])).toMatch(/wyeward_session=;/);
    }
  });
});

describe('numbers and ids', () => {
  it(`PATCH with version ${INT32_MAX + 1} is 400 (it does not fit the column), ${INT32_MAX} a version conflict`, async () => {
    const over = await json(engineer, 'patch', `/api/studies/${studyId}`, JSON.stringify({ version: INT32_MAX + 1, name: 'x' }));
    expect(over.status).toBe(400);
    expect(over.body.error.fields).toHaveProperty('version');
    const max = await json(engineer, 'patch', `/api/studies/${studyId}`, JSON.stringify({ version: INT32_MAX, name: 'x' }));
    expect(max.status).toBe(409);
    const diff = await engineer.get(`/api/studies/${studyId}/diff?from=2147483648`);
    expect(diff.status).toBe(400);
  });

  it('POST /api/notifications/read with malformed ids answers, never touching the database with them', async () => {
    const res = await json(engineer, 'post', '/api/notifications/read', JSON.stringify({ ids: ['------------------------------------', 'x', '\u0000'] }));
    expect(res.status).toBe(400); // the NUL is refused at the boundary
    const ok = await json(engineer, 'post', '/api/notifications/read', JSON.stringify({ ids: ['------------------------------------', 'not-a-uuid'] }));
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ unread: 0 });
  });

  it('malformed ids in paths are 404, in audit filters an empty page', async () => {
    expect((await engineer.get('/api/studies/not-a-uuid')).status).toBe(404);
    expect((await engineer.get(`/api/studies/${studyId}/comments/xyz`)).status).toBe(404);
    const audit = await owner.get('/api/audit?actor=------------------------------------');
    expect(audit.status).toBe(200);
    expect(audit.body).toEqual({ items: [], total: 0 });
  });
});

describe('uploads', () => {
  const b = 'boundary42';
  it('a broken multipart body is 400', async () => {
    for (const body of [
      `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\na,b`, // truncated
      `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a\r\nb.csv"\r\n\r\na,b\r\n--${b}--\r\n`, // CRLF in the file name
      'garbage',
    ]) {
      const res = await engineer
        .post(`/api/studies/${studyId}/attachments`)
        .set('Origin', APP_URL)
        .set('Content-Type', `multipart/form-data; boundary=${b}`)
        .send(Buffer.from(body));
      expect(res.status, JSON.stringify(res.body)).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
    }
  });

  it('a file name with control characters is stored cleaned (a NUL or CRLF breaks the part header: 400 above)', async () => {
    const res = await engineer
      .post(`/api/studies/${studyId}/attachments`)
      .set('Origin', APP_URL)
      .attach('file', Buffer.from('a,b\n1,2\n'), { filename: 'read\tings.csv', contentType: 'text/csv' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.fileName).toBe('readings.csv');
  });
});

describe('JSON depth', () => {
  it(`a layout nested 3 000 deep is refused on create, edit and import (limit ${JSON_MAX_DEPTH}), so the diff keeps working`, async () => {
    for (const depth of [3000, 4500, JSON_MAX_DEPTH + 1]) {
      const create = await json(engineer, 'post', '/api/studies', toJson({ name: 'Deep', content: { circuit, layout: deep(depth) } }));
      expect(create.status, `create ${depth}`).toBe(400);
      expect(create.body.error.message).toMatch(/levels deep/);
      const edit = await json(engineer, 'patch', `/api/studies/${studyId}`, toJson({ version: 1, content: { circuit, layout: deep(depth, 'object') } }));
      expect(edit.status).toBe(400);
      const imp = await json(engineer, 'post', '/api/studies/import', toJson({ format: 'wyeward-study', version: 1, name: 'I', circuit, layout: deep(depth) }));
      expect(imp.status).toBe(400);
    }
    const ok = await json(engineer, 'post', '/api/studies', toJson({ name: 'Moderate', content: { circuit, layout: deep(20) } }));
    expect(ok.status).toBe(201);
    expect((await engineer.get(`/api/studies/${ok.body.id}/diff`)).status).toBe(200);
    expect((await engineer.get(`/api/studies/${studyId}/diff`)).status).toBe(200);
  });
});

describe('unique-key races', () => {
  it('two simultaneous sign-up confirmations for one e-mail: one account is made, the other answer is 409', async () => {
    const body = { name: 'Racer', email: 'race@example.test', password: 'a long passphrase here', teamName: 'Race team' };
    const tokens: string[] = [];
    for (let i = 1; i <= 2; i++) {
      expect((await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send(body)).status).toBe(202);
      const mail = await accountMail(t.mailer, body.email, i);
      tokens.push(/\/sign-up\/confirm#([A-Za-z0-9_-]+)/.exec(mail.text)![1]);
    }
    const [a, b] = await Promise.all(tokens.map((token) => request(t.app).post('/api/auth/sign-up/confirm').set('Origin', APP_URL).send({ token })));
    expect([a.status, b.status].sort()).toEqual([201, 409]);
    const loser = a.status === 409 ? a : b;
    expect(loser.body.error).toMatchObject({ code: 'conflict' });
  });
});
