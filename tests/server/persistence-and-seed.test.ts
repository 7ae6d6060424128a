/** Data on disk survives a restart; demo seeding (accounts, studies, idempotence, DEMO=0); the stale-client-build check; the mail store. */
import { mkdirSync, mkdtempSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import { STAMP_FILE, staleReason } from '../../server/client-build.ts';
import { readConfig } from '../../server/config.ts';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../../server/db/demo-accounts.ts';
import { closeDb, queryRows } from '../../server/db/index.ts';
import { DEMO_TEAM_NAME } from '../../server/db/seed.ts';
import { createJobRunner } from '../../server/jobs/index.ts';
import { createMailer } from '../../server/mail/index.ts';
import { prepareDatabase } from '../../server/runtime.ts';
import { createApp } from '../../server/app.ts';
import { serveClient } from '../../server/static-client.ts';
import { APP_URL, makeApp, signedIn } from './helpers.ts';
import { freshStoreEnv, openTestDb } from './test-db.ts';

const dirs: string[] = [];
function tempDir(prefix: string) {
  const d = mkdtempSync(path.join(tmpdir(), prefix));
  dirs.push(d);
  return d;
}
afterAll(() => {
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});
const quiet = () => {};

describe('restart', () => {
  it('keeps studies, accounts and sessions in the database (data directory or server) across close and reopen', async () => {
    const dataDir = tempDir('wyeward-restart-');
    // A migrated store: the on-disk directory started from the template (a fresh initdb costs ~8 s), or a new server database.
    const config = readConfig({ DATA_DIR: dataDir, DEMO: '1', APP_URL: 'http://localhost:3000', ...(await freshStoreEnv(dataDir)) });

    let db = await prepareDatabase(config, quiet);
    let app = makeApp(db, { DEMO: '1' }).app;
    const engineer = await signedIn(app, 'engineer@wyeward.test', DEMO_PASSWORD);
    const created = await engineer.post('/api/studies').send({ name: 'Survives restart', description: 'written before close' });
    expect(created.status).toBe(201);
    const edited = await engineer.patch(`/api/studies/${created.body.id}`).send({ version: 1, description: 'edited before close' });
    expect(edited.status).toBe(200);
    const cookie = (await request(app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: 'owner@wyeward.test', password: DEMO_PASSWORD })).headers['set-cookie'];
    const before = (await engineer.get('/api/studies?pageSize=100')).body;
    const ownerId = (await queryRows<{ id: string }>(db, `select id from users where email = 'owner@wyeward.test'`))[0].id;
    await queryRows(db, `insert into sessions (id, user_id, expires_at) values ('long-expired', $1, now() - interval '1 day')`, [ownerId]);
    await closeDb(db);

    db = await prepareDatabase(config, quiet);
    app = makeApp(db, { DEMO: '1' }).app;
    const after = await request(app).get('/api/studies?pageSize=100').set('Cookie', cookie); // the session survived too
    expect(after.status).toBe(200);
    expect(after.body).toEqual(before);
    const study = await request(app).get(`/api/studies/${created.body.id}`).set('Cookie', cookie);
    expect(study.body).toMatchObject({ name: 'Survives restart', description: 'edited before close', version: 2 });
    // Start-up cleared the expired session and kept the live ones.
    const left = await queryRows<{ id: string }>(db, 'select id from sessions');
    expect(left.map((r) => r.id)).not.toContain('long-expired');
    expect(left.length).toBeGreaterThanOrEqual(2);
    await closeDb(db);
  });
});

describe('demo seed', () => {
  it('creates one account per role and a study per demo circuit, with a template and mixed statuses and authors', async () => {
    const dataDir = tempDir('wyeward-demo-');
    const db = await openTestDb();
    const config = readConfig({ DATA_DIR: dataDir, DEMO: '1' });
    const { seedDemo } = await import('../../server/db/seed.ts');
    const first = await seedDemo(db);
    expect(first).toEqual({ created: true, users: 4, studies: demoCircuits.length });
    expect(demoCircuits.length).toBeGreaterThanOrEqual(4);

    const t = makeApp(db, { DEMO: '1' });
    expect(config.demo).toBe(true);
    const demo = await request(t.app).get('/api/auth/demo');
    expect(demo.body).toEqual({
      demo: true,
      accounts: [
        { email: 'owner@wyeward.test', role: 'owner', password: 'wyeward-demo' },
        { email: 'engineer@wyeward.test', role: 'engineer', password: 'wyeward-demo' },
        { email: 'reviewer@wyeward.test', role: 'reviewer', password: 'wyeward-demo' },
        { email: 'viewer@wyeward.test', role: 'viewer', password: 'wyeward-demo' },
      ],
    });
    for (const a of DEMO_ACCOUNTS) {
      const agent = await signedIn(t.app, a.email, 'wyeward-demo');
      const me = (await agent.get('/api/auth/me')).body;
      expect(me).toMatchObject({ role: a.role, team: { name: DEMO_TEAM_NAME } });
    }
    const engineer = await signedIn(t.app, 'engineer@wyeward.test', 'wyeward-demo');
    const owner = await signedIn(t.app, 'owner@wyeward.test', 'wyeward-demo');
    const list = (await engineer.get('/api/studies')).body;
    expect(list.total).toBe(demoCircuits.length);
    expect(list.items.map((s: { name: string }) => s.name).sort()).toEqual(demoCircuits.map((c) => c.name).sort());
    expect(list.items.filter((s: { isTemplate: boolean }) => s.isTemplate)).toHaveLength(1);
    expect(new Set(list.items.map((s: { status: string }) => s.status)).size).toBeGreaterThanOrEqual(3);
    expect(new Set(list.items.map((s: { createdBy: { name: string } }) => s.createdBy.name)).size).toBeGreaterThanOrEqual(2);
    for (const s of list.items) {
      const demoCircuit = demoCircuits.find((c) => c.name === s.name)!;
      expect(s.elementCount).toBe(demoCircuit.circuit.elements.length);
      // Each seeded study has revision 1 (solved by the engine) and a review history that matches its status.
      const detail = (await engineer.get(`/api/studies/${s.id}`)).body;
      expect(detail.revision).toBe(1);
      const revisions = (await engineer.get(`/api/studies/${s.id}/revisions`)).body.items;
      expect(revisions).toMatchObject([{ number: 1, results: { ok: true } }]);
      const state = (await engineer.get(`/api/studies/${s.id}/review`)).body;
      expect(state.status).toBe(s.status);
      expect(state.events.length).toBe({ draft: 0, 'in-review': 1, 'changes-requested': 2, approved: 2 }[s.status as string]);
      if (s.status === 'approved') expect(state.approvedRevision).toBe(1);
      const audit = (await owner.get(`/api/audit?studyId=${s.id}`)).body.items.map((e: { action: string }) => e.action);
      expect(audit).toContain('revision.create');
      expect(audit.filter((a: string) => a.startsWith('review.'))).toHaveLength(state.events.length);
      // A seeded study saves back unchanged: its content passes the same validation as any edit.
      const saved = await engineer.patch(`/api/studies/${s.id}`).send({ version: detail.version, content: detail.content });
      expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    }

    // A second start adds nothing.
    expect(await seedDemo(db)).toEqual({ created: false, users: 0, studies: 0 });
    expect((await engineer.get('/api/studies')).body.total).toBe(demoCircuits.length);
    const users = await queryRows<{ n: number }>(db, 'select count(*)::int as n from users');
    expect(users[0].n).toBe(4);
    await closeDb(db);
  });

  it('seeds nothing and lists no demo accounts with DEMO=0', async () => {
    const dataDir = tempDir('wyeward-nodemo-');
    const config = readConfig({ DATA_DIR: dataDir, DEMO: '0', ...(await freshStoreEnv(dataDir)) });
    expect(config.demo).toBe(false);
    const db = await prepareDatabase(config, quiet);
    const users = await queryRows<{ n: number }>(db, 'select count(*)::int as n from users');
    expect(users[0].n).toBe(0);
    const demo = await request(makeApp(db, { DEMO: '0' }).app).get('/api/auth/demo');
    expect(demo.body).toEqual({ demo: false, accounts: [] });
    const signIn = await request(makeApp(db).app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: 'owner@wyeward.test', password: 'wyeward-demo' });
    expect(signIn.status).toBe(401);
    await closeDb(db);
  });
});

describe('configuration', () => {
  it('reads defaults and overrides', () => {
    const d = readConfig({});
    expect(d).toMatchObject({ port: 3000, demo: true, appUrl: 'http://localhost:3000', cookieSecure: false });
    expect(d.dataDir).toBe(path.resolve('./data'));
    const o = readConfig({ PORT: '8080', DEMO: 'off', APP_URL: 'https://wyeward.example.org/', SMTP_URL: 'smtp://mail:25' });
    expect(o).toMatchObject({ port: 8080, demo: false, appUrl: 'https://wyeward.example.org', cookieSecure: true, smtpUrl: 'smtp://mail:25' });
    expect(() => readConfig({ PORT: 'eighty' })).toThrow(/PORT must be a whole number/);
  });
});

describe('client build check', () => {
  it('asks for a build when dist/ is missing, unstamped, or older than a source', () => {
    const root = tempDir('wyeward-build-');
    mkdirSync(path.join(root, 'src'));
    writeFileSync(path.join(root, 'src', 'main.tsx'), '');
    writeFileSync(path.join(root, 'index.html'), '');
    expect(staleReason(root)).toBe('no client build in dist/');
    mkdirSync(path.join(root, 'dist'));
    writeFileSync(path.join(root, 'dist', 'index.html'), '');
    expect(staleReason(root)).toBe('dist/ has no build stamp');
    const t0 = new Date('2026-01-01T00:00:00Z');
    utimesSync(path.join(root, 'src', 'main.tsx'), t0, t0);
    utimesSync(path.join(root, 'index.html'), t0, t0);
    writeFileSync(path.join(root, 'dist', STAMP_FILE), String(t0.getTime()));
    expect(staleReason(root)).toBeNull();
    const t1 = new Date('2026-01-02T00:00:00Z');
    utimesSync(path.join(root, 'src', 'main.tsx'), t1, t1);
    expect(staleReason(root)).toBe('client sources changed since the last build');
  });
});

describe('serving the client', () => {
  it('serves dist files, index.html for app routes, and JSON 404s for unknown API routes', async () => {
    const dist = tempDir('wyeward-dist-');
    writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>Wyeward test shell</title>');
    mkdirSync(path.join(dist, 'assets'));
    writeFileSync(path.join(dist, 'assets', 'app.js'), 'console.log(1)');
    const db = await openTestDb();
    const t = makeApp(db);
    const app = createApp({ db, config: t.config, mailer: t.mailer, objects: t.objects, mountClient: serveClient(dist) });
    const asset = await request(app).get('/assets/app.js');
    expect(asset.status).toBe(200);
    expect(asset.text).toBe('console.log(1)');
    for (const p of ['/', '/studies/123', '/invite/some-token']) {
      const page = await request(app).get(p);
      expect(page.status).toBe(200);
      expect(page.text).toContain('Wyeward test shell');
    }
    const api = await request(app).get('/api/not-here');
    expect(api.status).toBe(404);
    expect(api.body.error.code).toBe('not-found');
    await closeDb(db);
  });
});

describe('mail store', () => {
  it('keeps each team to its own messages, newest first, and refuses ids that could leave the directory', async () => {
    const db = await openTestDb();
    // Jobs are queued, not run: this is about the kept copies.
    const mailer = createMailer({ db, jobs: createJobRunner(db), from: 'Wyeward <no-reply@wyeward.test>' });
    const a1 = await mailer.send({ teamId: 'A', to: 'a1@example.test', subject: 'first', text: 'one' });
    const b1 = await mailer.send({ teamId: 'B', to: 'b1@example.test', subject: 'other team', text: 'two' });
    await new Promise((r) => setTimeout(r, 2)); // distinct millisecond ids, so "newest first" is decidable
    const a2 = await mailer.send({ teamId: 'A', to: 'a2@example.test', subject: 'second', text: 'three', html: '<p>three</p>' });
    expect((await mailer.list('A')).map((m) => m.id)).toEqual([a2, a1]);
    expect((await mailer.list('B')).map((m) => m.id)).toEqual([b1]);
    expect(await mailer.get('A', a2)).toMatchObject({ to: 'a2@example.test', subject: 'second', text: 'three', html: '<p>three</p>', from: 'Wyeward <no-reply@wyeward.test>' });
    expect(await mailer.get('B', a1)).toBeNull();
    expect(await mailer.get('A', '../../etc/passwd')).toBeNull();
    await closeDb(db);
  });
});
