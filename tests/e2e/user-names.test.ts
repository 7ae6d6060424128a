/**
 * Issue 8, "Done when": a search of every user-visible page and e-mail of a test run finds no
 * internal name. A study whose source and kitchen neutrals were opened with one click (stored as
 * the workspace stores them: hidden switches `<element>~<field>~sw` and private terminal buses) gets
 * a few revisions and comments, a review, an approval with its violations acknowledged in the
 * approve dialog, a template mark and a copy from the gallery. Then every route is visited as each
 * role, and every page's text (document.body.innerText, tooltips and accessible names) and every e-mail is searched for: the
 * private marker "~", "#"-names, engine type names (switch3, zipLoad, capacitorBank, …), UUIDs
 * and JSON braces. Links may carry ids (they are addresses, not words), so addresses are left out.
 * Screenshots of each page the engineer sees land in test-artifacts/names-*.png.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { demoCircuits } from '../../shared/engine/index.ts';
import type { StudyDetail } from '../../shared/api/studies.ts';
import { launchBrowser, screenshot, signIn, startProduct, type RunningProduct } from './harness.ts';

const VIEWPORT = { width: 1360, height: 900 };
const STUDY_NAME = 'Names check — opened neutrals';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const repaired = { ...demo, elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) };
/** The repaired service with the source's and the kitchen's neutrals opened, as the workspace saves a one-click opening. */
const opened = {
  ...repaired,
  elements: [
    ...repaired.elements.map((e) => (e.id === 'XFMR-SEC' ? { ...e, bus: 'XFMR-SEC~bus' } : e.id === 'KITCHEN' ? { ...e, bus: 'KITCHEN~bus' } : e)),
    { type: 'switch3', id: 'XFMR-SEC~bus~sw', from: 'PAD', to: 'XFMR-SEC~bus', conductors: ['a', 'b', 'c', 'n'], closed: true, open: ['n'] },
    { type: 'switch3', id: 'KITCHEN~bus~sw', from: 'HOUSE', to: 'KITCHEN~bus', conductors: ['a', 'n'], closed: true, open: ['n'] },
  ],
};

/** What must never be read: the private marker, #-names, engine type names, UUIDs, JSON braces. */
const INTERNAL: { what: string; re: RegExp }[] = [
  { what: 'private marker "~"', re: /~/ },
  { what: '#-name', re: /#[A-Za-z0-9]/ },
  { what: 'engine type name', re: /\b(switch3|voltageSource|currentSource|zipLoad|coupledBranch|admittanceMatrix|capacitorBank|splitPhaseTransformer|splitPhaseSource)\b/ },
  { what: 'UUID', re: /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/i },
  { what: 'JSON brace', re: /[{}]/ },
  // One number for users: the revision. The edit version ("v2") is internal.
  { what: 'edit version', re: /\bv\d+\b/ },
];

/** The text people read, without web addresses (links carry ids by design). */
function words(text: string): string {
  return text.replace(/https?:\/\/\S+/g, '');
}

/** Every internal name found in `text`, with a little context. */
function leaks(text: string): string[] {
  const out: string[] = [];
  const t = words(text);
  for (const { what, re } of INTERNAL) {
    const g = new RegExp(re.source, re.flags.includes('g') ? re.flags : `${re.flags}g`);
    for (const m of t.matchAll(g)) out.push(`${what}: …${t.slice(Math.max(0, m.index! - 40), m.index! + 40).replace(/\s+/g, ' ')}…`);
  }
  return out;
}

interface MailItem {
  id: string;
  to: string;
  subject: string;
}

describe('no internal name on any page or e-mail', () => {
  let product: RunningProduct;
  let browser: Browser;
  const contexts: BrowserContext[] = [];
  const pages = {} as Record<'owner' | 'engineer' | 'reviewer' | 'viewer', Page>;
  let studyId = '';
  let copyId = '';
  const found: string[] = [];

  async function pageFor(email: string): Promise<Page> {
    const context = await browser.newContext({ viewport: VIEWPORT });
    contexts.push(context);
    const page = await context.newPage();
    page.on('pageerror', (e) => console.error(`[${email}] page error:`, e.message));
    await signIn(page, product.baseUrl, email);
    await page.waitForURL(`${product.baseUrl}/`);
    return page;
  }

  async function api(page: Page, method: 'get' | 'post' | 'patch', path: string, data?: unknown) {
    const res = await page.request[method](`${product.baseUrl}${path}`, { ...(data !== undefined ? { data } : {}), headers: { Origin: product.baseUrl } });
    const body = await res.text();
    expect(res.status(), `${method.toUpperCase()} ${path}: ${body}`).toBeLessThan(300);
    return body ? JSON.parse(body) : null;
  }

  /** Opens `path`, waits until nothing says "Loading", and returns the page's text. */
  async function visit(page: Page, path: string): Promise<string> {
    await page.goto(`${product.baseUrl}${path}`);
    await page.waitForLoadState('networkidle');
    await expect
      .poll(async () => (await page.evaluate(() => document.body.innerText)).match(/Loading [^\n(]*…/)?.[0] ?? null, { timeout: 20_000, message: `${path} keeps loading` })
      .toBeNull();
    if (/^\/studies\/[^/]+$/.test(path)) {
      // The workspace solves in a worker: wait for the results of the drawn buses.
      await page.getByRole('region', { name: 'Results' }).getByText('HOUSE').first().waitFor({ timeout: 20_000 }).catch(() => undefined);
    }
    // What people read: the text, and the tooltips and accessible names screen readers speak.
    return page.evaluate(() => {
      const attrs = [...document.querySelectorAll('[title], [aria-label], [alt], [placeholder]')].flatMap((el) =>
        ['title', 'aria-label', 'alt', 'placeholder'].map((a) => el.getAttribute(a)).filter((v): v is string => !!v),
      );
      return `${document.body.innerText}\n${attrs.join('\n')}`;
    });
  }

  function check(where: string, text: string) {
    for (const l of leaks(text)) found.push(`${where}: ${l}`);
  }

  beforeAll(async () => {
    product = await startProduct();
    browser = await launchBrowser();
    pages.engineer = await pageFor('engineer@wyeward.test');
    pages.reviewer = await pageFor('reviewer@wyeward.test');
    pages.owner = await pageFor('owner@wyeward.test');
    pages.viewer = await pageFor('viewer@wyeward.test');
  });

  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => undefined);
    await browser?.close();
    await product?.stop();
  });

  it('a study with opened neutrals goes through revisions, comments, review, an acknowledged approval, a template and a copy', async () => {
    const e = pages.engineer;
    const created = await api(e, 'post', '/api/studies', { name: STUDY_NAME, description: 'Source and kitchen neutrals opened with one click.', content: { circuit: repaired } });
    studyId = created.id;
    const s1 = (await api(e, 'get', `/api/studies/${studyId}`)) as StudyDetail;
    await api(e, 'patch', `/api/studies/${studyId}`, { version: s1.version, content: { circuit: opened }, message: 'Source and kitchen neutrals opened' });
    await api(e, 'post', `/api/studies/${studyId}/comments`, { body: 'Kitchen neutral opened on purpose, @idunn please check.', anchor: { elementId: 'KITCHEN' } });
    await api(e, 'post', `/api/studies/${studyId}/comments`, { body: 'What does the kitchen see?', anchor: { resultRow: { table: 'bus-voltages', key: 'KITCHEN~bus' } } });
    await api(e, 'post', `/api/studies/${studyId}/comments`, { body: 'And the source?', anchor: { elementId: 'XFMR-SEC~bus~sw' } });
    const team = await api(e, 'get', '/api/team');
    const reviewerId = team.members.find((m: { email: string }) => m.email === 'reviewer@wyeward.test').userId;
    await api(e, 'post', `/api/studies/${studyId}/review`, { action: 'request', reviewers: [reviewerId], message: 'Both neutrals are open on purpose.' });

    // The reviewer approves in the dialog: it states the violations and needs the acknowledgement.
    const r = pages.reviewer;
    await r.goto(`${product.baseUrl}/studies/${studyId}`);
    const review = r.getByRole('region', { name: /^Review/ });
    await review.getByRole('button', { name: 'Approve' }).click();
    const dialog = r.getByRole('dialog', { name: 'Approve revision 2?' });
    await dialog.getByText(/Revision 2 has \d+ violations?\./).waitFor();
    expect(await dialog.textContent()).toMatch(/The worst: .+ pu is above/);
    await screenshot(r, 'names-approve-dialog');
    await dialog.getByRole('button', { name: 'Approve' }).click();
    await dialog.getByText('Acknowledge the violations to approve this revision, or request changes instead.').waitFor();
    await dialog.getByRole('checkbox', { name: /I have read the \d+ violations of revision 2/ }).check();
    await dialog.getByRole('button', { name: 'Approve' }).click();
    await review.getByText(/Approved acknowledging \d+ violations of that revision\./).waitFor();
    await screenshot(r, 'names-approved');

    // The owner marks it as a template; the engineer starts from it, after the gallery states its violations.
    const o = pages.owner;
    await o.goto(`${product.baseUrl}/studies/${studyId}`);
    await o.getByRole('region', { name: /^Review/ }).getByRole('button', { name: 'Mark as template' }).click();
    await o.getByRole('region', { name: /^Review/ }).getByRole('button', { name: 'Unmark template' }).waitFor();
    await e.goto(`${product.baseUrl}/templates`);
    const card = e.getByRole('listitem').filter({ has: e.getByRole('heading', { name: STUDY_NAME }) });
    await card.getByText(/Revision 2 has \d+ violations?\./).waitFor();
    await screenshot(e, 'names-templates');
    await card.getByRole('button', { name: `New study from template ${STUDY_NAME}` }).click();
    const start = e.getByRole('dialog', { name: `Start from “${STUDY_NAME}”?` });
    await start.getByRole('button', { name: 'Start a new study anyway' }).click();
    await e.waitForURL((url) => /\/studies\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(studyId));
    copyId = new URL(e.url()).pathname.split('/').pop()!;

    // A refused import reads like a form error.
    await e.goto(`${product.baseUrl}/`);
    await e.getByRole('button', { name: 'Import study' }).click();
    const imp = e.getByRole('dialog', { name: 'Import a study' });
    const bad = { ...repaired, elements: [...repaired.elements, { type: 'load', id: 'LOAD3', bus: 'HOUSE', connection: 'single', between: ['a', 'n'], each: { kw: 'three' } }] };
    await imp.getByLabel('Study file').setInputFiles({ name: 'bad.json', mimeType: 'application/json', buffer: Buffer.from(JSON.stringify(bad)) });
    await imp.getByRole('button', { name: 'Import' }).click();
    await imp.getByText('element LOAD3: every phase › P (kW) must be a number').waitFor();
    check('import dialog', (await imp.innerText()) ?? '');
    await screenshot(e, 'names-import-error');
  });

  it('every route, as each role, reads without an internal name', async () => {
    found.length = 0;
    const routes = (role: string) => [
      '/',
      '/templates',
      '/notifications',
      `/studies/${studyId}`,
      `/studies/${studyId}/details`,
      `/studies/${studyId}/history`,
      `/studies/${studyId}/balance`,
      `/studies/${studyId}/revisions/1`,
      `/studies/${studyId}/revisions/2`,
      `/studies/${studyId}/diff`,
      `/studies/${studyId}/diff?from=2&to=1`,
      `/studies/${studyId}/print/2`,
      `/studies/${copyId}`,
      `/studies/${copyId}/details`,
      ...(role === 'owner' ? ['/team', '/team/mail', '/audit'] : []),
    ];
    let visited = 0;
    for (const role of ['engineer', 'reviewer', 'viewer', 'owner'] as const) {
      for (const path of routes(role)) {
        const text = await visit(pages[role], path);
        visited++;
        check(`${role} ${path}`, text);
        if (role === 'engineer' || ['/audit', '/team', '/team/mail'].includes(path)) {
          await screenshot(pages[role], `names-${role}-${path.replace(studyId, 'study').replace(copyId, 'copy').replace(/[^a-z0-9]+/gi, '-').replace(/^-|-$/g, '') || 'home'}`);
        }
      }
    }
    expect(visited).toBe(4 * 14 + 3);
    // Pages that must show the opened connections did so in words.
    const diff = await visit(pages.reviewer, `/studies/${studyId}/diff?from=1&to=2`);
    expect(diff).toContain('opened conductors of the connection KITCHEN–HOUSE');
    expect(diff).toContain('opened conductors of the connection XFMR-SEC–PAD');
    const details = await visit(pages.viewer, `/studies/${studyId}/details`);
    expect(details).toMatch(/6 elements stored/);
    expect(found, found.join('\n')).toEqual([]);
  });

  it('every e-mail of the run reads without an internal name, on the mail page and in full', async () => {
    found.length = 0;
    const o = pages.owner;
    const list = ((await api(o, 'get', '/api/mail')) as { items: MailItem[] }).items;
    expect(list.some((m) => m.subject === `Approved: ${STUDY_NAME}`)).toBe(true);
    expect(list.some((m) => m.subject === `Review requested: ${STUDY_NAME}`)).toBe(true);
    for (const m of list) {
      const full = (await api(o, 'get', `/api/mail/${m.id}`)) as { subject: string; text: string; html?: string };
      check(`mail "${m.subject}" (text)`, `${full.subject}\n${full.text}`);
      if (full.html) check(`mail "${m.subject}" (html)`, full.html.replace(/<[^>]*>/g, ' ').replace(/&[a-z#0-9]+;/g, ' '));
    }
    const approval = list.find((m) => m.subject === `Approved: ${STUDY_NAME}`)!;
    const text = await visit(o, `/team/mail?message=${approval.id}`);
    expect(text).toMatch(/Revision 2 has \d+ violations; the worst: /);
    expect(text).toContain('A lost or open neutral puts dangerous voltages on equipment and people.');
    check('mail page', text);
    await screenshot(o, 'names-mail-approval');
    expect(found, found.join('\n')).toEqual([]);
  });
});
