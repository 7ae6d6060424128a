/**
 * A study name people type may be one long word (underscores, no spaces, up to the 200 characters
 * allowed). The pages that show it break it rather than widen the page past the window: the list
 * keeps each row's buttons in view, the audit trail its last column, and the study, history,
 * balancing and print pages have no sideways scrolling. Only a browser lays the pages out, so
 * only a browser test shows it.
 */
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { demoCircuits } from '../../shared/engine/index.ts';
import { screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const NAME = `Wrenfold_Close_LV_feeder_${'pillar_survey_'.repeat(13)}`.slice(0, 200);

describe('a long study name in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('breaks the name on every page instead of widening the page', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    const circuit = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
    const created = await page.evaluate(
      async ([name, c]) => {
        const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name, content: { circuit: c } }) });
        return { status: res.status, body: await res.json() };
      },
      [NAME, circuit] as const,
    );
    expect(created.status).toBe(201);
    const id = created.body.id as string;
    const sideways = () => page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);

    await page.goto(`${product.baseUrl}/`);
    const del = page.getByRole('button', { name: `Delete ${NAME}` });
    await del.waitFor();
    const box = (await del.boundingBox())!;
    expect(box.x + box.width).toBeLessThanOrEqual(1280);
    expect(await sideways()).toBeLessThanOrEqual(0);
    await screenshot(page, 'long-name-list');

    const pages: [string, () => Promise<unknown>][] = [
      [`/studies/${id}/details`, () => page.getByRole('heading', { name: NAME }).waitFor()],
      [`/studies/${id}/history`, () => page.getByRole('table').first().waitFor()],
      [`/studies/${id}/balance`, () => page.getByRole('heading', { name: 'Phase balancing' }).waitFor()],
      [`/studies/${id}/print/1`, () => page.getByRole('table', { name: 'Flags' }).waitFor({ timeout: 30_000 })],
    ];
    for (const [path, ready] of pages) {
      await page.goto(`${product.baseUrl}${path}`);
      await ready();
      expect(await sideways(), path).toBeLessThanOrEqual(0);
    }
    await screenshot(page, 'long-name-print');
    expect(errors).toEqual([]);

    // …while on a phone-sized window the other names still break between words, never inside one
    await page.setViewportSize({ width: 390, height: 800 });
    await page.goto(`${product.baseUrl}/`);
    const demo = page.getByRole('link', { name: 'Wrenfold Close: houses to balance across phases' });
    await demo.waitFor();
    const brokenWords = await demo.evaluate((a) => {
      const text = a.firstChild as Text;
      const out: string[] = [];
      for (const m of text.data.matchAll(/\S+/g)) {
        const r = document.createRange();
        r.setStart(text, m.index!);
        r.setEnd(text, m.index! + m[0].length);
        if (r.getClientRects().length > 1) out.push(m[0]);
      }
      return out;
    });
    expect(brokenWords).toEqual([]);
    await screenshot(page, 'long-name-list-narrow');

    // the audit trail (owners only) names the study in a column of its table
    const owner = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(owner, product.baseUrl, 'owner@wyeward.test');
    await owner.waitForURL(`${product.baseUrl}/`);
    await owner.goto(`${product.baseUrl}/audit`);
    const row = owner.getByRole('row', { name: /study created/ }).filter({ hasText: NAME.slice(0, 40) }).first();
    await row.waitFor();
    const details = (await row.getByRole('cell').last().boundingBox())!;
    expect(details.x + details.width).toBeLessThanOrEqual(1280);
    await screenshot(owner, 'long-name-audit');
    await owner.close();
  });
});
