/**
 * The study report and the per-unit view in a real browser: the report is downloaded from the
 * study page (the link beside the study file export) and read back with pdftotext; the bus table is
 * switched to per unit (V / V_base of the engine's values) and saved as CSV with the caution first.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { demoCircuits, solveCircuit } from '../../shared/engine/index.ts';
import { SAFETY_CAUTION } from '../../shared/review/risk.ts';
import { screenshot, signInAndImport, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const circuit = { ...demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit, name: 'Lane 14 report' };
const house = solveCircuit(circuit).buses.find((b) => b.bus === 'HOUSE')!;
const dir = mkdtempSync(path.join(tmpdir(), 'wyeward-e2e-report-'));

describe('study report and per-unit view in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('downloads the report from the study page and switches the bus table to pu', async () => {
    const { page, errors, studyId } = await signInAndImport(browser, product.baseUrl, 'engineer@wyeward.test', circuit, { acceptDownloads: true });
    await page.goto(`${product.baseUrl}/studies/${studyId}`);

    // The report, from the link on the study page.
    const link = page.getByRole('link', { name: 'Report (PDF)' });
    await link.waitFor({ timeout: 30_000 });
    const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
    const pdf = path.join(dir, 'report.pdf');
    await download.saveAs(pdf);
    expect(download.suggestedFilename()).toMatch(/rev1\.pdf$/);
    const text = execFileSync('pdftotext', ['-raw', '-enc', 'UTF-8', pdf, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    expect(text).toContain('Lane 14 report');
    expect(text).toContain('Revision 1');
    expect(text).toContain(SAFETY_CAUTION);
    expect(text).toContain(house.lineToNeutral.c.mag.toFixed(1));

    // The bus table in per unit: C–N at HOUSE is V / V_base with V_base = 208/√3 V.
    const table = page.getByRole('table', { name: 'Bus voltages' });
    await table.waitFor({ timeout: 30_000 });
    const row = table.getByRole('row', { name: /HOUSE/ });
    await expect.poll(() => row.textContent()).toContain(house.lineToNeutral.c.mag.toFixed(1));
    await page.getByRole('group', { name: 'Bus voltage units' }).getByRole('button', { name: 'pu' }).click();
    const pu = (house.lineToNeutral.c.mag / (208 / Math.sqrt(3))).toFixed(3);
    expect(pu).toBe('1.393');
    await expect.poll(() => row.textContent()).toContain(pu);
    expect(await table.getByRole('columnheader').allTextContents()).toContain('A–N (pu∠°)↕');

    // …and saved as CSV, caution first.
    const [csvDownload] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download Bus voltages as CSV' }).click()]);
    const csvFile = path.join(dir, 'buses.csv');
    await csvDownload.saveAs(csvFile);
    const csv = readFileSync(csvFile, 'utf8').split('\r\n');
    expect(csv[0]).toBe(`# Caution: ${SAFETY_CAUTION}`);
    expect(csv[1]).toContain('(pu)');
    await screenshot(page, 'bus-table-pu');

    // The print view: the same content as a page, printed by the browser to A4 with numbered pages.
    await page.getByRole('link', { name: 'Print view' }).click();
    const report = page.getByRole('article', { name: 'Study report' });
    await report.getByRole('table', { name: 'Flags' }).waitFor({ timeout: 30_000 });
    const shown = (await report.textContent())!.replace(/\s+/g, ' ');
    for (const words of ['Lane 14 report', 'Draft — not reviewed', 'Scope and assumptions', 'One-line diagram', 'Circuit inputs', 'Load terminal voltages', 'Element currents', 'Phasor diagrams of the flagged buses', SAFETY_CAUTION, 'Lane 14 report — Revision 1']) {
      expect(shown).toContain(words);
    }
    expect(shown).toContain(house.lineToNeutral.c.mag.toFixed(1));
    expect(shown).not.toMatch(/~|switch3|[{}]/);
    await page.emulateMedia({ media: 'print' });
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false);
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    await screenshot(page, 'report-print-view');
    const printed = path.join(dir, 'printed.pdf');
    await page.pdf({ path: printed, format: 'A4' });
    const printedText = execFileSync('pdftotext', ['-raw', '-enc', 'UTF-8', printed, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
    const pages = Number(/Page 1 of (\d+)/.exec(printedText)?.[1]);
    expect(pages).toBeGreaterThan(1);
    expect(printedText).toContain(`Page ${pages} of ${pages}`);
    expect(printedText.split('Lane 14 report — Revision 1').length - 1).toBeGreaterThanOrEqual(pages);
    expect(errors).toEqual([]);
  });
});
