/**
 * The built app under its real Content-Security-Policy in chromium: the served index.html has no
 * inline script, and signing in, the studies list, a demo study's workspace (canvas, live solve in
 * its Web Worker, results) and the sign-up page raise no CSP violation.
 */
import type { Browser } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

describe('Content-Security-Policy in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('serves index.html without inline script, under a strict CSP', async () => {
    const res = await fetch(`${product.baseUrl}/`);
    const html = await res.text();
    expect(res.headers.get('content-security-policy')).toMatch(/script-src 'self'(;|$)/);
    // Every <script> has a src: nothing inline for the CSP to block.
    const scripts = [...html.matchAll(/<script\b([^>]*)>([\s\S]*?)<\/script>/g)];
    expect(scripts.length).toBeGreaterThan(0);
    for (const [, attrs, body] of scripts) {
      expect(attrs).toMatch(/\ssrc=/);
      expect(body.trim()).toBe('');
    }
  });

  it('the app runs with no CSP violation: sign-in, studies, a workspace with its solve worker, the report print view, sign-up', async () => {
    const page = await browser.newPage({ viewport: { width: 1360, height: 860 } });
    const violations: string[] = [];
    page.on('console', (m) => {
      if (/Content Security Policy|Refused to/i.test(m.text())) violations.push(m.text());
    });
    await page.addInitScript(() => {
      document.addEventListener('securitypolicyviolation', (e) => console.error(`Refused to load (CSP): ${e.violatedDirective} ${e.blockedURI} at ${e.sourceFile}:${e.lineNumber}:${e.columnNumber}`));
    });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    const table = page.getByRole('table');
    await table.waitFor();
    await expect.poll(() => table.getByRole('row').count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(5);
    // Open the first demo study: the canvas and the results of the live solve appear.
    await table.getByRole('row').nth(1).getByRole('link').first().click();
    await page.waitForURL(/\/studies\/[0-9a-f-]{36}/);
    await page.getByRole('region', { name: 'Results' }).waitFor({ timeout: 30_000 });
    await page.getByText(/engineering aid/i).first().waitFor();
    // The print view of the report draws its diagrams as inline SVG.
    await page.getByRole('link', { name: 'Print view' }).click();
    await page.getByRole('img', { name: 'One-line diagram' }).waitFor({ timeout: 30_000 });
    await page.goBack();
    await page.getByRole('region', { name: 'Results' }).waitFor({ timeout: 30_000 });
    // the phase-balancing page (its own lazy chunk, papaparse included)
    await page.getByRole('link', { name: 'Phase balancing' }).click();
    await page.getByRole('heading', { name: 'Phase balancing' }).waitFor();
    await page.goto(`${product.baseUrl}/sign-up`);
    await page.waitForLoadState('networkidle');
    expect(violations).toEqual([]);
    await page.close();
  });
});
