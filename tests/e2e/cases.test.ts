/**
 * Study cases in a real browser: a study file with two cases of the open-neutral demo is imported,
 * opened in the workspace, and the results area compares the base and both cases, the values
 * being the engine's for each case and the worst case marked.
 */
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { applyCase, demoCircuits, solveCircuit, type CircuitInput } from '../../shared/engine/index.ts';
import { screenshot, signInAndImport, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const base = { ...demo, name: 'Lane 14 with cases', elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) } as CircuitInput;
const circuit = {
  ...base,
  cases: [
    { id: 'lost-n', name: 'Neutral lost', changes: [{ element: 'DROP', set: { open: ['n'] } }] },
    { id: 'lost-no-rod', name: 'Neutral lost, rod gone', changes: [{ element: 'DROP', set: { open: ['n'] } }, { remove: 'ROD' }] },
  ],
} as CircuitInput;

describe('study cases in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('the workspace compares the base and two cases of the open-neutral demo', async () => {
    const { page, errors, studyId } = await signInAndImport(browser, product.baseUrl, 'engineer@wyeward.test', circuit);
    await page.goto(`${product.baseUrl}/studies/${studyId}`);

    const table = page.getByRole('table', { name: 'Study cases compared' });
    await table.waitFor({ timeout: 30_000 });
    expect(await table.getByRole('columnheader').allTextContents()).toEqual(['Quantity', 'Base', 'Neutral lost', 'Neutral lost, rod gone']);
    // the neutral shift at the house, per case, as the engine computes it (0.1 V as shown)
    const shifts = ['base', 'lost-n', 'lost-no-rod'].map((id) => solveCircuit(applyCase(circuit, id)).buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag);
    const row = table.getByRole('row', { name: /^HOUSE neutral shift/ });
    const cells = await row.getByRole('cell').allTextContents();
    expect(cells[0]).toBe(`${shifts[0].toFixed(1)} V`);
    expect(cells[1].startsWith(`${shifts[1].toFixed(1)} V`)).toBe(true);
    expect(cells[2].startsWith(`${shifts[2].toFixed(1)} V`)).toBe(true);
    expect(cells[2]).toContain('▲'); // the floating star point without the rod is the worst
    await expect.poll(() => page.getByRole('note', { name: 'Results caution' }).count()).toBeGreaterThan(0);
    await screenshot(page, 'cases-compare');
    expect(errors).toEqual([]);
  });
});
