/**
 * Stories 3 and 4 of issue 5 in a real browser against the real product (demo mode, fake SMTP server):
 * (3) the engineer requests review from the demo reviewer; the reviewer reads the diff, pins a comment on
 * an element and requests changes; the engineer changes the study and asks again; the reviewer approves;
 * every step's e-mail reaches the fake SMTP server. (4) the owner marks the approved study as a template
 * and the engineer starts a new study from it in the gallery.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import type { StudyDetail, ListStudiesResponse } from '../../shared/api/studies.ts';
import { launchBrowser, screenshot, signIn, startProduct, type RunningProduct } from './harness.ts';

const VIEWPORT = { width: 1360, height: 900 };
/** The seeded draft study (shared/engine/examples/index.ts, "feeder-earth-fault"), authored by the demo engineer. */
const STUDY_NAME = 'Four-wire feeder with a line-to-earth fault';

interface MailItem {
  id: string;
  to: string;
  subject: string;
  sentAt: string;
}

describe('review and reuse in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;
  const contexts: BrowserContext[] = [];
  let engineer: Page;
  let reviewer: Page;
  let owner: Page;
  let studyId = '';

  async function pageFor(email: string): Promise<Page> {
    const context = await browser.newContext({ viewport: VIEWPORT });
    contexts.push(context);
    const page = await context.newPage();
    page.on('pageerror', (e) => console.error(`[${email}] page error:`, e.message));
    await signIn(page, product.baseUrl, email);
    await page.waitForURL(`${product.baseUrl}/`);
    return page;
  }

  /** The study as the API returns it to this page's session. */
  async function getStudy(page: Page): Promise<StudyDetail> {
    const res = await page.request.get(`${product.baseUrl}/api/studies/${studyId}`);
    expect(res.status()).toBe(200);
    return (await res.json()) as StudyDetail;
  }

  /** Saves a changed MILL-LOAD phase-a demand through the API with this page's session (a new revision). */
  async function saveMillLoad(page: Page, kw: number, message: string): Promise<void> {
    const study = await getStudy(page);
    const circuit = structuredClone(study.content.circuit) as { elements: { id: string; phases?: { a: { kw: number } } }[] };
    const mill = circuit.elements.find((e) => e.id === 'MILL-LOAD');
    expect(mill?.phases?.a).toBeDefined();
    mill!.phases!.a.kw = kw;
    const res = await page.request.patch(`${product.baseUrl}/api/studies/${studyId}`, {
      data: { version: study.version, content: { ...study.content, circuit }, message },
      headers: { Origin: product.baseUrl },
    });
    expect(res.status(), await res.text()).toBe(200);
  }

  async function mail(): Promise<MailItem[]> {
    const res = await owner.request.get(`${product.baseUrl}/api/mail`);
    expect(res.status()).toBe(200);
    return ((await res.json()) as { items: MailItem[] }).items;
  }

  async function expectMail(to: string, subject: string): Promise<void> {
    await expect.poll(async () => (await mail()).filter((m) => m.to.includes(to) && m.subject === subject).length, { timeout: 20_000 }).toBeGreaterThan(0);
  }

  function reviewRegion(page: Page) {
    return page.getByRole('region', { name: /^Review/ });
  }

  beforeAll(async () => {
    product = await startProduct();
    browser = await launchBrowser();
    engineer = await pageFor('engineer@wyeward.test');
    reviewer = await pageFor('reviewer@wyeward.test');
    owner = await pageFor('owner@wyeward.test');
    const res = await engineer.request.get(`${product.baseUrl}/api/studies`, { params: { q: STUDY_NAME } });
    const list = (await res.json()) as ListStudiesResponse;
    const study = list.items.find((s) => s.name === STUDY_NAME);
    expect(study?.status).toBe('draft');
    studyId = study!.id;
  });

  // A failed step leaves each person's screen in test-artifacts/ for a person to look at.
  afterEach(async (ctx) => {
    if (ctx.task.result?.state !== 'fail') return;
    for (const [who, page] of [['engineer', engineer], ['reviewer', reviewer], ['owner', owner]] as const) {
      await screenshot(page, `review-failed-${who}`).catch(() => undefined);
    }
  });

  afterAll(async () => {
    for (const c of contexts) await c.close().catch(() => undefined);
    await browser?.close();
    await product?.stop();
  });

  it('story 3: request review, diff, pinned comment, changes requested, fix, approval — with e-mail at each step', async () => {
    // The engineer doubles the mill's phase-a demand (revision 2), then asks the demo reviewer to check it.
    await saveMillLoad(engineer, 800, 'Mill phase a at 800 kW');
    await engineer.goto(`${product.baseUrl}/studies/${studyId}`);
    const panel = reviewRegion(engineer);
    await panel.getByRole('button', { name: 'Request review' }).click();
    const dialog = engineer.getByRole('dialog', { name: 'Request review' });
    await dialog.getByRole('checkbox', { name: /Idunn Castellane/ }).check();
    await dialog.getByLabel('Message to the reviewers (optional)').fill('Please check the neutral current after the mill upgrade.');
    await dialog.getByRole('button', { name: 'Send request' }).click();
    await panel.getByText('asked Idunn Castellane to review revision 2', { exact: false }).waitFor();
    await dialog.waitFor({ state: 'hidden' });
    await screenshot(engineer, 'review-1-requested');
    await expectMail('reviewer@wyeward.test', `Review requested: ${STUDY_NAME}`);

    // The reviewer opens the study, reads the diff first.
    await reviewer.goto(`${product.baseUrl}/studies/${studyId}`);
    await reviewRegion(reviewer).getByRole('link', { name: 'Read the changes in revision 2' }).click();
    await reviewer.waitForURL(/\/diff\?to=2$/);
    const changes = reviewer.getByRole('region', { name: 'Changes from revision 1 to revision 2' });
    await changes.waitFor();
    const params = changes.getByRole('table', { name: 'Changes to MILL-LOAD' });
    // The changed parameter in words, never a schema path.
    await expect.poll(() => params.textContent()).toContain('phases › phase A › P (kW)');
    const results = await changes.getByRole('table', { name: 'Result changes' }).textContent();
    expect(results).toMatch(/neutral current at [^:]+: [\d.]+ A → [\d.]+ A/); // a neutral current changed, with units
    expect(results).toMatch(/[+−][\d.]+ A/); // and its signed delta
    await screenshot(reviewer, 'review-2-diff');

    // Back on the study: a comment pinned to the mill load, then "Request changes".
    await reviewer.goBack();
    const form = reviewer.getByRole('form', { name: 'New comment' });
    await form.getByLabel('New comment').fill('The mill load on phase a looks doubled — @engineer is 800 kW right?\nPlease confirm with the mill.');
    // Pick the element on the canvas, then pin the comment to the selection.
    await reviewer.locator('.react-flow__node[data-id="MILL-LOAD"]').click();
    await form.getByRole('button', { name: 'Comment on the selected element (MILL-LOAD)' }).click();
    expect(await form.getByLabel('Pin to an element or result').inputValue()).toBe('el:MILL-LOAD');
    await form.getByRole('button', { name: 'Post comment' }).click();
    await reviewer.getByRole('listitem', { name: 'Thread by Idunn Castellane, Element MILL-LOAD' }).waitFor();
    // The open thread shows as a pin on the element in the canvas.
    await reviewer.getByTitle('1 comment(s) on MILL-LOAD').waitFor();
    await expectMail('engineer@wyeward.test', `Idunn Castellane mentioned you: ${STUDY_NAME}`);
    await reviewRegion(reviewer).getByRole('button', { name: 'Request changes' }).click();
    const changesDialog = reviewer.getByRole('dialog', { name: 'Request changes to revision 2' });
    await changesDialog.getByLabel('What should change').fill('Use the metered 520 kW for phase a.');
    await changesDialog.getByRole('button', { name: 'Request changes' }).click();
    await reviewRegion(reviewer).getByText(/requested changes to revision 2/).waitFor();
    await changesDialog.waitFor({ state: 'hidden' });
    await screenshot(reviewer, 'review-3-changes-requested');
    await expectMail('engineer@wyeward.test', `Changes requested: ${STUDY_NAME}`);

    // The engineer fixes it (revision 3) and asks again; the reviewer is pre-selected.
    await saveMillLoad(engineer, 520, 'Mill phase a at the metered 520 kW');
    await engineer.goto(`${product.baseUrl}/studies/${studyId}`);
    await reviewRegion(engineer).getByRole('button', { name: 'Request review' }).click();
    const again = engineer.getByRole('dialog', { name: 'Request review' });
    expect(await again.getByRole('checkbox', { name: /Idunn Castellane/ }).isChecked()).toBe(true);
    await again.getByRole('button', { name: 'Send request' }).click();
    await reviewRegion(engineer).getByText('asked Idunn Castellane to review revision 3', { exact: false }).waitFor();
    await expect.poll(async () => (await mail()).filter((m) => m.subject === `Review requested: ${STUDY_NAME}`).length, { timeout: 20_000 }).toBe(2);

    // The reviewer approves revision 3: the fault study has violations, so the dialog states them and asks for the acknowledgement.
    await reviewer.goto(`${product.baseUrl}/studies/${studyId}`);
    await reviewRegion(reviewer).getByRole('button', { name: 'Approve' }).click();
    const approveDialog = reviewer.getByRole('dialog', { name: 'Approve revision 3?' });
    await approveDialog.getByText(/Revision 3 has \d+ violations?\./).waitFor();
    await approveDialog.getByRole('checkbox', { name: /I have read the .* of revision 3 and approve it anyway/ }).check();
    await approveDialog.getByRole('button', { name: 'Approve' }).click();
    await reviewRegion(reviewer).getByText(/Approved revision 3 by Idunn Castellane/).waitFor();
    await approveDialog.waitFor({ state: 'hidden' });
    await screenshot(reviewer, 'review-4-approved');
    await expectMail('engineer@wyeward.test', `Approved: ${STUDY_NAME}`);
    expect((await getStudy(reviewer)).approvedRevision).toBe(3);

    // The owner reads the same messages on the outgoing-mail page.
    await owner.goto(`${product.baseUrl}/team/mail`);
    await owner.getByText(`Approved: ${STUDY_NAME}`).first().waitFor();
    await screenshot(owner, 'review-5-outgoing-mail');
  });

  it('story 4: the owner marks the approved study as a template; the engineer starts a new study from it', async () => {
    await owner.goto(`${product.baseUrl}/studies/${studyId}`);
    await reviewRegion(owner).getByRole('button', { name: 'Mark as template' }).click();
    await reviewRegion(owner).getByRole('button', { name: 'Unmark template' }).waitFor();
    expect((await getStudy(owner)).isTemplate).toBe(true);

    await engineer.goto(`${product.baseUrl}/templates`);
    const card = engineer.getByRole('listitem').filter({ has: engineer.getByRole('heading', { name: STUDY_NAME }) });
    await card.getByText('Idunn Castellane').waitFor(); // who approved it
    await screenshot(engineer, 'review-6-templates');
    await card.getByRole('button', { name: `New study from template ${STUDY_NAME}` }).click();
    // Its approved revision has violations: the gallery says so before copying them.
    await engineer.getByRole('dialog', { name: `Start from “${STUDY_NAME}”?` }).getByRole('button', { name: 'Start a new study anyway' }).click();
    await engineer.waitForURL((url) => /\/studies\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(studyId));
    const newId = new URL(engineer.url()).pathname.split('/').pop()!;
    const res = await engineer.request.get(`${product.baseUrl}/api/studies/${newId}`);
    const copy = (await res.json()) as StudyDetail;
    expect(copy.clonedFrom?.id).toBe(studyId);
    expect(copy.clonedFromRevision).toBe(3);
    expect(copy.status).toBe('draft');
    await reviewRegion(engineer).waitFor();
    await screenshot(engineer, 'review-7-new-from-template');
  });

  it('history, a read-only revision, notifications, the audit trail, and export then import', async () => {
    await engineer.goto(`${product.baseUrl}/studies/${studyId}/history`);
    const history = engineer.getByRole('table', { name: 'Revisions' });
    await history.getByText('Mill phase a at the metered 520 kW').waitFor();
    await screenshot(engineer, 'review-8-history');
    await engineer.getByRole('link', { name: 'Open revision 2' }).click();
    await engineer.getByRole('heading', { name: 'Revision 2', level: 1 }).waitFor();
    await engineer.getByRole('table', { name: 'Bus voltages at this revision' }).waitFor();
    expect(await engineer.textContent('body')).toMatch(/licensed practice/);
    await screenshot(engineer, 'review-9-revision');

    await reviewer.goto(`${product.baseUrl}/notifications`);
    await reviewer.getByRole('list', { name: 'Notifications' }).getByText(/review/i).first().waitFor();
    expect(await reviewer.getByRole('link', { name: /^Notifications, \d+ unread$/ }).count()).toBe(1);
    await screenshot(reviewer, 'review-10-notifications');
    await reviewer.getByRole('button', { name: 'Mark all read' }).click();
    await reviewer.getByRole('link', { name: 'Notifications, none unread' }).waitFor();

    await owner.goto(`${product.baseUrl}/audit`);
    await owner.getByLabel('Action').selectOption('review.');
    await owner.getByRole('table', { name: 'Audit events' }).getByText('approved', { exact: true }).first().waitFor();
    // The filtered page replaces the unfiltered one when its query answers: wait for it, then
    // every row is a review action, in words.
    const reviewActions = ['review requested', 'approved', 'changes requested', 'back to draft'];
    const actionCells = owner.getByRole('table', { name: 'Audit events' }).locator('tbody tr td:nth-child(3)');
    await expect
      .poll(async () => {
        const actions = await actionCells.allTextContents();
        return actions.length > 0 && actions.every((a) => reviewActions.includes(a));
      }, { timeout: 15_000 })
      .toBe(true);
    await screenshot(owner, 'review-11-audit');

    // Export through the download endpoint, import the same file on the studies list page.
    const exported = await engineer.request.get(`${product.baseUrl}/api/studies/${studyId}/export`);
    expect(exported.status()).toBe(200);
    await engineer.goto(`${product.baseUrl}/`);
    await engineer.getByRole('button', { name: 'Import study' }).waitFor();
    await screenshot(engineer, 'review-12-studies-import');
    await engineer.getByRole('button', { name: 'Import study' }).click();
    const dialog = engineer.getByRole('dialog', { name: 'Import a study' });
    await dialog.getByLabel('Study file').setInputFiles({ name: 'feeder.wyeward.json', mimeType: 'application/json', buffer: Buffer.from(await exported.body()) });
    await dialog.getByLabel('Name (optional)').fill('Imported feeder copy');
    await dialog.getByRole('button', { name: 'Import' }).click();
    await engineer.waitForURL((url) => /\/studies\/[0-9a-f-]{36}$/.test(url.pathname) && !url.pathname.endsWith(studyId));
    const imported = (await (await engineer.request.get(`${product.baseUrl}/api/studies/${new URL(engineer.url()).pathname.split('/').pop()}`)).json()) as StudyDetail;
    expect(imported.name).toBe('Imported feeder copy');
    expect(imported.elementCount).toBe(7);
  });
});
