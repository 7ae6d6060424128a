/**
 * The lost-neutral hazard as a user meets it (issue 8, point 4): on the open-neutral demo study an
 * engineer closes the service neutral (no alert, every load within), opens it again with one
 * click on the connection's button, and sees the alert on the diagram naming the loads over and
 * under voltage, each load's own terminal voltage beside it and in the load table with its flag.
 * Figures are compared with the engine's solve of the same demo circuit (C); the engine's own
 * figures are checked against Millman's theorem in tests/shared/engine/results/.
 */
import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { demoCircuits, solveCircuit } from '../../shared/engine/index.ts';
import path from 'node:path';
import { ARTIFACTS, screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';
import { clickWire } from './canvas.ts';

describe('lost-neutral hazard in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('opening the service neutral raises the alert naming the over-voltage loads; the load table shows each load’s terminal voltage and flag', async () => {
    const engine = solveCircuit(demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit);
    const volts = (id: string) => engine.loads.find((l) => l.id === id)!.branches[0];
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    const errors: string[] = [];
    page.on('pageerror', (e) => errors.push(String(e)));
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: 'Open neutral on a 208Y/120 V service' }).click();
    await page.waitForURL(/\/studies\//);
    const diagram = page.getByLabel('Diagram', { exact: true });
    // Shown right above the diagram (it hides nothing drawn on it).
    const alert = page.getByRole('alert', { name: 'Neutral lost' });
    const loadTable = page.getByRole('region', { name: 'Results' }).getByRole('table', { name: 'Load voltages' });
    await loadTable.waitFor({ timeout: 20_000 });

    // Close the neutral of the service drop: no alert, every load within its limits.
    await clickWire(page, 'Connection DROP to bus PAD', 0.5);
    await page.getByRole('button', { name: 'Close neutral', exact: true }).click();
    await expect.poll(() => loadTable.getByText('within limits').count(), { timeout: 15_000 }).toBe(3);
    expect(await alert.count()).toBe(0);
    await screenshot(page, 'hazard-neutral-closed');

    // One click opens it again.
    await page.getByRole('button', { name: 'Open neutral', exact: true }).click();
    await alert.waitFor({ timeout: 15_000 });
    const text = (await alert.textContent())!;
    expect(text).toContain('Neutral lost at bus HOUSE: the neutral is open on DROP.');
    // volts above 10 V are shown to one decimal
    const f = (x: number) => x.toFixed(1);
    const e = volts('ELECTRONICS');
    const k = volts('KITCHEN');
    const h = volts('HEATER');
    // (C) the engine's figures for the same circuit, to the digits shown
    expect(text).toContain(`Over voltage: ELECTRONICS ${f(e.voltage.mag)} V = ${e.pu!.toFixed(2)} pu, KITCHEN ${f(k.voltage.mag)} V = ${k.pu!.toFixed(2)} pu.`);
    expect(text).toContain(`Under voltage: HEATER ${f(h.voltage.mag)} V = ${h.pu!.toFixed(2)} pu.`);
    expect(text).toMatch(/dangerous voltages on equipment and people/);
    expect(e.pu!).toBeGreaterThan(1.38);

    // Beside the load on the diagram: "167.3 V = 1.39 pu ✖".
    const note = page.getByLabel('Load ELECTRONICS', { exact: true }).getByTestId('load-voltage-ELECTRONICS');
    expect(await note.textContent()).toMatch(new RegExp(`^${f(e.voltage.mag).replace('.', '\\.')} V = ${e.pu!.toFixed(2).replace('.', '\\.')} pu ✖`));
    // Both the high and the low phases of HOUSE are marked.
    const house = page.getByLabel('Bus HOUSE', { exact: true });
    expect(await house.locator('[data-phase-mark="high"]').count()).toBe(2);
    expect(await house.locator('[data-phase-mark="low"]').count()).toBe(1);

    // The load table: each load's own terminal voltage and flag.
    await expect.poll(() => loadTable.getByRole('row', { name: /ELECTRONICS/ }).textContent(), { timeout: 15_000 }).toMatch(/Violation: over voltage/);
    const row = (await loadTable.getByRole('row', { name: /ELECTRONICS/ }).textContent())!;
    expect(row).toContain(`${f(e.voltage.mag)}∠`);
    expect(row).toContain(e.pu!.toFixed(2));
    expect(await loadTable.getByRole('row', { name: /HEATER/ }).textContent()).toMatch(/Violation: under voltage/);
    expect(await loadTable.getByRole('row', { name: /KITCHEN/ }).textContent()).toMatch(/Violation: over voltage/);

    // Unbalance: the bus is out of limits by the phase-voltage definition though line voltages are balanced.
    const unbalance = page.getByRole('list', { name: 'Unbalance against the limits' });
    expect(await unbalance.getByRole('listitem').filter({ hasText: /^HOUSE/ }).textContent()).toMatch(/out of limits.*phase-voltage \(IEEE\) \d+\.\d\d % over 3 %/);

    // Nothing internal on the page: no generated names, no format type names.
    const shown = (await page.locator('main').innerText()) + (await diagram.innerText());
    expect(shown).not.toMatch(/~/);
    expect(shown).not.toMatch(/\b(switch3|splitPhaseTransformer|capacitorBank|zipLoad|admittanceMatrix|coupledBranch|voltageSource|currentSource)\b/);
    await screenshot(page, 'hazard-neutral-open');
    await alert.screenshot({ path: path.join(ARTIFACTS, 'hazard-alert.png') });
    await diagram.screenshot({ path: path.join(ARTIFACTS, 'hazard-diagram.png') });
    await page.getByRole('region', { name: 'Results' }).screenshot({ path: path.join(ARTIFACTS, 'hazard-results.png') });
    expect(errors).toEqual([]);
    await page.close();
  });

  it('a bank shows both sides in the currents table, and its HV tap raises the LV voltage as the engine says', async () => {
    const demo = demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit;
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: /delta.wye/i }).first().click();
    await page.waitForURL(/\/studies\//);
    const results = page.getByRole('region', { name: 'Results' });
    const currents = results.getByRole('table', { name: 'Element currents' });
    await currents.waitFor({ timeout: 20_000 });
    const sides = currents.getByRole('row', { name: /PM-BANK/ });
    await expect.poll(() => sides.count(), { timeout: 15_000 }).toBe(2);
    expect(await sides.nth(0).textContent()).toContain('HV side (PMT)');
    expect(await sides.nth(1).textContent()).toContain('LV side (PM208)');
    const seq = results.getByRole('table', { name: 'Sequence currents' }).getByRole('row', { name: /PM-BANK/ });
    expect(await seq.count()).toBe(2);

    // Tap −2 steps of 2.5 % on the HV winding: the ratio falls 5 %, the LV voltage rises.
    await page.getByLabel('Transformer bank PM-BANK', { exact: true }).locator('svg').first().click();
    const tap = page.getByRole('region', { name: 'Properties' }).getByRole('textbox', { name: /Tap position, HV winding/ });
    await tap.fill('-2');
    await tap.press('Enter');
    const tapped = solveCircuit({ ...demo, elements: demo.elements.map((e) => (e.id === 'PM-BANK' ? { ...e, tap: { steps: -2 } } : e)) } as typeof demo);
    const offices = tapped.loads.find((l) => l.id === 'OFFICES')!.branches[0];
    const before = solveCircuit(demo).loads.find((l) => l.id === 'OFFICES')!.branches[0];
    expect(offices.voltage.mag / before.voltage.mag).toBeGreaterThan(1.04); // (C) about 1/0.95 under load
    const row = results.getByRole('table', { name: 'Load voltages' }).getByRole('row', { name: /OFFICES/ }).first();
    await expect.poll(() => row.textContent(), { timeout: 15_000 }).toContain(`${offices.voltage.mag.toFixed(1)}∠`);
    expect(await results.getByRole('region', { name: 'Transformers' }).textContent()).toMatch(/tap −5 % on the HV winding/);
    await screenshot(page, 'hazard-bank-tap');
    await page.close();
  });

  it('the fault study: no lost-neutral alert, and its neutral shift is worded as the fault’s effect', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: /line-to-earth fault/i }).first().click();
    await page.waitForURL(/\/studies\//);
    const flags = page.getByRole('list', { name: 'Flags' });
    await flags.waitFor({ timeout: 20_000 });
    await page.getByRole('button', { name: /^Show all \d+ flags$/ }).click();
    const text = (await flags.textContent())!;
    // The panel's own line for the bus with the largest shift says the same.
    expect(await page.getByTestId('selected-neutral-cause').textContent()).toContain("the fault in this study shifts it (the fault's effect, not a lost neutral)");
    expect(text).toMatch(/neutral-to-earth voltage .* this is the fault's effect, not a lost neutral/);
    expect(text).not.toMatch(/check for a lost/);
    expect(await page.getByRole('alert', { name: 'Neutral lost' }).count()).toBe(0);
    await page.close();
  });
});
