/**
 * Files through the S3 API: the local fake S3 server the app starts when no bucket is configured,
 * attachment files of earlier versions moved from DATA_DIR/attachments into the bucket at start,
 * and plain answers when the store is unreachable or an object is missing.
 */
import { existsSync, mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, type Db } from '../../../server/db/index.ts';
import { attachments } from '../../../server/db/schema.ts';
import { LOCAL_S3_CREDENTIALS, startLocalS3 } from '../../../server/storage/local-s3.ts';
import { moveLocalAttachments } from '../../../server/storage/move-attachments.ts';
import { makeApp, makeStudy, makeTeam, makeUser, signedIn, type TestApp } from '../helpers.ts';
import { openTestDb } from '../test-db.ts';

const PDF = Buffer.from('%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n'); // "%PDF-" signature (ISO 32000-1 §7.5.2)
const CSV = Buffer.from('bus,volts\nMILL,118.9\n');

let db: Db;
let t: TestApp;
let team: string;
let engineer: Awaited<ReturnType<typeof makeUser>>;
let studyId: string;

const download = (agent: Awaited<ReturnType<typeof signedIn>>, id: string) =>
  agent
    .get(`/api/studies/${studyId}/attachments/${id}`)
    .buffer(true)
    .parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  team = await makeTeam(db, 'Bucket team');
  engineer = await makeUser(db, team, 'engineer', 'Ena Engineer');
  studyId = (await makeStudy(db, team, engineer.id, 'Mill feeder')).id;
});

afterAll(async () => {
  await t.objects.close();
  await t.mailer.close();
  await closeDb(db);
});

describe('the local fake S3 server', () => {
  it('answers the health check and keeps its files under DATA_DIR/objects', async () => {
    const health = await request(t.app).get('/api/health');
    expect(health.status).toBe(200);
    expect(health.body).toMatchObject({ ok: true, bucket: { ok: true } });
    await t.objects.put('probe/one', CSV, 'text/csv');
    expect(existsSync(path.join(t.config.dataDir, 'objects'))).toBe(true);
  });
});

describe('attachment files of earlier versions', () => {
  it('move from DATA_DIR/attachments into the bucket at start and download as before; files of deleted attachments are dropped', async () => {
    const [pdfRow, csvRow] = await db
      .insert(attachments)
      .values([
        { studyId, teamId: team, fileName: 'old survey.pdf', contentType: 'application/pdf', size: PDF.length, uploadedBy: engineer.id },
        { studyId, teamId: team, fileName: 'old readings.csv', contentType: 'text/csv', size: CSV.length, uploadedBy: engineer.id },
      ])
      .returning();
    const dir = path.join(t.config.dataDir, 'attachments');
    mkdirSync(dir, { recursive: true });
    writeFileSync(path.join(dir, pdfRow.id), PDF);
    writeFileSync(path.join(dir, csvRow.id), CSV);
    writeFileSync(path.join(dir, '00000000-0000-4000-8000-000000000000'), Buffer.from('of an attachment deleted long ago'));

    const agent = await signedIn(t.app, engineer.email);
    expect((await agent.get(`/api/studies/${studyId}/attachments/${pdfRow.id}`)).status).toBe(404); // not moved yet

    expect(await moveLocalAttachments(db, t.objects, t.config.dataDir)).toEqual({ moved: 2, dropped: 1 });
    expect(existsSync(dir)).toBe(false);
    const pdf = await download(agent, pdfRow.id);
    expect(pdf.status).toBe(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(Buffer.compare(pdf.body as Buffer, PDF)).toBe(0);
    const csv = await download(agent, csvRow.id);
    expect(Buffer.compare(csv.body as Buffer, CSV)).toBe(0);

    // A second start finds nothing to move.
    expect(await moveLocalAttachments(db, t.objects, t.config.dataDir)).toEqual({ moved: 0, dropped: 0 });
  });

  it('an attachment whose object is missing from the bucket answers 404 in words', async () => {
    const [row] = await db.insert(attachments).values({ studyId, teamId: team, fileName: 'lost.csv', contentType: 'text/csv', size: 3, uploadedBy: engineer.id }).returning();
    const agent = await signedIn(t.app, engineer.email);
    const res = await agent.get(`/api/studies/${studyId}/attachments/${row.id}`);
    expect(res.status).toBe(404);
    expect(res.body.error).toEqual({ code: 'not-found', message: 'The file of this attachment is missing from the file store.' });
  });
});

describe('a bucket named by S3_URL and S3_BUCKET', () => {
  it('stores and serves attachments with the keys from AWS_ACCESS_KEY_ID / AWS_SECRET_ACCESS_KEY, and refuses in words with wrong keys', async () => {
    // An S3-compatible store of its own (the same fake server, started apart from the app).
    const store = await startLocalS3({ dir: mkdtempSync(path.join(tmpdir(), 'wyeward-s3-')), bucket: 'team-files' });
    const env = { S3_URL: store.endpoint, S3_BUCKET: 'team-files', AWS_REGION: 'eu-west-1' };
    const shared = makeApp(db, { ...env, AWS_ACCESS_KEY_ID: LOCAL_S3_CREDENTIALS.accessKeyId, AWS_SECRET_ACCESS_KEY: LOCAL_S3_CREDENTIALS.secretAccessKey });
    const wrong = makeApp(db, { ...env, AWS_ACCESS_KEY_ID: LOCAL_S3_CREDENTIALS.accessKeyId, AWS_SECRET_ACCESS_KEY: 'not-the-key' });
    try {
      expect(shared.config.s3Local).toBe(false);
      expect((await request(shared.app).get('/api/health')).body).toMatchObject({ ok: true, bucket: { ok: true } });
      const agent = await signedIn(shared.app, engineer.email);
      const up = await agent.post(`/api/studies/${studyId}/attachments`).attach('file', PDF, 'shared.pdf');
      expect(up.status).toBe(201);
      const dl = await download(agent, up.body.id);
      expect(Buffer.compare(dl.body as Buffer, PDF)).toBe(0);
      expect(existsSync(path.join(shared.config.dataDir, 'objects'))).toBe(false); // nothing on the app's disk

      const other = await signedIn(wrong.app, engineer.email);
      expect((await other.get(`/api/studies/${studyId}/attachments/${up.body.id}`)).status).toBe(503);
      expect((await request(wrong.app).get('/api/health')).status).toBe(503);
    } finally {
      await shared.objects.close();
      await wrong.objects.close();
      await shared.mailer.close();
      await wrong.mailer.close();
      await store.close();
    }
  });
});

describe('an unreachable bucket', () => {
  it('answers 503 in words to uploads and downloads, keeps no half-made attachment, and health says so', async () => {
    // Port 1 on loopback: nothing listens there, so every request to the store is refused.
    const down = makeApp(db, { S3_URL: 'http://127.0.0.1:1', S3_BUCKET: 'wyeward-down', AWS_ACCESS_KEY_ID: 'x', AWS_SECRET_ACCESS_KEY: 'y' });
    const agent = await signedIn(down.app, engineer.email);
    const up = await agent.post(`/api/studies/${studyId}/attachments`).attach('file', PDF, 'site.pdf');
    expect(up.status).toBe(503);
    expect(up.body.error).toEqual({ code: 'unavailable', message: 'The file store cannot be reached just now, so the file was not attached. Try again in a moment.' });
    const list = await agent.get(`/api/studies/${studyId}/attachments`);
    expect(list.body.items.map((a: { fileName: string }) => a.fileName)).not.toContain('site.pdf');

    const [row] = await db.insert(attachments).values({ studyId, teamId: team, fileName: 'kept.pdf', contentType: 'application/pdf', size: PDF.length, uploadedBy: engineer.id }).returning();
    const dl = await agent.get(`/api/studies/${studyId}/attachments/${row.id}`);
    expect(dl.status).toBe(503);
    expect(dl.body.error.message).toBe('The file store cannot be reached just now, so the file cannot be downloaded. Try again in a moment.');

    const health = await request(down.app).get('/api/health');
    expect(health.status).toBe(503);
    expect(health.body).toMatchObject({ ok: false, bucket: { ok: false, error: 'unreachable' } });
    await down.objects.close();
    await down.mailer.close();
  });
});
