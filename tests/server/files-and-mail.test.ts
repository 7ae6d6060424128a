/**
 * Attachments (type from content, 10 MB limit, team-only download), export and import of study
 * files with errors per field, and mail through real SMTP into the local fake SMTP server.
 */
import { existsSync, mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import nodemailer from 'nodemailer';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ATTACHMENT_MAX_BYTES } from '../../shared/api/attachments.ts';
import { demoCircuits } from '../../shared/engine/index.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { createMailer } from '../../server/mail/index.ts';
import { startMailSink } from '../../server/mail/sink.ts';
import { rawMail, TEAM_HEADER } from '../../server/mail/store.ts';
import { jobs } from '../../server/db/schema.ts';
import { createJobRunner } from '../../server/jobs/index.ts';
import { prepare } from '../../server/work/tasks.ts';
import { eq, sql } from 'drizzle-orm';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const circuit = demoCircuits.find((d) => d.key === 'split-phase-120-240')!.circuit;
// Signatures: PDF "%PDF-" (ISO 32000-1 §7.5.2), PNG 8-byte signature (RFC 2083 §3.1), JPEG SOI FF D8 FF.
const PDF = Buffer.from('%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n');
const PNG_HEAD = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const JPEG = Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(60, 1)]);
const CSV = Buffer.from('bus,phase,volts\nBARN,1,119.4\nBARN,2,118.3\n');

let db: Db;
let t: TestApp;
let engineer: TestAgent;
let reviewer: TestAgent;
let viewer: TestAgent;
let outsider: TestAgent;
let studyId: string;

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const team = await makeTeam(db, 'Files team');
  engineer = await signedIn(t.app, (await makeUser(db, team, 'engineer', 'Edda Engineer')).email);
  reviewer = await signedIn(t.app, (await makeUser(db, team, 'reviewer', 'Rhea Reviewer')).email);
  viewer = await signedIn(t.app, (await makeUser(db, team, 'viewer')).email);
  outsider = await signedIn(t.app, (await makeUser(db, await makeTeam(db), 'owner')).email);
  const s = await engineer.post('/api/studies').send({ name: 'Oxley Ford farm', description: 'Split-phase', content: { circuit, layout: { LIGHTS: { x: 1, y: 2 } }, settings: { grid: 20 } } });
  studyId = s.body.id;
});

afterAll(async () => {
  await t.mailer.close();
  await t.objects.close();
  await closeDb(db);
});

const upload = (agent: TestAgent, bytes: Buffer, name: string) => agent.post(`/api/studies/${studyId}/attachments`).attach('file', bytes, name);

describe('attachments', () => {
  it('stores PDF, PNG, JPEG and CSV by their content and serves them to the team as downloads', async () => {
    const pdf = await upload(reviewer, PDF, 'site report.pdf');
    expect(pdf.status, JSON.stringify(pdf.body)).toBe(201);
    expect(pdf.body).toMatchObject({ fileName: 'site report.pdf', contentType: 'application/pdf', size: PDF.length, uploadedBy: { name: 'Rhea Reviewer' } });
    expect((await upload(engineer, Buffer.concat([PNG_HEAD, Buffer.alloc(40)]), 'sketch.PNG')).body.contentType).toBe('image/png');
    expect((await upload(engineer, JPEG, 'pole.jpeg')).body.contentType).toBe('image/jpeg');
    expect((await upload(engineer, CSV, 'readings.csv')).body.contentType).toBe('text/csv');

    const list = await viewer.get(`/api/studies/${studyId}/attachments`);
    expect(list.body.items.map((a: { fileName: string }) => a.fileName)).toEqual(['readings.csv', 'pole.jpeg', 'sketch.PNG', 'site report.pdf']);
    const dl = await viewer.get(`/api/studies/${studyId}/attachments/${pdf.body.id}`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(dl.status).toBe(200);
    expect(dl.headers['content-type']).toBe('application/pdf');
    expect(dl.headers['content-disposition']).toBe('attachment; filename="site report.pdf"');
    expect(dl.headers['x-content-type-options']).toBe('nosniff');
    expect(Buffer.compare(dl.body as Buffer, PDF)).toBe(0);
    // The bytes are in the bucket (the local fake S3 server under DATA_DIR/objects), not in a folder of their own.
    expect(await t.objects.get(`attachments/${pdf.body.id}`)).not.toBeNull();
    expect(existsSync(path.join(t.config.dataDir, 'objects'))).toBe(true);
    expect(existsSync(path.join(t.config.dataDir, 'attachments'))).toBe(false);
    expect((await outsider.get(`/api/studies/${studyId}/attachments/${pdf.body.id}`)).status).toBe(404);
    expect((await outsider.get(`/api/studies/${studyId}/attachments`)).status).toBe(404);
  });

  it('answers 415 when the content is not what the name says, or not an accepted type', async () => {
    const renamed = await upload(engineer, PDF, 'photo.png');
    expect(renamed.status).toBe(415);
    expect(renamed.body.error).toEqual({ code: 'unsupported-media-type', message: "The file's content is PDF but its name ends in .png; name it .pdf or attach the right file." });
    const binary = await upload(engineer, Buffer.from([0x00, 0x01, 0x02, 0x03, 0xfe]), 'data.csv');
    expect(binary.status).toBe(415);
    expect((await upload(engineer, Buffer.from('MZ\x90\x00'), 'tool.exe')).status).toBe(415);
    expect((await upload(engineer, CSV, 'readings.pdf')).status).toBe(415);
  });

  it('accepts exactly 10 MB and answers 413 to 10 MB + 1 byte', async () => {
    const atLimit = Buffer.concat([PNG_HEAD, Buffer.alloc(ATTACHMENT_MAX_BYTES - PNG_HEAD.length)]);
    const big = await upload(engineer, atLimit, 'big.png');
    expect(big.status).toBe(201);
    const back = await viewer.get(`/api/studies/${studyId}/attachments/${big.body.id}`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(back.headers['content-length']).toBe(String(ATTACHMENT_MAX_BYTES));
    expect(Buffer.compare(back.body as Buffer, atLimit)).toBe(0);
    const over = await upload(engineer, Buffer.concat([atLimit, Buffer.alloc(1)]), 'bigger.png');
    expect(over.status).toBe(413);
    expect(over.body.error.code).toBe('payload-too-large');
  });

  it('answers 400 without a file, 403 to viewers, and lets only the uploader or an engineer delete', async () => {
    const none = await engineer.post(`/api/studies/${studyId}/attachments`).field('note', 'x');
    expect(none.status).toBe(400);
    expect(none.body.error.fields).toHaveProperty('file');
    expect((await upload(viewer, PDF, 'x.pdf')).status).toBe(403);
    const mine = (await upload(engineer, PDF, 'engineer.pdf')).body;
    expect((await reviewer.delete(`/api/studies/${studyId}/attachments/${mine.id}`)).status).toBe(403);
    expect((await engineer.delete(`/api/studies/${studyId}/attachments/${mine.id}`)).status).toBe(204);
    expect(await t.objects.get(`attachments/${mine.id}`)).toBeNull();
    expect((await engineer.get(`/api/studies/${studyId}/attachments/${mine.id}`)).status).toBe(404);
  });
});

/** Sends a Buffer body as its bytes (superagent would otherwise write a JSON-typed Buffer as JSON). */
const asSent = (body: unknown) => body as string;

describe('export and import', () => {
  it('exports a wyeward-study file with the circuit, layout and settings, and imports it back', async () => {
    const res = await viewer.get(`/api/studies/${studyId}/export`);
    expect(res.status).toBe(200);
    expect(res.headers['content-disposition']).toBe('attachment; filename=Oxley-Ford-farm.wyeward.json');
    const file = JSON.parse(res.text);
    expect(file).toMatchObject({ format: 'wyeward-study', version: 1, name: 'Oxley Ford farm', revision: 1, layout: { LIGHTS: { x: 1, y: 2 } }, settings: { grid: 20 } });
    expect(file.circuit).toEqual(circuit);

    const imported = await engineer.post('/api/studies/import?name=Imported%20farm').send(file);
    expect(imported.status).toBe(201);
    const s = await engineer.get(`/api/studies/${imported.body.id}`);
    expect(s.body).toMatchObject({ name: 'Imported farm', description: 'Split-phase', revision: 1, content: { circuit, layout: file.layout, settings: file.settings } });
    expect((await viewer.post('/api/studies/import').send(file)).status).toBe(403);
  });

  it('imports a file large enough for the work pool, sent as UTF-8 bytes, and stores its content as sent (the same JSON values; jsonb keeps its own key order)', async () => {
    // Over 32 kB, so the bytes are moved to a work thread, decoded there and stored as the JSON text it makes;
    // names in several scripts, so the UTF-8 decoding is exercised on multi-byte characters.
    const load = circuit.elements.find((e) => e.type === 'load')!;
    const big = { ...circuit, elements: [...circuit.elements, ...Array.from({ length: 600 }, (_, i) => ({ ...load, id: `Ström-Ω-電-${i}` }))] };
    const layout = { note: 'Straße — façade ✓', at: { x: 1.5, y: -2.25 } };
    const file = { format: 'wyeward-study', version: 1, name: 'Grosse Datei Ω', circuit: big, layout, settings: { grid: 20 } };
    const bytes = Buffer.from(JSON.stringify(file), 'utf8');
    expect(bytes.length).toBeGreaterThan(32 * 1024);
    const res = await engineer.post('/api/studies/import').set('Content-Type', 'application/json').serialize(asSent).send(bytes);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const stored = await engineer.get(`/api/studies/${res.body.id}`);
    expect(stored.body.name).toBe('Grosse Datei Ω');
    expect(stored.body.content.circuit).toStrictEqual(big);
    expect(stored.body.content.layout).toStrictEqual(layout);
    const exported = await engineer.get(`/api/studies/${res.body.id}/export`);
    expect(JSON.parse(exported.text).circuit).toStrictEqual(big);
    // The first revision holds the same content and the summary the work thread solved and serialised.
    const revisions = await engineer.get(`/api/studies/${res.body.id}/revisions`);
    expect(revisions.body.items).toHaveLength(1);
    expect(revisions.body.items[0].results).toMatchObject({ ok: true });
    const first = await engineer.get(`/api/studies/${res.body.id}/revisions/1`);
    expect(first.body.content.circuit).toStrictEqual(big);
    const inline = prepare(big);
    expect(inline.ok).toBe(true);
    expect(first.body.summary).toStrictEqual(inline.ok ? inline.summary : null);
  });

  it('reads a file declared in another character set as text, and one starting with a byte-order mark', async () => {
    const latin1 = Buffer.from(JSON.stringify({ ...circuit, name: 'Façade' }), 'latin1');
    const res = await engineer.post('/api/studies/import').set('Content-Type', 'application/json; charset=iso-8859-1').serialize(asSent).send(latin1);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect((await engineer.get(`/api/studies/${res.body.id}`)).body.name).toBe('Façade');
    const withMark = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(JSON.stringify({ ...circuit, name: 'Marked' }), 'utf8')]);
    const marked = await engineer.post('/api/studies/import').set('Content-Type', 'application/json').serialize(asSent).send(withMark);
    expect(marked.status, JSON.stringify(marked.body)).toBe(201);
    expect((await engineer.get(`/api/studies/${marked.body.id}`)).body.name).toBe('Marked');
  });

  it('imports a bare wyeward-circuit file, named after the circuit', async () => {
    const res = await engineer.post('/api/studies/import').send(circuit);
    expect(res.status).toBe(201);
    expect((await engineer.get(`/api/studies/${res.body.id}`)).body.name).toBe(circuit.name);
  });

  it('names each problem by its path in the file', async () => {
    const wrongFormat = await engineer.post('/api/studies/import').send({ format: 'something-else', version: 1 });
    expect(wrongFormat.status).toBe(400);
    expect(Object.keys(wrongFormat.body.error.fields)).toEqual(expect.arrayContaining(['format', 'name', 'circuit']));

    const broken = { format: 'wyeward-study', version: 1, name: 'Broken', circuit: { ...circuit, elements: [{ type: 'source', id: 'S', bus: 'B', kvLL: -1 }] } };
    const res = await engineer.post('/api/studies/import').send(broken);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation');
    expect(Object.keys(res.body.error.fields)).toContain('circuit.elements[0].kvLL');

    const bare = await engineer.post('/api/studies/import').send({ ...circuit, frequencyHz: 'sixty' });
    expect(bare.status).toBe(400);
    expect(Object.keys(bare.body.error.fields)).toContain('frequencyHz');
    expect((await engineer.post('/api/studies/import').send([1, 2])).status).toBe(400);
  });

  it('words each problem like a form error, naming the element as the file names it (no schema paths or validator phrasing)', async () => {
    const broken = { format: 'wyeward-study', version: 1, name: 'Broken', circuit: { ...circuit, elements: [{ type: 'source', id: 'S', bus: 'B', kvLL: -1 }] } };
    const res = await engineer.post('/api/studies/import').send(broken);
    expect(res.body.error.fields['circuit.elements[0].kvLL']).toBe('element S: rated voltage (kV, line to line) must be greater than 0');
    expect(res.body.error.message).toBe('The file is not valid: element S: rated voltage (kV, line to line) must be greater than 0.');

    const load3 = {
      ...circuit,
      elements: [...circuit.elements, { type: 'load', id: 'LOAD3', bus: 'B1', connection: 'single', between: ['a', 'n'], each: { kw: 'three', kvar: 0 } }],
    };
    const text = await engineer.post('/api/studies/import').send(load3);
    expect(text.status).toBe(400);
    expect(Object.values(text.body.error.fields)).toEqual(['element LOAD3: every phase › P (kW) must be a number']);

    const bare = await engineer.post('/api/studies/import').send({ ...circuit, frequencyHz: 'sixty', elements: [{ type: 'warpdrive', id: 'W1' }] });
    const words = Object.values(bare.body.error.fields) as string[];
    expect(words).toContain('frequency (Hz) must be a number');
    expect(words).toContain('element W1: “warpdrive” is not a kind of element Wyeward knows (the circuit file format lists them)');
    for (const w of [...words, bare.body.error.message]) expect(w).not.toMatch(/Invalid input|expected number|elements\[|switch3|zipLoad|voltageSource/);
  });
});

describe('mail through SMTP into the local fake server', () => {
  it('receives a message sent over SMTP by any client and keeps it for the mail page', async () => {
    const sink = await startMailSink({ db });
    try {
      const client = nodemailer.createTransport({ host: sink.host, port: sink.port, secure: false, ignoreTLS: true });
      const info = await client.sendMail({
        from: 'Wyeward <no-reply@wyeward.test>',
        to: 'rhea@example.test',
        subject: 'Review requested: Oxley Ford farm',
        text: 'plain <b>text</b>',
        html: '<p>&lt;b&gt;</p>',
        headers: { [TEAM_HEADER]: 'team-1' },
      });
      expect(info.accepted).toEqual(['rhea@example.test']);
      const list = await t.mailer.list('team-1');
      expect(list).toHaveLength(1);
      expect(list[0]).toMatchObject({ to: 'rhea@example.test', subject: 'Review requested: Oxley Ford farm' });
      const m = await t.mailer.get('team-1', list[0].id);
      expect(m).toMatchObject({ text: 'plain <b>text</b>', html: '<p>&lt;b&gt;</p>' });
      expect(await t.mailer.list('team-2')).toEqual([]);
      const row = await rawMail(db, list[0].id);
      expect(row?.raw).toMatch(/^Subject: Review requested: Oxley Ford farm$/m);
      expect(row?.deliveredAt).not.toBeNull();
    } finally {
      await sink.close();
    }
  });

  it('the app mailer keeps the message at once and its delivery job sends it over SMTP to its own sink', async () => {
    const where = await t.mailer.start();
    expect(where.local).toBe(true);
    expect(where.smtp).toMatch(/^127\.0\.0\.1:\d+$/);
    const id = await t.mailer.send({ teamId: 'team-x', to: 'someone@example.test', subject: 'Hello over SMTP', text: 'body' });
    expect((await t.mailer.list('team-x')).map((m) => m.subject)).toEqual(['Hello over SMTP']);
    await t.jobs.drain();
    expect((await rawMail(db, id))?.deliveredAt).not.toBeNull();
    expect((await t.mailer.list('team-x'))[0].delivered).toBe(true);
    expect(await db.select().from(jobs)).toEqual([]); // the finished job is gone
  });

  it('keeps the copy, does not fail the action, and retries with back-off when the SMTP server cannot be reached', async () => {
    const runner = createJobRunner(db, { backoffBaseMs: 60_000 });
    const mailer = createMailer({ db, jobs: runner, from: 'x@example.test', smtpUrl: 'smtp://127.0.0.1:1' });
    const warnings: string[] = [];
    const original = console.error;
    console.error = (line: unknown) => warnings.push(String(line));
    try {
      const id = await mailer.send({ teamId: 't-down', to: 'a@example.test', subject: 'Invite', text: 'link' });
      expect(await mailer.get('t-down', id)).toMatchObject({ subject: 'Invite', delivered: false });
      await runner.drain();
      const [job] = await db.select().from(jobs).where(sql`${jobs.payload}->>'mailId' = ${id}`);
      // One attempt made; the next waits a minute (the back-off base here), counted by the database clock.
      expect(job).toMatchObject({ kind: 'mail.deliver', status: 'queued', attempts: 1 });
      expect(job.lastError).toMatch(/ECONNREFUSED|connect/i);
      const [{ wait }] = await db.select({ wait: sql<string>`extract(epoch from ${jobs.runAt} - now())` }).from(jobs).where(eq(jobs.id, job.id));
      expect(Number(wait)).toBeGreaterThan(50);
      expect(warnings.some((w) => w.includes('"job-failed"'))).toBe(true);
      expect((await rawMail(db, id))?.deliveredAt).toBeNull();
      await db.delete(jobs).where(eq(jobs.id, job.id));
    } finally {
      console.error = original;
      await runner.close();
    }
  });
});
