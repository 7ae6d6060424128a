import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

describe('walking skeleton in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('the demo engineer signs in and sees the demo studies', async () => {
    const page = await browser.newPage({ viewport: { width: 1360, height: 860 } });
    const consoleErrors: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') consoleErrors.push(m.text());
    });
    await page.goto(`${product.baseUrl}/sign-in`);
    // Demo mode lists the demo accounts on the sign-in page.
    await page.getByText('engineer@wyeward.test').first().waitFor({ state: 'visible' });
    await screenshot(page, 'skeleton-sign-in');

    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    const table = page.getByRole('table');
    await table.waitFor();
    const rows = table.getByRole('row');
    // header row + at least four demo studies
    await expect.poll(() => rows.count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(5);
    const body = await page.textContent('body');
    expect(body).toMatch(/neutral/i);
    expect(body).toMatch(/engineering aid/i);
    // The engineer may create studies.
    expect(await page.getByRole('button', { name: /new study/i }).count()).toBeGreaterThan(0);
    await screenshot(page, 'skeleton-studies');
    expect(consoleErrors).toEqual([]);
    await page.close();
  });

  it('a viewer sees the same studies but no control to create one', async () => {
    const page = await browser.newPage({ viewport: { width: 1360, height: 860 } });
    await signIn(page, product.baseUrl, 'viewer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('table').waitFor();
    await expect.poll(() => page.getByRole('table').getByRole('row').count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(5);
    expect(await page.getByRole('button', { name: /new study/i }).count()).toBe(0);
    await page.close();
  });
});
