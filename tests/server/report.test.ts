/**
 * The study report and the CSV exports through the API: the PDF of the open-neutral demo read back
 * with poppler's pdftotext (study name, revision, every bus voltage as the revision's results give
 * it, every flag, the caution, no generated names), page 1 rendered to PNG with pdftoppm, the
 * approved report, the CSV tables with units and the caution, per unit against V / V_base of the
 * solved values, and the 4xx answers for a bad revision, case, units or table.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { demoCircuits } from '../../shared/engine/index.ts';
import type { ResultsSummary } from '../../shared/review/summary.ts';
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';
import { circuitNames } from '../../shared/review/user-names.ts';
import { formatMagnitude, formatPu } from '../../shared/report/format.ts';
import { closeDb, type Db } from '../../server/db/index.ts';
import { makeApp, makeTeam, makeUser, signedIn, type TestApp } from './helpers.ts';
import { openTestDb } from './test-db.ts';

const openNeutral = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const STUDY = 'Brackenfield Lane 14 service';

let db: Db;
let t: TestApp;
let engineer: TestAgent;
let reviewer: TestAgent;
let viewer: TestAgent;
let outsider: TestAgent;
let reviewerId: string;
let studyId: string;
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-report-'));

/** A binary GET answer as a Buffer. */
async function getBinary(agent: TestAgent, url: string) {
  return agent.get(url).buffer(true).parse((res, cb) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => cb(null, Buffer.concat(chunks)));
  });
}

/** The text of a PDF in content order (each table cell's lines together), whitespace collapsed. */
function pdfWords(pdf: Buffer, name: string): string {
  const file = path.join(dir, name);
  writeFileSync(file, pdf);
  return execFileSync('pdftotext', ['-raw', '-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

beforeAll(async () => {
  db = await openTestDb();
  t = makeApp(db);
  const teamId = await makeTeam(db, 'Kestle Ford Networks');
  const e = await makeUser(db, teamId, 'engineer', 'Edda Engineer');
  const r = await makeUser(db, teamId, 'reviewer', 'Rhea Reviewer');
  const v = await makeUser(db, teamId, 'viewer', 'Vik Viewer');
  reviewerId = r.id;
  engineer = await signedIn(t.app, e.email);
  reviewer = await signedIn(t.app, r.email);
  viewer = await signedIn(t.app, v.email);
  const other = await makeUser(db, await makeTeam(db, 'Other team'), 'owner');
  outsider = await signedIn(t.app, other.email);
  const res = await engineer.post('/api/studies').send({ name: STUDY, content: { circuit: openNeutral } });
  expect(res.status).toBe(201);
  studyId = res.body.id;
});

afterAll(async () => {
  await t.mailer.close();
  await closeDb(db);
});

describe('GET /api/studies/:id/report.pdf', () => {
  it('is a PDF of the open-neutral demo with the name, revision, every bus voltage and flag as the results API gives them, and the caution', async () => {
    const res = await getBinary(viewer, `/api/studies/${studyId}/report.pdf?revision=1`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/pdf/);
    expect(res.headers['content-disposition']).toContain('rev1.pdf');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    const text = pdfWords(pdf, 'open-neutral.pdf');

    const rev = await viewer.get(`/api/studies/${studyId}/revisions/1`);
    expect(rev.status).toBe(200);
    const summary = rev.body.summary as ResultsSummary;
    if (!summary.ok) throw new Error('the demo solves');
    expect(text).toContain(STUDY);
    expect(text).toContain('Kestle Ford Networks');
    expect(text).toContain('Revision 1');
    expect(text).toContain('Draft — not reviewed');
    // Every page says the revision and its number.
    const pages = Number(/Page 1 of (\d+)/.exec(text)?.[1]);
    expect(pages).toBeGreaterThan(3);
    for (let p = 1; p <= pages; p++) expect(text).toContain(`${STUDY} — Revision 1 Page ${p} of ${pages}`);
    // Bus voltages: HOUSE's phases are 141.6, 68.8 and 167.3 V (the lost neutral), PAD's about 120 V.
    for (const b of summary.buses) {
      const row = [b.bus, formatMagnitude(b.nominalVLN!), ...Object.values(b.phaseVolts).flatMap((v) => [formatMagnitude(v)])];
      for (const cell of row) expect(text).toContain(cell);
      // In table order: bus, nominal, then A–N, B–N, C–N each with its angle.
      expect(text).toMatch(new RegExp(`${b.bus} ${row[1]} ${row[2]} \\S+° ${row[3]} \\S+° ${row[4]} \\S+°`));
    }
    expect(summary.buses.find((b) => b.bus === 'HOUSE')!.phaseVolts).toEqual({ a: expect.closeTo(141.6, 0), b: expect.closeTo(68.8, 0), c: expect.closeTo(167.3, 0) });
    const names = circuitNames(openNeutral);
    expect(summary.flags.length).toBeGreaterThan(3);
    for (const f of summary.flags) {
      expect(text).toContain(names.text(f.message));
      if (f.limit !== undefined) expect(text).toContain(formatMagnitude(f.limit));
    }
    expect(text).toContain('ANSI C84.1 voltage range');
    expect(text).toContain(SAFETY_CAUTION);
    expect(text).toContain('One-line diagram');
    expect(text).toContain('Phasor diagrams of the flagged buses');
    expect(text).toContain('neutral open');
    expect(text).not.toMatch(/~|[0-9a-f]{8}-[0-9a-f]{4}-|[{}]|switch3|zipLoad/);
  });

  it('renders page 1 to PNG (pdftoppm) for a look', async () => {
    const res = await getBinary(engineer, `/api/studies/${studyId}/report.pdf`);
    const file = path.join(dir, 'page.pdf');
    writeFileSync(file, res.body as Buffer);
    execFileSync('pdftoppm', ['-png', '-r', '60', '-f', '1', '-l', '1', '-singlefile', file, path.join(dir, 'page-1')]);
    const png = readFileSync(path.join(dir, 'page-1.png'));
    expect(png.subarray(1, 4).toString()).toBe('PNG');
    // A4 portrait (210 × 297 mm) at 60 dpi: about 496 × 702 pixels.
    const [w, h] = [png.readUInt32BE(16), png.readUInt32BE(20)];
    expect(Math.abs(w - 496)).toBeLessThanOrEqual(1);
    expect(Math.abs(h - 702)).toBeLessThanOrEqual(1);
    console.log(`report page 1: ${path.join(dir, 'page-1.png')}`);
  });

  it('names the approver and drops the draft mark once the revision is approved', async () => {
    const s = await engineer.post('/api/studies').send({ name: 'Approved service', content: { circuit: openNeutral } });
    expect((await engineer.post(`/api/studies/${s.body.id}/review`).send({ action: 'request', reviewers: [reviewerId] })).status).toBe(200);
    expect((await reviewer.post(`/api/studies/${s.body.id}/review`).send({ action: 'approve', acknowledgeViolations: true })).status).toBe(200);
    const text = pdfWords((await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf`)).body as Buffer, 'approved.pdf');
    expect(text).toContain('Review status Approved');
    expect(text).toMatch(/Approved by Rhea Reviewer on \d{4}-\d\d-\d\d/);
    expect(text).not.toContain('not reviewed');
  });

  it('answers 4xx with a message for a bad revision, case or units, 404 to another team and 401 without a session', async () => {
    const cases: [string, number, RegExp][] = [
      ['revision=abc', 400, /^Revision must be a whole number/],
      ['revision=0', 400, /^Revision must be at least 1/],
      ['revision=7', 404, /no revision 7; its latest is revision 1/],
      ['case=lost-n', 400, /no study cases/],
      ['units=kV', 400, /^Units must be "si" or "pu"/],
    ];
    for (const [q, status, message] of cases) {
      const res = await viewer.get(`/api/studies/${studyId}/report.pdf?${q}`);
      expect(res.status, q).toBe(status);
      expect(res.body.error.message, q).toMatch(message);
      expect(res.body.error.code, q).toEqual(expect.any(String));
    }
    expect((await outsider.get(`/api/studies/${studyId}/report.pdf`)).status).toBe(404);
    expect((await request(t.app).get(`/api/studies/${studyId}/report.pdf`)).status).toBe(401);
  });

  it('reports a study case by its id', async () => {
    const circuit = { ...openNeutral, elements: openNeutral.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)), cases: [{ id: 'lost-n', name: 'Neutral lost at the drop', changes: [{ element: 'DROP', set: { open: ['n'] } }] }] };
    const s = await engineer.post('/api/studies').send({ name: 'Cases service', content: { circuit } });
    expect(s.status).toBe(201);
    const text = pdfWords((await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf?case=lost-n`)).body as Buffer, 'case.pdf');
    expect(text).toContain('Study case Neutral lost at the drop');
    expect(text).toContain('167.3');
    const bad = await viewer.get(`/api/studies/${s.body.id}/report.pdf?case=nope`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toContain('"lost-n" (Neutral lost at the drop)');
  });

  it('keeps the page number at the foot of every page when the study and case names are as long as allowed', async () => {
    const name = `Wrenfold Close ${'pillar and service drop survey '.repeat(7)}`.slice(0, 200).trim();
    const caseName = `Neutral lost ${'at the pillar '.repeat(10)}`.trim();
    const circuit = { ...openNeutral, cases: [{ id: 'long', name: caseName, changes: [{ element: 'ROD', set: { ohms: 1000 } }] }] };
    const s = await engineer.post('/api/studies').send({ name, content: { circuit } });
    expect(s.status).toBe(201);
    for (const q of ['', '?case=long']) {
      const file = path.join(dir, `long${q ? '-case' : ''}.pdf`);
      writeFileSync(file, (await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf${q}`)).body as Buffer);
      const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1]);
      expect(pages).toBeGreaterThan(3);
      for (let p = 1; p <= pages; p++) {
        const text = execFileSync('pdftotext', ['-raw', '-enc', 'UTF-8', '-f', String(p), '-l', String(p), file, '-'], { encoding: 'utf8' });
        const foot = text.split('\n').find((l) => / Page \d+ of \d+$/.test(l)) ?? `no page number on page ${p}`;
        expect(foot, `page ${p}${q}`).toMatch(new RegExp(`^Wrenfold Close pillar and service .*… — Revision 1${q ? ', case "Neutral lost at the .*…"' : ''} Page ${p} of ${pages}$`));
      }
    }
  });

  it('says that nothing is drawn in the report of an empty study', async () => {
    const s = await engineer.post('/api/studies').send({ name: 'Blank page', content: { circuit: { format: 'wyeward-circuit', version: 1, frequencyHz: 50, elements: [] } } });
    expect(s.status).toBe(201);
    const text = pdfWords((await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf`)).body as Buffer, 'empty.pdf');
    expect(text).toContain('One-line diagram Nothing is drawn in this revision yet.');
    expect(text).toContain('Circuit inputs Nothing is drawn in this revision yet.');
    expect(text).toContain(SAFETY_CAUTION);
  });

  it('prints Greek, Cyrillic and Vietnamese names in the shipped IBM Plex subsets, and says so when a script has no font', async () => {
    // Names in Greek, Cyrillic (with «» and №) and Vietnamese, on the study, a bus and an element.
    const name = 'Υποσταθμός Άλφα — Подстанция «Север» № 2 — Trạm biến áp Đông';
    const renamed = JSON.parse(JSON.stringify(openNeutral).replaceAll('"HOUSE"', '"ΣΠΙΤΙ"').replaceAll('"HOUSE.n"', '"ΣΠΙΤΙ.n"').replaceAll('"KITCHEN"', '"Кухня"'));
    const s = await engineer.post('/api/studies').send({ name, content: { circuit: renamed } });
    expect(s.status, JSON.stringify(s.body)).toBe(201);
    const text = pdfWords((await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf`)).body as Buffer, 'scripts.pdf');
    expect(text).toContain(name);
    expect(text).toContain('ΣΠΙΤΙ');
    expect(text).toContain('Кухня');
    expect(text).not.toContain('?');
    expect(text).not.toContain('cannot print');
    expect(text).toContain(SAFETY_CAUTION);

    // Chinese: no shipped font has it. The letters print as "?", and page 1 says so.
    const cjk = await engineer.post('/api/studies').send({ name: '北区变电站 feeder', content: { circuit: openNeutral } });
    const other = pdfWords((await getBinary(viewer, `/api/studies/${cjk.body.id}/report.pdf`)).body as Buffer, 'cjk.pdf');
    expect(other).toContain('????? feeder');
    expect(other).toMatch(/letters of the names in this report are in a script the report's font cannot print and are shown as "\?"\. The study's print view shows every name as written\./);
  });

  it('names the downloads after the study and the case as people wrote them, accents and scripts kept', async () => {
    const circuit = { ...openNeutral, cases: [{ id: 'lost-n', name: 'Neutral lost — drop', changes: [{ element: 'DROP', set: { open: ['n'] } }] }] };
    const s = await engineer.post('/api/studies').send({ name: 'Étude über Straße — 中文 🔌 feeder', content: { circuit } });
    expect(s.status).toBe(201);
    const fileName = (disposition: string) => decodeURIComponent(/filename\*=UTF-8''([^;]+)/.exec(disposition)?.[1] ?? /filename="?([^";]+)/.exec(disposition)![1]);
    const pdf = await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf`);
    expect(fileName(pdf.headers['content-disposition'])).toBe('Étude-über-Straße-中文-feeder-rev1.pdf');
    expect(pdf.headers['content-disposition']).toMatch(/^attachment; filename="[\x20-\x7e]+"; filename\*=/); // an ASCII fallback first
    const ofCase = await getBinary(viewer, `/api/studies/${s.body.id}/report.pdf?case=lost-n&units=pu`);
    expect(fileName(ofCase.headers['content-disposition'])).toBe('Étude-über-Straße-中文-feeder-rev1-Neutral-lost-drop.pdf');
    const csv = await viewer.get(`/api/studies/${s.body.id}/results.csv?table=loads&case=lost-n&units=pu`);
    expect(fileName(csv.headers['content-disposition'])).toBe('Étude-über-Straße-中文-feeder-rev1-Neutral-lost-drop-loads-pu.csv');
  });
});

describe('GET /api/studies/:id/results.csv', () => {
  it('gives each table with the caution first and units in the header row', async () => {
    for (const table of ['buses', 'loads', 'elements', 'flags']) {
      const res = await viewer.get(`/api/studies/${studyId}/results.csv?table=${table}`);
      expect(res.status, table).toBe(200);
      expect(res.headers['content-type']).toMatch(/^text\/csv/);
      const lines = res.text.split('\r\n');
      expect(lines[0]).toBe(`# Caution: ${SAFETY_CAUTION}`);
      // Flags mix units (V, %, pu): they have a Unit column.
      expect(lines[1], table).toMatch(table === 'flags' ? /,Value,Limit,Unit,/ : /\((V|A|°|%)\)/);
      expect(res.text).not.toMatch(/~|switch3/);
    }
  });

  it('gives bus voltages as the results API does, and in per unit V / V_base of the same solved values', async () => {
    const summary = (await viewer.get(`/api/studies/${studyId}/revisions/1`)).body.summary as ResultsSummary;
    if (!summary.ok) throw new Error('the demo solves');
    const rows = async (units: string) => {
      const lines = (await viewer.get(`/api/studies/${studyId}/results.csv?table=buses&units=${units}`)).text.trim().split('\r\n');
      const header = lines.find((l) => l.startsWith('Bus,'))!.split(',');
      return { header, rows: lines.filter((l) => !l.startsWith('#') && !l.startsWith('Bus,')).map((l) => l.split(',')) };
    };
    const si = await rows('si');
    const pu = await rows('pu');
    expect(si.header.slice(0, 4)).toEqual(['Bus', 'Nominal V_LN (V)', 'A–N (V)', 'A–N angle (°)']);
    expect(pu.header[2]).toBe('A–N (pu)');
    for (const b of summary.buses) {
      const s = si.rows.find((r) => r[0] === b.bus)!;
      const p = pu.rows.find((r) => r[0] === b.bus)!;
      (['a', 'b', 'c'] as const).forEach((c, i) => {
        expect(s[2 + 2 * i]).toBe(formatMagnitude(b.phaseVolts[c]));
        // Base V_LN of the 0.208 kV level: 208 / √3 V (the bus nominal, the default base).
        expect(p[2 + 2 * i]).toBe(formatPu(b.phaseVolts[c] / (208 / Math.sqrt(3))));
      });
    }
    // The lost neutral: C–N at HOUSE is 1.393 pu.
    expect(pu.rows.find((r) => r[0] === 'HOUSE')![6]).toBe('1.393');
  });

  it('takes the study bases from its settings (base kV per level, MVA)', async () => {
    const s = await engineer.post('/api/studies').send({ name: 'Own bases', content: { circuit: openNeutral, layout: { kind: 'wyeward-layout', version: 1, perUnit: { baseMva: 0.5, baseKv: { '0.208': 0.24 } } } } });
    const lines = (await viewer.get(`/api/studies/${s.body.id}/results.csv?table=buses&units=pu`)).text.split('\r\n');
    expect(lines[1]).toContain('Bases: 0.5 MVA; 0.208 kV level: 240.0 V line to line, 138.6 V line to neutral');
    const house = lines.find((l) => l.startsWith('HOUSE,'))!.split(',');
    const summary = (await viewer.get(`/api/studies/${s.body.id}/revisions/1`)).body.summary as ResultsSummary;
    if (!summary.ok) throw new Error('the demo solves');
    const c = summary.buses.find((b) => b.bus === 'HOUSE')!.phaseVolts.c;
    expect(house[6]).toBe(formatPu(c / (240 / Math.sqrt(3))));
  });

  it('refuses an unknown table', async () => {
    const res = await viewer.get(`/api/studies/${studyId}/results.csv?table=sweeps`);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^Table must be one of buses, loads, elements, flags/);
  });
});
