/**
 * A phone's width (390 × 844 CSS px): every main page fits the screen. The document never scrolls
 * sideways (`scrollWidth <= innerWidth`); a wide table scrolls inside its own box instead. Each
 * page is visited as the owner, who sees them all, on a study with two revisions (so the history,
 * the diff and the print view have something to show). When a page overflows, the test names the
 * elements that stick out past the right edge. Screenshots land in test-artifacts/phone-*.png.
 * Then, on the same product: a select people can change looks like a field they can change, not
 * greyed as a read-only one (CSS `:read-only` matches every select).
 */
import { expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import type { ListStudiesResponse, StudyDetail } from '../../shared/api/studies.ts';
import { screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const PHONE = { width: 390, height: 844 };
/** A seeded study with wide results tables (shared/engine/examples). */
const STUDY_NAME = 'Four-wire feeder with a line-to-earth fault';

let product: RunningProduct;
let browser: Browser;
useProductAndBrowser((p, b) => {
  product = p;
  browser = b;
});

/** Waits until the page has stopped loading and solving. */
async function settle(page: Page): Promise<void> {
  await page.waitForLoadState('networkidle');
  await expect
    .poll(async () => (await page.evaluate(() => document.body.innerText)).match(/Loading [^\n(]*…|Solving…/)?.[0] ?? null, { timeout: 30_000 })
    .toBeNull();
  // Late layout (fonts, a fitted canvas) settles within a frame or two.
  await page.waitForTimeout(300);
}

/** The document's sideways overflow, and the outermost elements that reach past the right edge. */
async function overflow(page: Page) {
  return page.evaluate(() => {
    const width = window.innerWidth;
    const out: string[] = [];
    for (const el of document.querySelectorAll<HTMLElement>('body *')) {
      const box = el.getBoundingClientRect();
      if (box.width === 0 || box.right <= width + 0.5) continue;
      const parent = el.parentElement;
      if (parent && parent.getBoundingClientRect().right > width + 0.5) continue; // name the outermost only
      out.push(`<${el.tagName.toLowerCase()} class="${String(el.className).slice(0, 80)}"> right ${Math.round(box.right)} px: ${(el.textContent ?? '').trim().slice(0, 50)}`);
    }
    return { scrollWidth: document.documentElement.scrollWidth, innerWidth: width, sticking: out.slice(0, 10) };
  });
}

it('every main page fits a 390 px wide screen: no sideways scroll of the page', async () => {
  const context = await browser.newContext({ viewport: PHONE, isMobile: false });
  const page = await context.newPage();
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  const failures: string[] = [];

  async function check(name: string, path: string) {
    await page.goto(`${product.baseUrl}${path}`);
    await settle(page);
    await screenshot(page, `phone-${name}`);
    const o = await overflow(page);
    if (o.scrollWidth > o.innerWidth) failures.push(`${name} (${path}): ${o.scrollWidth} px wide on a ${o.innerWidth} px screen\n    ${o.sticking.join('\n    ')}`);
  }

  await check('sign-in', '/sign-in');
  await signIn(page, product.baseUrl, 'owner@wyeward.test');
  await page.waitForURL(`${product.baseUrl}/`);

  const list = (await (await page.request.get(`${product.baseUrl}/api/studies`)).json()) as ListStudiesResponse;
  const id = list.items.find((s) => s.name === STUDY_NAME)!.id;
  // A second revision, so that history, diff and print have two to show.
  const study = (await (await page.request.get(`${product.baseUrl}/api/studies/${id}`)).json()) as StudyDetail;
  const saved = await page.request.patch(`${product.baseUrl}/api/studies/${id}`, {
    data: { version: study.version, content: study.content, message: 'Second revision for the phone check' },
    headers: { Origin: product.baseUrl },
  });
  expect(saved.status(), await saved.text()).toBe(200);

  await check('studies', '/');
  await check('workspace', `/studies/${id}`);
  // Fitting is not enough: the diagram itself keeps a usable size beside the palette and the properties.
  const diagram = (await page.getByLabel('Diagram', { exact: true }).boundingBox())!;
  if (diagram.width < 300 || diagram.height < 300) failures.push(`workspace: the diagram is only ${Math.round(diagram.width)} × ${Math.round(diagram.height)} px`);
  await check('details-and-review', `/studies/${id}/details`);
  await check('history', `/studies/${id}/history`);
  await check('revision', `/studies/${id}/revisions/2`);
  await check('diff', `/studies/${id}/diff?from=1&to=2`);
  await check('print', `/studies/${id}/print/2`);
  await check('balancing', `/studies/${id}/balance`);
  await check('templates', '/templates');
  await check('team', '/team');
  await check('team-mail', '/team/mail');
  await check('audit', '/audit');
  await check('notifications', '/notifications');
  await context.close();

  expect(failures, failures.join('\n')).toEqual([]);
  expect(errors).toEqual([]);
});

it('a select people can change looks as editable as a text box beside it, not greyed as read-only', async () => {
  const context = await browser.newContext({ viewport: { width: 1360, height: 900 } });
  const page = await context.newPage();
  await signIn(page, product.baseUrl, 'owner@wyeward.test');
  await page.waitForURL(`${product.baseUrl}/`);
  const look = (selector: string) => page.locator(selector).first().evaluate((el) => ({ background: getComputedStyle(el).backgroundColor, color: getComputedStyle(el).color }));
  await page.goto(`${product.baseUrl}/team`);
  await page.getByLabel('E-mail').waitFor();
  const textBox = await look('input[type=email]');
  // The invitation's role and each member's role: both can be changed by the owner.
  expect(await look('select[aria-label^="Role of"]')).toEqual(textBox);
  expect(await page.getByLabel('Role', { exact: true }).evaluate((el) => ({ background: getComputedStyle(el).backgroundColor, color: getComputedStyle(el).color }))).toEqual(textBox);
  await context.close();
});
