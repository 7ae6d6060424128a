/** Sign-up/sign-in/sign-out, the session cookie, sign-in throttling, the same-origin rule, invites by e-mail and role management. */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backoffSeconds, FREE_FAILURES, MAX_WAIT_SECONDS } from '../../server/auth/rate-limit.ts';
import { eq } from 'drizzle-orm';
import { readConfig } from '../../server/config.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { sessions } from '../../server/db/schema.ts';
import { rawMail } from '../../server/mail/store.ts';
import { accountMail, makeApp, makeTeam, makeUser, PASSWORD, signedIn, signUpNewTeam, APP_URL, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

let db: Db;
let t: TestApp;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
});

afterAll(async () => {
  await closeDb(db);
});

describe('sign-up, sign-in, sign-out', () => {
  it('signs up a new team through a mailed link, then keeps the owner signed in with an HttpOnly, SameSite=Lax cookie', async () => {
    const agent = request.agent(t.app).set('Origin', APP_URL);
    const pending = await agent
      .post('/api/auth/sign-up')
      .send({ name: 'Nell Ostrander', email: '  Nell@Example.TEST ', password: 'long enough pass', teamName: 'Ostrander Consulting' });
    expect(pending.status).toBe(202);
    expect(pending.body).toEqual({ status: 'check-inbox', email: 'nell@example.test' });
    expect(pending.headers['set-cookie']).toBeUndefined();
    const mail = await accountMail(t.mailer, 'nell@example.test');
    expect(mail.subject).toBe('Finish creating your Wyeward account');
    const token = /http:\/\/localhost:3000\/sign-up\/confirm#([A-Za-z0-9_-]+)/.exec(mail.text)![1];
    const res = await agent.post('/api/auth/sign-up/confirm').send({ token });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ user: { name: 'Nell Ostrander', email: 'nell@example.test' }, team: { name: 'Ostrander Consulting' }, role: 'owner' });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/^wyeward_session=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i); // plain http in tests; COOKIE_SECURE=1 or an https APP_URL sets it
    const me = await agent.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toEqual(res.body);
    // The link works once.
    expect((await request(t.app).post('/api/auth/sign-up/confirm').set('Origin', APP_URL).send({ token })).status).toBe(404);
  });

  it('marks the cookie Secure when COOKIE_SECURE=1', async () => {
    const secure = makeApp(db, { COOKIE_SECURE: '1' });
    const { res } = await signUpNewTeam(secure, { name: 'Sec', email: 'secure-cookie@example.test', password: 'long enough pass', teamName: 'S' });
    expect(String(res.headers['set-cookie'])).toMatch(/Secure/);
  });

  it('answers a sign-up for an address that has an account exactly like a new one, and mails "you already have an account"', async () => {
    const body = { name: 'Dup', email: 'dup@example.test', password: 'long enough pass', teamName: 'Dup team' };
    expect((await signUpNewTeam(t, body)).res.status).toBe(201);
    const again = await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ ...body, email: 'DUP@example.test' });
    const fresh = await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ ...body, email: 'nobody-yet@example.test' });
    expect(again.status).toBe(202);
    expect(fresh.status).toBe(202);
    expect(Object.keys(again.body)).toEqual(Object.keys(fresh.body));
    expect(again.body.status).toBe(fresh.body.status);
    const mail = await accountMail(t.mailer, 'dup@example.test', 2);
    expect(mail.subject).toBe('You already have a Wyeward account');
    expect(mail.text).toContain('http://localhost:3000/sign-in');
    expect(mail.text).not.toMatch(/sign-up\/confirm/);
  });

  it('requires passwords of 10 to 200 characters, a valid e-mail and a team name', async () => {
    const res = await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ name: 'Short', email: 'not-an-email', password: '123456789' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({
      email: 'Enter a valid e-mail address',
      password: 'Password must be at least 10 characters',
      teamName: 'Team name is required',
    });
    const long = await request(t.app)
      .post('/api/auth/sign-up').set('Origin', APP_URL)
      .send({ name: 'Long', email: 'long@example.test', password: 'x'.repeat(201), teamName: 'T' });
    expect(long.body.error.fields.password).toBe('Password must be at most 200 characters');
    const strong10 = await request(t.app)
      .post('/api/auth/sign-up').set('Origin', APP_URL)
      .send({ name: 'Ten', email: 'ten@example.test', password: 'vq7#Lm2!xZ', teamName: 'T' });
    expect(strong10.status).toBe(202);
  });

  it('refuses passwords that are easy to guess (common, keyboard rows, built from the name), with a reason', async () => {
    for (const password of ['password123456', 'qwertyuiop12', '1234567890', 'Ostranderteam1']) {
      const res = await request(t.app)
        .post('/api/auth/sign-up').set('Origin', APP_URL)
        .send({ name: 'Guessable Ostranderteam', email: 'weak@example.test', password, teamName: 'Ostrander team' });
      expect(res.status, password).toBe(400);
      expect(res.body.error.fields.password).toMatch(/guess|common|often used|pattern|name|Sequences|Straight/i);
    }
  });

  it('gives unknown e-mail and wrong password the same 401 answer', async () => {
    const team = await makeTeam(db);
    const u = await makeUser(db, team, 'viewer');
    const wrong = await request(t.app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: u.email, password: 'not the password' });
    const unknown = await request(t.app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: 'nobody-here@example.test', password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual({ error: { code: 'invalid-credentials', message: 'E-mail or password is incorrect.' } });
    expect(unknown.body).toEqual(wrong.body);
  });

  it('signs out: the session is invalidated server-side and the cookie cleared', async () => {
    const team = await makeTeam(db);
    const u = await makeUser(db, team, 'engineer');
    const agent = await signedIn(t.app, u.email);
    const cookie = (await request(t.app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: u.email, password: PASSWORD })).headers['set-cookie'];
    const out = await request(t.app).post('/api/auth/sign-out').set('Origin', APP_URL).set('Cookie', cookie);
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(/wyeward_session=;/);
    // The old cookie no longer works, even if a client kept it.
    expect((await request(t.app).get('/api/auth/me').set('Cookie', cookie)).status).toBe(401);
    // Another session of the same user is untouched.
    expect((await agent.get('/api/auth/me')).status).toBe(200);
  });

  it('answers 401 unauthenticated without a session', async () => {
    const res = await request(t.app).get('/api/studies');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });
});

describe('session expiry', () => {
  it(`ends a session unused past its idle expiry, and any session older than the absolute maximum however recently used`, async () => {
    const app = makeApp(db, { SESSION_IDLE_HOURS: '12', SESSION_MAX_DAYS: '30' });
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    const idle = await signedIn(app.app, u.email);
    const old = await signedIn(app.app, u.email);
    const rows = await db.select().from(sessions).where(eq(sessions.userId, u.id));
    expect(rows).toHaveLength(2);
    // A fresh session expires 12 h from now (idle span), not 30 days.
    const hours = (rows[0].expiresAt.getTime() - Date.now()) / 3_600_000;
    expect(hours).toBeGreaterThan(11.9);
    expect(hours).toBeLessThanOrEqual(12);
    const [a, b] = rows;
    await db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.id, a.id));
    await db.update(sessions).set({ createdAt: new Date(Date.now() - 31 * 86_400_000) }).where(eq(sessions.id, b.id));
    expect((await idle.get('/api/auth/me')).status).toBe(401);
    expect((await old.get('/api/auth/me')).status).toBe(401);
    expect(await db.select().from(sessions).where(eq(sessions.userId, u.id))).toHaveLength(0);
  });
  it('renews a session used in the second half of its idle span (new expiry, cookie sent again)', async () => {
    const app = makeApp(db, { SESSION_IDLE_HOURS: '12' });
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    const agent = await signedIn(app.app, u.email);
    await db.update(sessions).set({ expiresAt: new Date(Date.now() + 3_600_000) }).where(eq(sessions.userId, u.id)); // 1 h left of 12
    const res = await agent.get('/api/auth/me');
    expect(res.status).toBe(200);
    expect(String(res.headers['set-cookie'])).toMatch(/^wyeward_session=[a-z0-9]+;/);
    const [row] = await db.select().from(sessions).where(eq(sessions.userId, u.id));
    expect((row.expiresAt.getTime() - Date.now()) / 3_600_000).toBeGreaterThan(11.9);
    // Early in its span it is not written again.
    const again = await agent.get('/api/auth/me');
    expect(again.headers['set-cookie']).toBeUndefined();
  });
});

describe('sign-in throttling', () => {
  /** An app behind a proxy, so each request can come from its own client address. */
  const proxied = makeApp.bind(null);
  const attempt = (app: TestApp, ip: string, email: string, password: string) =>
    request(app.app).post('/api/auth/sign-in').set('Origin', APP_URL).set('X-Forwarded-For', ip).send({ email, password });

  it('50 wrong passwords from one address do not lock the account: the right password from another address signs in at once', async () => {
    const app = proxied(db, { TRUST_PROXY: '1' });
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    const statuses = new Set<number>();
    for (let i = 0; i < 50; i++) statuses.add((await attempt(app, '198.51.100.66', u.email, `wrong ${i}`)).status);
    expect([...statuses].sort()).toEqual([401, 429]);
    const res = await attempt(app, '203.0.113.10', u.email, PASSWORD);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(u.email);
  });

  it(`the pair account + address waits after ${FREE_FAILURES} failures, 2 s then doubling; the answer carries Retry-After`, async () => {
    const app = proxied(db, { TRUST_PROXY: '1' });
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    for (let i = 0; i < FREE_FAILURES; i++) expect((await attempt(app, '198.51.100.7', u.email, 'wrong wrong')).status).toBe(401);
    // The 6th failure is still checked (401) and starts the first wait.
    expect((await attempt(app, '198.51.100.7', u.email, 'wrong wrong')).status).toBe(401);
    const res = await attempt(app, '198.51.100.7', u.email, PASSWORD);
    expect(res.status).toBe(429);
    expect(res.body.error.code).toBe('rate-limited');
    expect(res.body.error.message).toMatch(/Try again in \d+ seconds?/);
    expect(res.body.error.retryAfterSeconds).toBeGreaterThan(0);
    expect(res.body.error.retryAfterSeconds).toBeLessThanOrEqual(2);
    expect(res.headers['retry-after']).toBe(String(res.body.error.retryAfterSeconds));
  });

  it('back-off: free up to the limit, then 2, 4, 8 … seconds, capped', () => {
    expect([1, FREE_FAILURES].map(backoffSeconds)).toEqual([0, 0]);
    expect([FREE_FAILURES + 1, FREE_FAILURES + 2, FREE_FAILURES + 3].map(backoffSeconds)).toEqual([2, 4, 8]); // (P) exponential back-off
    expect(backoffSeconds(FREE_FAILURES + 40)).toBe(MAX_WAIT_SECONDS);
  });

  it('a successful sign-in clears the pair', async () => {
    const app = proxied(db, { TRUST_PROXY: '1' });
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    for (let i = 0; i < FREE_FAILURES - 1; i++) await attempt(app, '198.51.100.8', u.email, 'wrong wrong');
    expect((await attempt(app, '198.51.100.8', u.email, PASSWORD)).status).toBe(200);
    for (let i = 0; i < FREE_FAILURES; i++) expect((await attempt(app, '198.51.100.8', u.email, 'wrong wrong')).status).toBe(401);
  });

  it('keeps its counts in the database: a new app on the same database (a restart) still makes the pair wait', async () => {
    const u = await makeUser(db, await makeTeam(db), 'viewer');
    const first = proxied(db, { TRUST_PROXY: '1' });
    for (let i = 0; i <= FREE_FAILURES; i++) await attempt(first, '198.51.100.9', u.email, 'wrong wrong');
    const restarted = proxied(db, { TRUST_PROXY: '1' });
    expect((await attempt(restarted, '198.51.100.9', u.email, PASSWORD)).status).toBe(429);
  });

  it('refuses an address past its ceiling of failures across accounts (SIGN_IN_ADDRESS_LIMIT)', async () => {
    const app = proxied(db, { TRUST_PROXY: '1', SIGN_IN_ADDRESS_LIMIT: '12' });
    for (let i = 0; i < 12; i++) expect((await attempt(app, '198.51.100.10', `spray-${i}@example.test`, 'guess guess')).status).toBe(401);
    const res = await attempt(app, '198.51.100.10', 'spray-new@example.test', 'guess guess');
    expect(res.status).toBe(429);
    expect(res.body.error.retryAfterSeconds).toBeGreaterThan(0);
    // Other addresses are unaffected.
    expect((await attempt(app, '198.51.100.11', 'spray-new@example.test', 'guess guess')).status).toBe(401);
  });

  it('throttles sign-ups per address (SIGN_UP_ADDRESS_LIMIT)', async () => {
    const app = proxied(db, { TRUST_PROXY: '1', SIGN_UP_ADDRESS_LIMIT: '3' });
    const body = (i: number) => ({ name: 'S', email: `signup-flood-${i}@example.test`, password: 'long enough pass', teamName: 'T' });
    for (let i = 0; i < 3; i++) expect((await request(app.app).post('/api/auth/sign-up').set('Origin', APP_URL).set('X-Forwarded-For', '198.51.100.12').send(body(i))).status).toBe(202);
    const res = await request(app.app).post('/api/auth/sign-up').set('Origin', APP_URL).set('X-Forwarded-For', '198.51.100.12').send(body(9));
    expect(res.status).toBe(429);
  });
});

describe('behind a reverse proxy (TRUST_PROXY=1)', () => {
  it('counts failures per forwarded client address, not per proxy', async () => {
    const app = makeApp(db, { TRUST_PROXY: '1', SIGN_IN_ADDRESS_LIMIT: '5' });
    const attemptFrom = (ip: string, i: number) => request(app.app).post('/api/auth/sign-in').set('Origin', APP_URL).set('X-Forwarded-For', ip).send({ email: `proxy-${ip}-${i}@example.test`, password: 'guess guess' });
    for (let i = 0; i < 5; i++) expect((await attemptFrom('203.0.113.7', i)).status).toBe(401);
    expect((await attemptFrom('203.0.113.7', 99)).status).toBe(429);
    expect((await attemptFrom('203.0.113.8', 0)).status).toBe(401);
  });
});

describe('same-origin rule', () => {
  it('refuses state-changing requests from a foreign Origin with 403 foreign-origin', async () => {
    const team = await makeTeam(db);
    const u = await makeUser(db, team, 'engineer');
    const agent = await signedIn(t.app, u.email);
    for (const res of [
      await agent.post('/api/studies').set('Origin', 'https://evil.example').send({ name: 'csrf' }),
      await request(t.app).post('/api/auth/sign-in').set('Origin', 'http://localhost:3001').send({ email: u.email, password: PASSWORD }), // another port
      await agent.post('/api/studies').set('Origin', 'https://localhost:3000').send({ name: 'csrf' }), // another scheme
      await agent.post('/api/auth/sign-out').set('Origin', 'null'),
      await agent.post('/api/auth/sign-out').set('Origin', ''),
      await agent.post('/api/auth/sign-out').set('Origin', 'not a url'),
      // An Origin equal to the request's Host is not enough: only APP_URL counts.
      await agent.post('/api/studies').set('Host', 'wyeward.internal:8080').set('Origin', 'http://wyeward.internal:8080').send({ name: 'by host' }),
    ]) {
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('foreign-origin');
    }
    expect((await agent.get('/api/studies')).body.total).toBe(0); // nothing was created
    expect((await agent.get('/api/auth/me')).status).toBe(200); // and the sign-out was refused
  });

  it('requires Origin (or Sec-Fetch-Site: same-origin) on state-changing requests', async () => {
    const u = await makeUser(db, await makeTeam(db), 'engineer');
    const agent = await signedIn(t.app, u.email);
    const bare = await agent.post('/api/studies').unset('Origin').send({ name: 'no origin' });
    expect(bare.status).toBe(403);
    expect(bare.body.error).toMatchObject({ code: 'foreign-origin', message: expect.stringMatching(/Origin/) });
    expect((await agent.delete('/api/studies/00000000-0000-4000-8000-000000000000').unset('Origin')).status).toBe(403);
    expect((await agent.post('/api/studies').unset('Origin').set('Sec-Fetch-Site', 'cross-site').send({ name: 'x' })).status).toBe(403);
    expect((await agent.post('/api/studies').unset('Origin').set('Sec-Fetch-Site', 'same-origin').send({ name: 'fetch metadata' })).status).toBe(201);
  });

  it('lets the app origin through, compared by scheme, host and port', async () => {
    const u = await makeUser(db, await makeTeam(db), 'engineer');
    const agent = await signedIn(t.app, u.email);
    expect((await agent.post('/api/studies').set('Origin', APP_URL).send({ name: 'same origin' })).status).toBe(201);
    expect((await agent.post('/api/studies').set('Origin', 'HTTP://LOCALHOST:3000').send({ name: 'same origin, other case' })).status).toBe(201);
    const https = makeApp(db, { APP_URL: 'https://wyeward.example.org' });
    // (a wrong password: 401 means the request passed the origin check, 403 that it was refused)
    const attempt = (origin: string) => request(https.app).post('/api/auth/sign-in').set('Origin', origin).send({ email: u.email, password: 'not it at all' });
    expect((await attempt('https://wyeward.example.org:443')).status).toBe(401); // the default port is the same origin
    expect((await attempt('http://wyeward.example.org')).status).toBe(403);
    expect((await attempt('https://wyeward.example.org:8443')).status).toBe(403);
    // Reads are never refused for their Origin.
    expect((await agent.get('/api/studies').set('Origin', 'https://evil.example')).status).toBe(200);
  });

  it('refuses an APP_URL that is not an http(s) origin at start', () => {
    for (const APP_URL of ['wyeward.example.org', 'ftp://x.example', 'https://x.example/app', 'https://x.example/?a=1']) {
      expect(() => readConfig({ APP_URL }), APP_URL).toThrow(/APP_URL/);
    }
  });
});

describe('invites and roles', () => {
  it('owner invites by e-mail; the mail is written; the invitee signs up with the token and gets the role', async () => {
    const team = await makeTeam(db, 'Invite team');
    const o = await makeUser(db, team, 'owner', 'Ines Owner');
    const owner = await signedIn(t.app, o.email);
    const inv = await owner.post('/api/team/invites').send({ email: 'New.Engineer@Example.test', role: 'engineer' });
    expect(inv.status).toBe(201);
    expect(inv.body).toMatchObject({ email: 'new.engineer@example.test', role: 'engineer', invitedBy: { id: o.id, name: 'Ines Owner' } });
    const days = (Date.parse(inv.body.expiresAt) - Date.parse(inv.body.createdAt)) / 86_400_000;
    expect(days).toBeCloseTo(7, 2);

    // The message is kept in the database with its RFC 822 text and listed for the owner.
    const list = await owner.get('/api/mail');
    expect(list.body.items[0]).toMatchObject({ to: 'new.engineer@example.test', subject: 'Ines Owner invites you to Invite team on Wyeward' });
    const mail = await owner.get(`/api/mail/${list.body.items[0].id}`);
    const eml = (await rawMail(db, list.body.items[0].id))!.raw;
    expect(eml).toMatch(/^To: new\.engineer@example\.test$/m);
    const link = mail.body.text.match(/http:\/\/localhost:3000\/invite\/([A-Za-z0-9_-]+)/);
    expect(link).not.toBeNull();
    const token = link![1];
    expect(eml.replace(/=\n/g, '')).toContain(token); // quoted-printable soft line breaks removed

    // The public invite page data.
    const info = await request(t.app).get(`/api/invites/${token}`);
    expect(info.body).toMatchObject({ email: 'new.engineer@example.test', role: 'engineer', teamName: 'Invite team' });

    // Wrong address is refused; the right one joins with the invited role.
    const wrongEmail = await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ name: 'X', email: 'other@example.test', password: PASSWORD, inviteToken: token });
    expect(wrongEmail.status).toBe(400);
    expect(wrongEmail.body.error.fields).toHaveProperty('email');
    const invitee = request.agent(t.app).set('Origin', APP_URL);
    const joined = await invitee.post('/api/auth/sign-up').send({ name: 'Nico Engineer', email: 'new.engineer@example.test', password: PASSWORD, inviteToken: token });
    expect(joined.status).toBe(201);
    expect(joined.body).toMatchObject({ team: { id: team, name: 'Invite team' }, role: 'engineer' });
    expect((await invitee.post('/api/studies').send({ name: 'first study' })).status).toBe(201);

    // The token is spent, and the invite is no longer pending.
    expect((await request(t.app).get(`/api/invites/${token}`)).status).toBe(404);
    expect((await owner.get('/api/team')).body.invites).toEqual([]);
    const actions = (await owner.get('/api/audit')).body.items.map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(['invite.create', 'invite.accept', 'user.sign-up', 'study.create']));
  });

  it('a revoked or unknown token is 404 and cannot be used to sign up', async () => {
    const team = await makeTeam(db);
    const o = await makeUser(db, team, 'owner');
    const owner = await signedIn(t.app, o.email);
    const inv = await owner.post('/api/team/invites').send({ email: 'revoked@example.test', role: 'viewer' });
    const [latest] = (await owner.get('/api/mail')).body.items;
    const token = (await owner.get(`/api/mail/${latest.id}`)).body.text.match(/invite\/([A-Za-z0-9_-]+)/)[1];
    expect((await owner.delete(`/api/team/invites/${inv.body.id}`)).status).toBe(204);
    expect((await request(t.app).get(`/api/invites/${token}`)).status).toBe(404);
    expect((await request(t.app).get('/api/invites/nonsense')).status).toBe(404);
    const res = await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ name: 'R', email: 'revoked@example.test', password: PASSWORD, inviteToken: token });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('inviteToken');
  });

  it('lists invites to owners only', async () => {
    const team = await makeTeam(db);
    const o = await makeUser(db, team, 'owner');
    const e = await makeUser(db, team, 'engineer');
    const owner = await signedIn(t.app, o.email);
    await owner.post('/api/team/invites').send({ email: 'listed@example.test', role: 'reviewer' });
    expect((await owner.get('/api/team')).body.invites).toHaveLength(1);
    const eng = await signedIn(t.app, e.email);
    const seen = await eng.get('/api/team');
    expect(seen.body.invites).toEqual([]);
    expect(seen.body.members).toHaveLength(2);
  });

  it('owner changes roles, and the new role takes effect on the next request', async () => {
    const team = await makeTeam(db);
    const o = await makeUser(db, team, 'owner');
    const v = await makeUser(db, team, 'viewer');
    const owner = await signedIn(t.app, o.email);
    const viewer = await signedIn(t.app, v.email);
    expect((await viewer.post('/api/studies').send({ name: 'not yet' })).status).toBe(403);
    const res = await owner.patch(`/api/team/members/${v.id}`).send({ role: 'engineer' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ userId: v.id, role: 'engineer' });
    expect((await viewer.post('/api/studies').send({ name: 'now allowed' })).status).toBe(201);
    expect((await owner.patch(`/api/team/members/${v.id}`).send({ role: 'boss' })).status).toBe(400);
  });

  it('keeps at least one owner: the last owner can be neither demoted nor removed', async () => {
    const team = await makeTeam(db);
    const o = await makeUser(db, team, 'owner');
    const owner = await signedIn(t.app, o.email);
    const demote = await owner.patch(`/api/team/members/${o.id}`).send({ role: 'engineer' });
    expect(demote.status).toBe(409);
    expect(demote.body.error.code).toBe('conflict');
    expect((await owner.delete(`/api/team/members/${o.id}`)).status).toBe(409);
    // With a second owner, demotion works.
    const o2 = await makeUser(db, team, 'owner');
    expect((await owner.patch(`/api/team/members/${o2.id}`).send({ role: 'reviewer' })).status).toBe(200);
  });

  it('a removed member is signed out and refused', async () => {
    const team = await makeTeam(db);
    const o = await makeUser(db, team, 'owner');
    const e = await makeUser(db, team, 'engineer');
    const owner = await signedIn(t.app, o.email);
    const eng = await signedIn(t.app, e.email);
    expect((await owner.delete(`/api/team/members/${e.id}`)).status).toBe(204);
    expect((await eng.get('/api/studies')).status).toBe(401);
    const again = await request(t.app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: e.email, password: PASSWORD });
    expect(again.status).toBe(403);
    expect((await owner.get('/api/team')).body.members.map((m: { userId: string }) => m.userId)).toEqual([o.id]);
  });
});
