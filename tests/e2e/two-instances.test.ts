/**
 * Two app instances on one PostgreSQL server and one S3-compatible store, as behind a load
 * balancer: each is the real product (`server/index.ts`) with its own data directory, both with the
 * same DATABASE_URL, S3_URL/S3_BUCKET and SMTP_URL. A session made on one works on the other; a file
 * uploaded through one downloads through the other; the same-version edit race across the two gives
 * one 200 and one 409; a review e-mail is sent once, not twice; a server sweep posted to one is
 * read (progress and points) and cancelled through the other and run by exactly one of them;
 * killing one instance while writes run loses no write it acknowledged.
 */
import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { SMTPServer } from 'smtp-server';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { LOCAL_S3_CREDENTIALS, startLocalS3, type LocalS3 } from '../../server/storage/local-s3.ts';
import type { SweepJob } from '../../shared/api/sweeps.ts';
import { demoCircuits, solveCircuit, sweepCircuit, type CircuitInput } from '../../shared/engine/index.ts';
import { availableOutputs, outputValue } from '../../shared/review/sweep-outputs.ts';
import { adminQuery, startCluster, type Cluster } from '../server/pg/cluster.ts';
import { startProduct, type RunningProduct } from './harness.ts';

/** The address people open (the load balancer's): both instances are told it, every write carries it. */
const APP_URL = 'http://wyeward.lb.test';
const PDF = Buffer.from('%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n'); // "%PDF-" signature (ISO 32000-1 §7.5.2)

let cluster: Cluster;
let s3: LocalS3;
let smtp: SMTPServer;
let smtpPort: number;
/** Every message the SMTP server received, by the app's mail id header. */
const received: { mailId: string; subject: string }[] = [];
let a: RunningProduct;
let b: RunningProduct;
let sql: pg.Client;

beforeAll(async () => {
  cluster = await startCluster({ maxConnections: 100 });
  await adminQuery(cluster.url, 'create database wyeward_two');
  s3 = await startLocalS3({ dir: mkdtempSync(path.join(tmpdir(), 'wyeward-two-s3-')), bucket: 'wyeward-shared' });
  smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    logger: false,
    onData(stream, _session, callback) {
      let raw = '';
      stream.on('data', (c: Buffer) => (raw += c.toString('utf8')));
      stream.on('end', () => {
        received.push({ mailId: /^X-Wyeward-Mail-Id: (.+)$/im.exec(raw)?.[1].trim() ?? '', subject: /^Subject: (.+)$/im.exec(raw)?.[1].trim() ?? '' });
        callback();
      });
    },
  });
  smtpPort = await new Promise<number>((resolve) => smtp.listen(0, '127.0.0.1', () => resolve((smtp.server.address() as { port: number }).port)));
  const env = {
    DATABASE_URL: cluster.urlOf('wyeward_two'),
    DATABASE_POOL_MAX: '5',
    S3_URL: s3.endpoint,
    S3_BUCKET: 'wyeward-shared',
    AWS_ACCESS_KEY_ID: LOCAL_S3_CREDENTIALS.accessKeyId,
    AWS_SECRET_ACCESS_KEY: LOCAL_S3_CREDENTIALS.secretAccessKey,
    SMTP_URL: `smtp://127.0.0.1:${smtpPort}`,
    APP_URL,
    // Both instances look for queued jobs often, so both compete for every message.
    JOBS_POLL_MS: '50',
  };
  // The first start migrates and seeds the demo team; the second finds them done.
  a = await startProduct(env);
  b = await startProduct(env);
  sql = new pg.Client({ connectionString: cluster.urlOf('wyeward_two') });
  await sql.connect();
}, 400_000);

afterAll(async () => {
  await sql?.end();
  await a?.stop();
  await b?.stop();
  await new Promise<void>((resolve) => (smtp ? smtp.close(() => resolve()) : resolve()));
  await s3?.close();
  cluster?.stop();
});

/** A client of one instance that acts as the browser on APP_URL. */
function on(instance: RunningProduct, cookie?: string) {
  const with_ = <T extends request.Test>(t: T) => {
    t.set('Origin', APP_URL);
    if (cookie) t.set('Cookie', cookie);
    return t;
  };
  const r = request(instance.baseUrl);
  return {
    get: (p: string) => with_(r.get(p)),
    post: (p: string) => with_(r.post(p)),
    patch: (p: string) => with_(r.patch(p)),
    delete: (p: string) => with_(r.delete(p)),
  };
}

async function signIn(instance: RunningProduct, email: string): Promise<string> {
  const res = await on(instance).post('/api/auth/sign-in').send({ email, password: 'wyeward-demo' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return (res.headers['set-cookie'] as unknown as string[]).map((c) => c.split(';')[0]).join('; ');
}

const downloadBytes = (t: request.Test) =>
  t.buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });

describe('two instances on one database and one bucket', () => {
  it('a session made on one works on the other', async () => {
    const cookie = await signIn(a, 'engineer@wyeward.test');
    const me = await on(b, cookie).get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('engineer@wyeward.test');
  });

  it('a file uploaded through one downloads through the other, and neither keeps it on its own disk', async () => {
    const cookie = await signIn(a, 'engineer@wyeward.test');
    const studyId = (await on(a, cookie).get('/api/studies')).body.items[0].id as string;
    const up = await on(a, cookie).post(`/api/studies/${studyId}/attachments`).attach('file', PDF, 'site survey.pdf');
    expect(up.status, JSON.stringify(up.body)).toBe(201);
    const dl = await downloadBytes(on(b, cookie).get(`/api/studies/${studyId}/attachments/${up.body.id}`));
    expect(dl.status).toBe(200);
    expect(dl.headers['content-type']).toBe('application/pdf');
    expect(Buffer.compare(dl.body as Buffer, PDF)).toBe(0);
    const { existsSync } = await import('node:fs');
    for (const i of [a, b]) {
      expect(existsSync(path.join(i.dataDir, 'objects'))).toBe(false);
      expect(existsSync(path.join(i.dataDir, 'pglite'))).toBe(false);
    }
  });

  it('the same-version edit race across the two gives one 200 and one 409', async () => {
    const cookie = await signIn(a, 'engineer@wyeward.test');
    const list = (await on(a, cookie).get('/api/studies')).body.items as { id: string }[];
    const study = (await on(a, cookie).get(`/api/studies/${list[1].id}`)).body as { id: string; version: number };
    const [ra, rb] = await Promise.all([
      on(a, cookie).patch(`/api/studies/${study.id}`).send({ version: study.version, description: 'edited through A' }),
      on(b, cookie).patch(`/api/studies/${study.id}`).send({ version: study.version, description: 'edited through B' }),
    ]);
    expect([ra.status, rb.status].sort()).toEqual([200, 409]);
    const winner = ra.status === 200 ? 'edited through A' : 'edited through B';
    expect((await on(b, cookie).get(`/api/studies/${study.id}`)).body.description).toBe(winner);
  });

  it('a review e-mail is sent once, not twice', async () => {
    const cookie = await signIn(a, 'engineer@wyeward.test');
    const team = (await on(a, cookie).get('/api/team')).body as { members: { userId: string; email: string }[] };
    const reviewer = team.members.find((m) => m.email === 'reviewer@wyeward.test')!;
    // A study of its own, never in review before (the demo studies may be).
    const made = await on(a, cookie).post('/api/studies').send({ name: 'Quarry Lane service' });
    expect(made.status).toBe(201);
    const study = { id: made.body.id as string, name: 'Quarry Lane service' };
    const res = await on(b, cookie).post(`/api/studies/${study.id}/review`).send({ action: 'request', reviewers: [reviewer.userId] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    // Wait (bounded) until no delivery job is left: both instances have had every chance to send it.
    for (let i = 0; i < 400; i++) {
      const { rows } = await sql.query(`select count(*)::int as n from jobs where kind = 'mail.deliver'`);
      if (rows[0].n === 0) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    const { rows: kept } = await sql.query(`select id, delivered_at from mail_messages where subject like $1`, [`%${study.name}%`]);
    expect(kept).toHaveLength(1);
    expect(kept[0].delivered_at).not.toBeNull();
    expect(received.filter((m) => m.mailId === kept[0].id)).toHaveLength(1);
    // And no message at all went out twice.
    const ids = received.map((m) => m.mailId);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('a sweep posted to one is read and cancelled through the other, and run by exactly one of them', async () => {
    const cookie = await signIn(a, 'engineer@wyeward.test');
    const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit as CircuitInput;
    const made = await on(a, cookie).post('/api/studies').send({ name: 'Lane 14 on two instances', content: { circuit } });
    expect(made.status, JSON.stringify(made.body)).toBe(201);
    const sweeps = `/api/studies/${made.body.id}/sweeps`;
    const outputs = ['load:KITCHEN:an', 'shift:HOUSE'];
    const specs = availableOutputs(solveCircuit(circuit));
    /** Each point equals the engine's solve of the circuit with the value written (C). */
    const expectEngine = (job: SweepJob) => {
      for (const p of job.points) {
        const direct = solveCircuit(sweepCircuit(circuit, job.parameters, p.values));
        outputs.forEach((key, k) => expect(p.outputs[k]).toBeCloseTo(outputValue(direct, specs.find((s) => s.key === key)!.spec)!, 9));
      }
    };
    /** Reads the job through `instance` (bounded) until `ok` holds. */
    const until = async (instance: RunningProduct, id: string, ok: (j: SweepJob) => boolean, query = '') => {
      for (let i = 0; i < 1200; i++) {
        const res = await on(instance, cookie).get(`${sweeps}/${id}${query}`);
        expect(res.status, JSON.stringify(res.body)).toBe(200);
        if (ok(res.body)) return res.body as SweepJob;
        await new Promise((r) => setTimeout(r, 50));
      }
      throw new Error('the sweep did not get there');
    };
    const ranBy = async (id: string) => (await sql.query(`select claims, runner from sweep_jobs where id = $1`, [id])).rows[0] as { claims: number; runner: string };
    const pids = [a.pid, b.pid].map(String);

    // A small sweep posted to A runs to the end; B reads every point.
    const small = await on(a, cookie).post(sweeps).send({ parameters: [{ path: 'KITCHEN.each.kw', from: 0.5, to: 6, points: 40 }], outputs });
    expect(small.status, JSON.stringify(small.body)).toBe(202);
    const finished = await until(b, small.body.id, (j) => j.status !== 'running', '?limit=100');
    expect(finished).toMatchObject({ status: 'done', done: 40, total: 40 });
    expect(finished.points).toHaveLength(40);
    expectEngine(finished);
    const smallRun = await ranBy(small.body.id);
    expect(smallRun.claims).toBe(1);
    expect(pids).toContain(smallRun.runner.split(':').at(-1));

    // A large one posted to A: B reads its progress and first points, then cancels it.
    const large = await on(a, cookie).post(sweeps).send({ parameters: [{ path: 'KITCHEN.each.kw', from: 0.5, to: 6, points: 200_000 }], outputs });
    expect(large.status, JSON.stringify(large.body)).toBe(202);
    const running = await until(b, large.body.id, (j) => j.done > 0, '?limit=20');
    expect(running.status).toBe('running');
    expect(running.points.length).toBe(Math.min(20, running.done));
    expectEngine(running);
    const cancelled = await on(b, cookie).delete(`${sweeps}/${large.body.id}`);
    expect(cancelled.status).toBe(200);
    expect(cancelled.body.status).toBe('cancelled');
    // The instance running it notices through the database (its queue row goes) and stores nothing more.
    for (let i = 0; i < 1200; i++) {
      const { rows } = await sql.query(`select count(*)::int as n from jobs where kind = 'sweep.run'`);
      if (rows[0].n === 0) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    expect((await sql.query(`select count(*)::int as n from jobs where kind = 'sweep.run'`)).rows[0].n).toBe(0);
    const after = (await on(a, cookie).get(`${sweeps}/${large.body.id}`)).body as SweepJob;
    expect(after).toMatchObject({ status: 'cancelled', done: cancelled.body.done });
    expect(after.done).toBeLessThan(200_000);
    const largeRun = await ranBy(large.body.id);
    expect(largeRun.claims).toBe(1);
    expect(pids).toContain(largeRun.runner.split(':').at(-1));
  });

  it('killing one instance while writes run loses no write it acknowledged', async () => {
    const cookieA = await signIn(a, 'engineer@wyeward.test');
    const acknowledged: string[] = [];
    let sent = 0;
    let killed = false;
    const worker = async (w: number) => {
      for (let n = 0; n < 15; n++) {
        const target = (n + w) % 2 === 0 ? a : b;
        sent++;
        if (sent === 20 && !killed) {
          killed = true;
          void b.kill();
        }
        try {
          const res = await on(target, cookieA).post('/api/studies').send({ name: `Load ${w}-${n}` });
          if (res.status === 201) acknowledged.push(res.body.id);
        } catch {
          // B is gone: its connection was refused or cut. Nothing was acknowledged.
        }
      }
    };
    await Promise.all([0, 1, 2, 3].map(worker));
    expect(killed).toBe(true);
    expect(acknowledged.length).toBeGreaterThan(30); // A answered its half throughout
    for (const id of acknowledged) {
      expect((await on(a, cookieA).get(`/api/studies/${id}`)).status, id).toBe(200);
    }
  });
});
