/**
 * Seeded fuzz of the whole API: a few thousand requests with hostile text (NUL, lone surrogates,
 * CRLF), out-of-range numbers, deep JSON, malformed ids, cookies, query strings, multipart uploads
 * and imported files. Done when no answer is ≥ 500, the server still answers, and the log of the
 * run holds no password, password hash, session id or study body.
 */
import { connect } from 'node:net';
import { createServer, type Server } from 'node:http';
import { eq } from 'drizzle-orm';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { users } from '../../server/db/schema.ts';
import { APP_URL, makeApp, makeStudy, makeTeam, makeUser, PASSWORD, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';
import { captureLog, type CapturedLog } from './fuzz/capture-log.ts';
import { hostileQueryValue, hostileSegment, hostileValue, mutate, rng, toJson, HOSTILE_STRINGS, type Rng } from './fuzz/fuzz-kit.ts';

const SEED = Number(process.env.FUZZ_SEED ?? 20261202);
const REQUESTS = Number(process.env.FUZZ_REQUESTS ?? 2400);
const circuit = demoCircuits.find((d) => d.key === 'split-phase-120-240')!.circuit;
/** A marker inside the study body: it must never reach the log. */
const BODY_MARKER = 'FUZZ-STUDY-BODY-MARKER-7d1c';

let db: Db;
let t: TestApp;
let owner: TestAgent;
let engineer: TestAgent;
let ownerEmail: string;
let studyId: string;
let otherStudyId: string;
let sessionIds: string[] = [];
let log: CapturedLog;
const statuses = new Map<number, number>();
const failures: string[] = [];

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Fuzz team');
  const o = await makeUser(db, team, 'owner', 'Olwen Owner');
  ownerEmail = o.email;
  const e = await makeUser(db, team, 'engineer', 'Emrys Engineer');
  log = captureLog();
  owner = await signedIn(t.app, o.email);
  engineer = await signedIn(t.app, e.email);
  const s = await engineer
    .post('/api/studies')
    .set('Origin', APP_URL)
    .send({ name: 'Fuzz study', description: BODY_MARKER, content: { circuit, layout: { note: BODY_MARKER }, settings: { grid: 20 } } });
  studyId = s.body.id;
  otherStudyId = (await makeStudy(db, await makeTeam(db), o.id)).id;
  for (const agent of [owner, engineer]) {
    const jar = (agent as unknown as { jar: { getCookies: (o: object) => { name: string; value: string }[] } }).jar;
    for (const c of jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false })) if (c.name === 'wyeward_session') sessionIds.push(c.value);
  }
}, 60_000);

afterAll(async () => {
  log?.restore();
  await t.mailer.close();
  await closeDb(db);
});

type Method = 'get' | 'post' | 'patch' | 'delete';
interface RouteCase {
  method: Method;
  path: (r: Rng) => string;
  body?: () => unknown;
  query?: string[];
  agent?: 'owner' | 'engineer' | 'anon';
}

const ids = () => [studyId, otherStudyId, '00000000-0000-4000-8000-000000000000'];
const sid = (r: Rng) => hostileSegment(r, ids());
const validContent = () => ({ circuit, layout: { a: { x: 1, y: 2 } }, settings: { grid: 20 } });

const ROUTES: RouteCase[] = [
  { method: 'get', path: () => '/api/studies', query: ['q', 'page', 'pageSize', 'template', 'sort', 'dir'] },
  { method: 'post', path: () => '/api/studies', body: () => ({ name: 'New', description: 'd', content: validContent() }) },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}` },
  { method: 'patch', path: (r) => `/api/studies/${sid(r)}`, body: () => ({ version: 1, name: 'Renamed', content: validContent(), message: 'm' }) },
  { method: 'delete', path: (r) => `/api/studies/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}` },
  { method: 'post', path: (r) => `/api/studies/${sid(r)}/clone`, body: () => ({ name: 'Copy' }) },
  { method: 'post', path: () => '/api/studies/import', query: ['name'], body: () => ({ format: 'wyeward-study', version: 1, name: 'Imp', circuit, layout: { a: 1 } }) },
  { method: 'post', path: () => '/api/studies/import', body: () => ({ ...circuit, name: 'Bare' }) },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/revisions` },
  { method: 'post', path: (r) => `/api/studies/${sid(r)}/revisions`, body: () => ({ version: 1, content: validContent(), message: 'r' }) },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/revisions/${hostileSegment(r, ['1', '2', '2147483648'])}` },
  { method: 'post', path: (r) => `/api/studies/${sid(r)}/revisions/${hostileSegment(r, ['1'])}/restore`, body: () => ({ version: 1 }) },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/diff`, query: ['from', 'to'] },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/review` },
  { method: 'post', path: (r) => `/api/studies/${sid(r)}/review`, body: () => ({ action: 'request', reviewers: ['00000000-0000-4000-8000-000000000000'], message: 'please', revision: 1 }) },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/comments` },
  { method: 'post', path: (r) => `/api/studies/${sid(r)}/comments`, body: () => ({ body: 'hello @Olwen', parentId: '00000000-0000-4000-8000-000000000000', anchor: { elementId: 'X' } }) },
  { method: 'patch', path: (r) => `/api/studies/${sid(r)}/comments/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}`, body: () => ({ body: 'edit', resolved: true }) },
  { method: 'delete', path: (r) => `/api/studies/${sid(r)}/comments/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}` },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/attachments/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}` },
  { method: 'get', path: (r) => `/api/studies/${sid(r)}/export` },
  { method: 'get', path: () => '/api/templates' },
  { method: 'get', path: () => '/api/notifications' },
  { method: 'post', path: () => '/api/notifications/read', body: () => ({ ids: ['00000000-0000-4000-8000-000000000000'] }) },
  { method: 'get', path: () => '/api/team' },
  { method: 'post', path: () => '/api/team/invites', body: () => ({ email: 'fuzz-invitee@example.test', role: 'viewer' }), agent: 'owner' },
  { method: 'delete', path: (r) => `/api/team/invites/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}`, agent: 'owner' },
  { method: 'patch', path: (r) => `/api/team/members/${hostileSegment(r, ['00000000-0000-4000-8000-000000000000'])}`, body: () => ({ role: 'viewer' }), agent: 'owner' },
  { method: 'get', path: (r) => `/api/invites/${hostileSegment(r, ['abc'])}`, agent: 'anon' },
  { method: 'get', path: () => '/api/mail', agent: 'owner' },
  { method: 'get', path: (r) => `/api/mail/${hostileSegment(r, ['abc'])}`, agent: 'owner' },
  { method: 'get', path: () => '/api/audit', query: ['studyId', 'action', 'actor', 'page'], agent: 'owner' },
  { method: 'post', path: () => '/api/auth/sign-up', body: () => ({ name: 'Fuzzy', email: 'fuzzy@example.test', password: 'a long passphrase here', teamName: 'T' }), agent: 'anon' },
  { method: 'post', path: () => '/api/auth/sign-in', body: () => ({ email: ownerEmail, password: 'wrong password' }), agent: 'anon' },
  { method: 'get', path: () => '/api/auth/me' },
];

function record(status: number, what: string) {
  statuses.set(status, (statuses.get(status) ?? 0) + 1);
  if (status >= 500 && failures.length < 20) failures.push(`${status} ${what}`);
}

async function jsonCase(r: Rng, rc: RouteCase) {
  const agent = rc.agent === 'anon' ? request(t.app) : rc.agent === 'owner' ? owner : r.chance(0.85) ? engineer : owner;
  let url = rc.path(r);
  if (rc.query && r.chance(0.8)) {
    const parts = rc.query.filter(() => r.chance(0.5)).map((k) => `${k}=${r.chance(0.7) ? hostileQueryValue(r) : '1'}`);
    if (r.chance(0.1)) parts.push(`${rc.query[0]}=a&${rc.query[0]}=b`);
    if (parts.length) url += `?${parts.join('&')}`;
  } else if (r.chance(0.05)) {
    url += `?x=${hostileQueryValue(r)}`;
  }
  let req = (agent as TestAgent)[rc.method](url).set('Origin', APP_URL);
  if (r.chance(0.15)) {
    // A hostile session cookie replaces the agent's own for this request.
    const value = r.pick(['%00', '%ED%A0%80', 'a'.repeat(300), '', 'x%00y', sessionIds[0] + '%00', '%E0%A4%A']);
    req = request(t.app)[rc.method](url).set('Origin', APP_URL).set('Cookie', `wyeward_session=${value}`);
  }
  if (rc.body) {
    const body = r.chance(0.9) ? mutate(r, rc.body()) : hostileValue(r);
    if (r.chance(0.05)) req = req.set('Content-Type', 'application/json').send('{"name": "unterminated');
    else req = req.set('Content-Type', 'application/json').send(toJson(body));
  }
  const res = await req;
  record(res.status, `${rc.method.toUpperCase()} ${url.slice(0, 200)}`);
}

async function uploadCase(r: Rng) {
  const url = `/api/studies/${sid(r)}/attachments`;
  const kind = r.int(3);
  let res;
  if (kind === 0) {
    const name = r.pick([...HOSTILE_STRINGS, 'report.csv', 'a\r\nb.csv', 'x.pdf']).slice(0, 300) || 'f.csv';
    res = await engineer.post(url).set('Origin', APP_URL).attach('file', Buffer.from('a,b\n1,2\n'), { filename: name, contentType: 'text/csv' });
  } else {
    // Hand-made multipart bodies: truncated, CRLF in the file name, a wrong boundary, no parts.
    const b = 'fuzzboundary';
    const bodies = [
      `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a\r\nb.csv"\r\nContent-Type: text/csv\r\n\r\na,b\r\n--${b}--\r\n`,
      `--${b}\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\na,b`,
      `--other\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\na,b\r\n--other--\r\n`,
      `--${b}--\r\n`,
      `--${b}\r\nContent-Disposition: form-data; name="file"; filename="\u0000.csv"\r\n\r\na,b\r\n--${b}--\r\n`,
      `garbage`,
    ];
    res = await engineer
      .post(url)
      .set('Origin', APP_URL)
      .set('Content-Type', `multipart/form-data; boundary=${r.chance(0.9) ? b : ''}`)
      .send(Buffer.from(r.pick(bodies), 'utf8'));
  }
  record(res.status, `upload ${url}`);
}

/** Raw HTTP over a socket: bytes no HTTP client library would send (NUL and CRLF in headers, bad cookies). */
function rawRequest(server: Server, text: string): Promise<number> {
  const port = (server.address() as { port: number }).port;
  return new Promise((resolve) => {
    const s = connect(port, '127.0.0.1');
    let data = '';
    s.on('data', (c) => (data += c.toString('latin1')));
    s.on('end', () => resolve(Number(/^HTTP\/1\.1 (\d{3})/.exec(data)?.[1] ?? 0)));
    s.on('error', () => resolve(0));
    s.write(Buffer.from(text, 'latin1'));
  });
}

describe('fuzz', () => {
  it(`sends ${REQUESTS} seeded hostile requests (seed ${SEED}) and never gets a 5xx`, async () => {
    const r = rng(SEED);
    for (let i = 0; i < REQUESTS; i++) {
      const k = r.next();
      if (k < 0.08) await uploadCase(r);
      else await jsonCase(r, r.pick(ROUTES));
    }
    const server = createServer(t.app);
    await new Promise<void>((res) => server.listen(0, '127.0.0.1', res));
    try {
      const raw = [
        'GET /api/auth/me HTTP/1.1\r\nHost: x\r\nCookie: wyeward_session=\u0000abc\r\nConnection: close\r\n\r\n',
        'GET /api/auth/me HTTP/1.1\r\nHost: x\r\nCookie: wyeward_session=\u00ed\u00a0\u0080\r\nConnection: close\r\n\r\n',
        'GET /api/studies?q=%00 HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n',
        'POST /api/auth/sign-in HTTP/1.1\r\nHost: x\r\nOrigin: \u0000\r\nContent-Type: application/json\r\nContent-Length: 2\r\nConnection: close\r\n\r\n{}',
        'POST /api/auth/sign-in HTTP/1.1\r\nHost: x\r\nOrigin: http://[::1\r\nContent-Type: application/json\r\nContent-Length: 2\r\nConnection: close\r\n\r\n{}',
        `POST /api/auth/sign-in HTTP/1.1\r\nHost: x\r\nOrigin: ${APP_URL}\r\nX-Forwarded-For: \u00ff\u00fe\r\nContent-Type: application/json; charset=utf-16\r\nContent-Length: 2\r\nConnection: close\r\n\r\n{}`,
        `POST /api/studies HTTP/1.1\r\nHost: x\r\nOrigin: ${APP_URL}\r\nContent-Type: application/json\r\nContent-Length: 1\r\nConnection: close\r\n\r\n{`,
        'GET /api/studies/%00 HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n',
        'GET /api/%ZZ HTTP/1.1\r\nHost: x\r\nConnection: close\r\n\r\n',
      ];
      for (const text of raw) {
        const status = await rawRequest(server, text);
        record(status, `raw ${JSON.stringify(text.split('\r\n')[0])}`);
        expect(status, text).toBeGreaterThanOrEqual(400);
      }
    } finally {
      server.close();
    }
    expect(failures, `statuses: ${JSON.stringify([...statuses])}`).toEqual([]);
    const total = [...statuses.values()].reduce((a, b) => a + b, 0);
    expect(total).toBeGreaterThanOrEqual(REQUESTS);
    // Still healthy: it answers, a signed-in user reads the study, the hostile values did not stick.
    expect((await request(t.app).get('/api/health')).status).toBe(200);
    const s = await engineer.get(`/api/studies/${studyId}`);
    expect(s.status).toBe(200);
    expect((await engineer.get(`/api/studies/${studyId}/diff`)).status).toBe(200);
    expect((await engineer.get('/api/studies?pageSize=100')).status).toBe(200);
  }, 600_000);

  it('leaves no password, password hash, session id or study body in the server log', async () => {
    const [row] = await db.select({ hash: users.passwordHash }).from(users).where(eq(users.email, ownerEmail));
    const text = log.text();
    expect(sessionIds.length).toBeGreaterThan(0);
    for (const secret of [PASSWORD, 'wrong password', 'a long passphrase here', row.hash, row.hash.split('$').pop()!, ...sessionIds, BODY_MARKER]) {
      expect(text.includes(secret), `the log contains ${secret.slice(0, 12)}…`).toBe(false);
    }
  });
});
