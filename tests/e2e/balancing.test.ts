/**
 * Phase balancing in a real browser: a study of the Wrenfold Close demo feeder, the demo customer
 * CSV uploaded on the balancing page, run on the server, the move list read with its caution, and
 * the moves applied as a new revision (the saved circuit holds every customer, the moved ones on
 * their new phase).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { balancingFeeder } from '../../shared/engine/index.ts';
import { screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const csvPath = path.resolve(import.meta.dirname, '../../docs/examples/wrenfold-close-customers.csv');

describe('phase balancing in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('uploads the demo CSV, runs, reads the move list and applies it as a revision', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    const created = await page.evaluate(async (circuit) => {
      const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Wrenfold Close balancing', content: { circuit } }) });
      return { status: res.status, body: await res.json() };
    }, balancingFeeder);
    expect(created.status).toBe(201);
    const id = created.body.id as string;

    await page.goto(`${product.baseUrl}/studies/${id}`);
    await page.getByRole('link', { name: 'Phase balancing' }).click();
    await page.getByRole('heading', { name: 'Phase balancing' }).waitFor();
    await page.getByLabel(/A customer list \(CSV/).check();
    await page.getByLabel('Customer list (CSV)').setInputFiles({ name: 'wrenfold-close-customers.csv', mimeType: 'text/csv', buffer: readFileSync(csvPath) });
    await page.getByText('wrenfold-close-customers.csv: 36 customers read.').waitFor();
    await page.getByLabel('Most customers to move').fill('6');
    await page.getByRole('button', { name: 'Run balancing' }).click();

    const moves = page.getByRole('table', { name: 'Moves for the crew' });
    await moves.waitFor({ timeout: 180_000 });
    const rows = await moves.getByRole('row').all();
    const list = await Promise.all(rows.slice(1).map(async (r) => (await r.getByRole('cell').allTextContents()).map((t) => t.trim())));
    expect(list.length).toBeGreaterThan(0);
    expect(list.length).toBeLessThanOrEqual(6);
    const csv = readFileSync(csvPath, 'utf8');
    for (const [customer, bus, from, to] of list) {
      expect(csv).toContain(`${customer},${bus},${from},`); // the customer is where the list says
      expect(to).not.toBe(from);
    }
    expect(await page.getByRole('region', { name: 'Balancing result' }).textContent()).toMatch(/Phase moves are work on live equipment/);
    const table = page.getByRole('table', { name: 'Before and after' });
    const neutral = (await table.getByRole('row', { name: /^Neutral current/ }).getByRole('cell').allTextContents()).map((t) => t.trim());
    expect(Number(neutral[2])).toBeLessThan(Number(neutral[1])); // after < before
    // phasor diagrams of the currents at the board, before and after, with the neutral written out
    const after = page.getByRole('img', { name: /^Currents leaving bus WC0, after: A .* N \d+\.\d A/ });
    await after.waitFor();
    const neutralAfter = Number(/N (\d+\.\d) A/.exec((await after.getAttribute('aria-label'))!)![1]);
    expect(neutralAfter).toBeCloseTo(Number(neutral[2]), 0);
    await screenshot(page, 'balancing-result');

    await page.getByRole('button', { name: 'Apply as a new revision' }).click();
    await page.getByText(/Saved as revision 2/).waitFor({ timeout: 30_000 });
    const saved = await page.evaluate(async (studyId) => (await fetch(`/api/studies/${studyId}`)).json(), id);
    const loads = (saved.content.circuit.elements as { id: string; type: string; between?: string[] }[]).filter((e) => e.type === 'load');
    expect(loads).toHaveLength(36);
    for (const [customer, , , to] of list) expect(loads.find((l) => l.id === customer)!.between).toEqual([to.toLowerCase(), 'n']);
    expect(errors).toEqual([]);
  });
});
