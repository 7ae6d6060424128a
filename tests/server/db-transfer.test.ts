/**
 * Moving a team between databases (server/db/dump.ts, `npm run db:export` / `db:import`): from the
 * embedded PGlite to this project's database (a PostgreSQL server in project server-pg) and back to
 * a new PGlite. Every table holds rows before the move; after each leg every table has the same
 * number of rows and every row is the same value (PostgreSQL's own jsonb of the row), and the app on
 * the moved database answers as before. A wrong target or a damaged file is refused with nothing kept.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_PASSWORD } from '../../server/db/demo-accounts.ts';
import { closeDb, dbKind, type Db } from '../../server/db/index.ts';
import { DumpError, exportDatabase, importDatabase, tableCounts, TABLES_IN_ORDER } from '../../server/db/dump.ts';
import { seedDemo } from '../../server/db/seed.ts';
import { demoCircuits } from '../../shared/engine/index.ts';
import { enqueue } from '../../server/jobs/queue.ts';
import { getTableConfig } from 'drizzle-orm/pg-core';
import * as schema from '../../server/db/schema.ts';
import { APP_URL, makeApp, signedIn } from './helpers.ts';
import { freshStoreEnv, onPostgres, openTestDb, openTestPglite } from './test-db.ts';

async function* linesOf(lines: string[]) {
  for (const l of lines) yield l;
}

async function dump(db: Db): Promise<string[]> {
  const lines: string[] = [];
  await exportDatabase(db, (l) => {
    lines.push(l);
  });
  return lines;
}

/** The row lines of a dump (the header carries the time of the export). */
const rowsOf = (lines: string[]) => lines.slice(1);

/** A server sweep of the source (its job row and stored points move too). */
let sweep: { studyId: string; id: string };

/** What a signed-in engineer and owner read from the app on `db`. */
async function appView(db: Db) {
  const t = makeApp(db);
  const engineer = await signedIn(t.app, 'engineer@wyeward.test', DEMO_PASSWORD);
  const owner = await signedIn(t.app, 'owner@wyeward.test', DEMO_PASSWORD);
  const list = (await engineer.get('/api/studies?pageSize=100')).body;
  const first = list.items[0].id;
  return {
    list,
    revisions: (await engineer.get(`/api/studies/${first}/revisions`)).body,
    comments: (await engineer.get(`/api/studies/${first}/comments`)).body,
    attachments: (await engineer.get(`/api/studies/${first}/attachments`)).body,
    audit: (await owner.get('/api/audit?pageSize=100')).body,
    team: (await owner.get('/api/team')).body,
    sweep: (await engineer.get(`/api/studies/${sweep.studyId}/sweeps/${sweep.id}?limit=100`)).body,
  };
}

let source: Db;
let sourceLines: string[];
const dirs: string[] = [];

beforeAll(async () => {
  source = await openTestPglite();
  await seedDemo(source);
  // Rows in every table: comments, an attachment, an invite, a pending sign-up, sessions, throttle counts.
  const t = makeApp(source);
  dirs.push(t.config.dataDir);
  const engineer = await signedIn(t.app, 'engineer@wyeward.test', DEMO_PASSWORD);
  const owner = await signedIn(t.app, 'owner@wyeward.test', DEMO_PASSWORD);
  const studyId = (await engineer.get('/api/studies?pageSize=100')).body.items[0].id;
  expect((await engineer.post(`/api/studies/${studyId}/comments`).send({ body: 'Check the neutral size, @Reviewer' })).status).toBe(201);
  expect((await engineer.post(`/api/studies/${studyId}/attachments`).attach('file', Buffer.from('bus,kV\nHOUSE,0.208\n'), 'readings.csv')).status).toBe(201);
  expect((await owner.post('/api/team/invites').send({ email: 'new.hire@example.test', role: 'viewer' })).status).toBe(201);
  expect((await request(t.app).post('/api/auth/sign-up').set('Origin', APP_URL).send({ name: 'Nia', email: 'nia@example.test', password: 'quartz lantern meadow 42', teamName: 'Other' })).status).toBe(202);
  expect((await request(t.app).post('/api/auth/sign-in').set('Origin', APP_URL).send({ email: 'owner@wyeward.test', password: 'wrong' })).status).toBe(401);
  // A finished server sweep with its points.
  const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
  const made = await engineer.post('/api/studies').send({ name: 'Lane 14 sweep', content: { circuit } });
  expect(made.status).toBe(201);
  const swept = await engineer.post(`/api/studies/${made.body.id}/sweeps`).send({ parameters: [{ path: 'KITCHEN.each.kw', from: 1, to: 3, points: 5 }] });
  expect(swept.status, JSON.stringify(swept.body)).toBe(202);
  sweep = { studyId: made.body.id, id: swept.body.id };
  await t.sweeps.drain();
  expect((await engineer.get(`/api/studies/${sweep.studyId}/sweeps/${sweep.id}`)).body).toMatchObject({ status: 'done', done: 5 });
  // A background job still waiting. The app's job loop stops first: running, it could take the job
  // (whose mail does not exist, so it ends at once) before the dump is made.
  await t.mailer.close();
  await enqueue(source, 'mail.deliver', { mailId: '0000000000000-00000000' });
  sourceLines = await dump(source);
}, 120_000);

afterAll(async () => {
  await closeDb(source);
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
});

describe('db:export / db:import', () => {
  it('covers every table of the schema', () => {
    const inSchema = Object.values(schema)
      .filter((v) => typeof v === 'object' && v !== null && Symbol.for('drizzle:IsDrizzleTable') in v)
      .map((t) => getTableConfig(t as typeof schema.users).name)
      .sort();
    expect(TABLES_IN_ORDER.map((t) => getTableConfig(t).name).sort()).toEqual(inSchema);
  });

  it('moves every row from PGlite to this database and back to a new PGlite, unchanged', async () => {
    const before = await tableCounts(source);
    for (const [table, n] of Object.entries(before)) expect(n, `rows in ${table} before the move`).toBeGreaterThan(0);
    const closing = JSON.parse(sourceLines[sourceLines.length - 1]) as { counts: Record<string, number> };
    expect(closing.counts).toEqual(before);

    const target = await openTestDb();
    expect(dbKind(target)).toBe(onPostgres() ? 'postgres' : 'pglite');
    expect(await importDatabase(target, linesOf(sourceLines))).toEqual(before);
    expect(await tableCounts(target)).toEqual(before);
    const targetLines = await dump(target);
    expect(rowsOf(targetLines)).toEqual(rowsOf(sourceLines));
    expect(await appView(target)).toEqual(await appView(source));

    const back = await openTestPglite();
    expect(await importDatabase(back, linesOf(targetLines))).toEqual(before);
    expect(rowsOf(await dump(back))).toEqual(rowsOf(sourceLines));
    expect(await appView(back)).toEqual(await appView(source));
    await closeDb(back);
    await closeDb(target);
  });

  it('refuses a target that holds data, a cut-off file and a file of another kind, keeping nothing', async () => {
    const target = await openTestDb();
    const refused = (lines: string[]) => importDatabase(target, linesOf(lines)).then(() => null, (e: unknown) => e);
    const cut = await refused(sourceLines.slice(0, -1));
    expect(cut).toBeInstanceOf(DumpError);
    expect((cut as Error).message).toMatch(/cut off/);
    const tampered = [...sourceLines.slice(0, -1), JSON.stringify({ end: true, counts: { ...JSON.parse(sourceLines.at(-1)!).counts, studies: 999 } })];
    expect(((await refused(tampered)) as Error).message).toMatch(/999 rows of studies/);
    expect(((await refused(['{"format":"something-else"}'])) as Error).message).toMatch(/not a Wyeward database dump/);
    expect(Object.values(await tableCounts(target)).every((n) => n === 0)).toBe(true);

    await importDatabase(target, linesOf(sourceLines));
    expect(((await refused(sourceLines)) as Error).message).toMatch(/already holds data/);
    await closeDb(target);
  });

  it('runs as npm run db:export / db:import on the configured database (DATA_DIR or DATABASE_URL)', async () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-dump-cli-'));
    dirs.push(dir);
    const file = path.join(dir, 'team.ndjson');
    writeFileSync(path.join(dir, 'source.ndjson'), sourceLines.join('\n') + '\n');
    const dataDir = path.join(dir, 'data');
    const store = await freshStoreEnv(dataDir);
    const cli = (args: string[]) =>
      execFileSync(process.execPath, ['--import', 'tsx', 'server/cli/db-transfer.ts', ...args], {
        env: { ...process.env, DATA_DIR: dataDir, DATABASE_URL: '', ...store },
        encoding: 'utf8',
        cwd: path.resolve(import.meta.dirname, '..', '..'),
        timeout: 120_000,
      });
    expect(cli(['import', path.join(dir, 'source.ndjson')])).toMatch(onPostgres() ? /Imported .* into the PostgreSQL at 127\.0\.0\.1/ : /Imported .* into the embedded database/);
    expect(cli(['export', file])).toMatch(/studies\s+\d+/);
    expect(rowsOf(readFileSync(file, 'utf8').trim().split('\n'))).toEqual(rowsOf(sourceLines));
    let code = 0;
    try {
      cli(['import', file]);
    } catch (e) {
      code = (e as { status: number }).status;
    }
    expect(code).toBe(2);
    // Three whole processes, each opening a database: minutes on a busy shared machine, not seconds.
  }, 300_000);
});
