/**
 * What the engineer sees is what is solved (issue 8), in a real browser, as a user types, clicks and
 * pastes: a line's length unit never rescales its impedance; non-physical values get a message at
 * the field on the first try; a single-phase load's label shows the phases it is wired to; pastes
 * and new elements land apart and in view; an unsolvable edit marks the diagram's values as stale;
 * the phasor bus choice survives an undo and a neutral toggle; a neutral opens with one click.
 */
import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { demoCircuits, solveCircuit } from '../../shared/engine/index.ts';
import { screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';
import { properties as props, selectNode, wire } from './canvas.ts';

async function newStudy(page: Page, product: RunningProduct, name: string) {
  await signIn(page, product.baseUrl, 'engineer@wyeward.test');
  await page.waitForURL(`${product.baseUrl}/`);
  await page.getByRole('button', { name: /new study/i }).click();
  await page.getByRole('dialog').getByLabel('Name', { exact: true }).fill(name);
  await page.getByRole('button', { name: 'Create study' }).click();
  await page.waitForURL(/\/studies\/[0-9a-f-]{36}$/);
}

/** Phase A line-to-neutral voltage written on a bus, V. */
async function busVolts(page: Page, bus: string): Promise<number> {
  const text = (await page.getByLabel(`Bus ${bus}`, { exact: true }).textContent()) ?? '';
  const m = /A (\d+(?:\.\d+)?) V/.exec(text);
  if (!m) throw new Error(`no phase-A voltage on bus ${bus}: ${text}`);
  return Number(m[1]);
}

/** Waits until the toolbar says the latest edit is solved. */
async function solved(page: Page) {
  await expect.poll(() => page.getByRole('toolbar', { name: 'Workspace tools' }).textContent(), { timeout: 15_000 }).toContain('Solved in');
}

function overlap(a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }) {
  return a.x < b.x + b.width && a.x + a.width > b.x && a.y < b.y + b.height && a.y + a.height > b.y;
}

describe('the workspace shows exactly what is solved', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('a line’s length unit changes its length, never its impedance: the far bus stays at the engine’s 7.2 kV', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: /delta.wye/i }).first().click();
    await page.waitForURL(/\/studies\//);
    await page.getByLabel('Line / cable PM-TAP', { exact: true }).waitFor();
    await expect.poll(() => busVolts(page, 'PMT'), { timeout: 15_000 }).toBeGreaterThan(1000);
    // (C) the demo through the engine: the far bus of 0.8 km of 0.19+j0.38 Ω/km.
    const engine = solveCircuit(demoCircuits.find((d) => d.key === 'delta-wye-bank')!.circuit).buses.find((b) => b.bus === 'PMT')!.lineToNeutral.a.mag;
    const tol = Math.max(1e-4 * engine, 0.05); // 0.01 %, and the 0.1 V the diagram shows
    expect(Math.abs((await busVolts(page, 'PMT')) - engine)).toBeLessThanOrEqual(tol);

    await selectNode(page, 'Line / cable PM-TAP');
    const length = props(page).getByRole('textbox', { name: 'Length' });
    await length.fill('800 m');
    await length.press('Enter');
    await expect.poll(() => length.inputValue()).toBe('800 m');
    await expect.poll(() => page.getByText('Unsaved changes').count()).toBe(1);
    expect(await props(page).getByRole('textbox', { name: /^Z1 per km/ }).inputValue()).toBe('0.19+j0.38 Ω');
    await expect.poll(async () => Math.abs((await busVolts(page, 'PMT')) - engine), { timeout: 15_000 }).toBeLessThanOrEqual(tol);
    await solved(page);
    expect(Math.abs((await busVolts(page, 'PMT')) - engine)).toBeLessThanOrEqual(tol);

    for (const [unit, shown] of [['ft', '2624.67 ft'], ['km', '0.8 km'], ['m', '800 m']] as const) {
      await props(page).getByLabel('Length unit').selectOption(unit);
      await expect.poll(() => length.inputValue()).toBe(shown);
      await solved(page);
      expect(Math.abs((await busVolts(page, 'PMT')) - engine)).toBeLessThanOrEqual(tol);
    }
    // The per-length unit converts the data instead: per 1000 ft, 0.19 Ω/km is 0.057912 Ω.
    await props(page).getByLabel('Impedance data given').selectOption('kft');
    await expect.poll(() => props(page).getByRole('textbox', { name: /^Z1 per 1000 ft/ }).inputValue()).toBe('0.057912+j0.115824 Ω');
    await solved(page);
    expect(Math.abs((await busVolts(page, 'PMT')) - engine)).toBeLessThanOrEqual(tol);
    // A value typed per km into data given per 1000 ft converts: the same line, the same far bus.
    const z1 = props(page).getByRole('textbox', { name: /^Z1 per 1000 ft/ });
    await z1.fill('0.19+j0.38 ohm/km');
    await z1.press('Enter');
    await expect.poll(() => z1.inputValue()).toBe('0.057912+j0.115824 Ω');
    await solved(page);
    expect(Math.abs((await busVolts(page, 'PMT')) - engine)).toBeLessThanOrEqual(tol);
    // An expression in a length field.
    await length.fill('2*400 m');
    await length.press('Enter');
    await expect.poll(() => length.inputValue()).toBe('800 m');
    await screenshot(page, 'trust-line-units');
    await page.close();
  });

  it('non-physical values get a message beside the field on the first try and on every try', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: /delta.wye/i }).first().click();
    await page.waitForURL(/\/studies\//);
    await selectNode(page, 'Transformer bank PM-BANK');
    const z = props(page).getByRole('textbox', { name: /^Impedance/ });
    await z.fill('−5');
    await z.press('Tab');
    await expect.poll(() => props(page).getByText('This must be above zero.').count()).toBe(1);
    expect(await z.getAttribute('aria-invalid')).toBe('true');
    await z.fill('-7');
    await z.press('Tab');
    await expect.poll(() => props(page).getByText('This must be above zero.').count()).toBe(1);
    expect(await page.getByText('Unsaved changes').count()).toBe(0);

    // A negative kW is refused until the load is marked as generation; then it is shown as such.
    await selectNode(page, 'Load OFFICES');
    const pa = props(page).getByRole('textbox', { name: /^P A/ });
    await pa.fill('-3 kW');
    await pa.press('Enter');
    await expect.poll(() => props(page).getByText('A load cannot take negative kW unless it is marked as generation').count()).toBe(1);
    await screenshot(page, 'trust-negative-kw-refused');
    await props(page).getByLabel('Role').selectOption('generation');
    await pa.fill('-3 kW');
    await pa.press('Enter');
    await expect.poll(() => page.getByLabel('Load OFFICES', { exact: true }).textContent()).toContain('generation wye');
    await page.close();
  });

  it('a new single-phase load wired to B–N reads B–N at once and after saving; a pasted one rewired to C–N reads C–N', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await newStudy(page, product, 'Labels from the wiring');
    await page.getByRole('button', { name: 'Add bus' }).click();
    await page.getByRole('button', { name: 'Add source' }).click();
    await page.getByRole('button', { name: 'Add single-phase load' }).click();
    const summary = page.getByTestId('summary-LOAD1');
    // Not wired yet: it claims no phases.
    expect(await summary.textContent()).toBe('single-phase 1 kW');
    await wire(page, 'SRC1: port', 'B1: all conductors (top)');
    await wire(page, 'LOAD1: terminal 1', 'B1: conductor B');
    await wire(page, 'LOAD1: terminal 2', 'B1: conductor N');
    await expect.poll(() => summary.textContent()).toBe('B–N 1 kW');
    await page.getByRole('button', { name: 'Save study' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Save' }).click();
    await expect.poll(() => page.getByText('Unsaved changes').count()).toBe(0);
    expect(await summary.textContent()).toBe('B–N 1 kW');

    await selectNode(page, 'Load LOAD1');
    await page.keyboard.press('Control+c');
    await page.keyboard.press('Control+v');
    const pasted = page.getByTestId('summary-LOAD2');
    await pasted.waitFor();
    expect(await pasted.textContent()).toBe('single-phase 1 kW');
    await wire(page, 'LOAD2: terminal 1', 'B1: conductor C');
    await wire(page, 'LOAD2: terminal 2', 'B1: conductor N');
    await expect.poll(() => pasted.textContent()).toBe('C–N 1 kW');
    expect(await summary.textContent()).toBe('B–N 1 kW');
    // The results tables read the same: LOAD2's currents on phase C and the neutral.
    await screenshot(page, 'trust-labels-derived');
    await page.close();
  });

  it('repeated pastes land apart, new elements land in view and off the minimap, and Fit view keeps every label', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await newStudy(page, product, 'Placement');
    const pane = (await page.locator('.react-flow').boundingBox())!;
    const minimap = (await page.locator('.react-flow__minimap').boundingBox())!;
    await page.getByRole('button', { name: 'Add bus' }).click();
    for (let i = 0; i < 7; i++) await page.getByRole('button', { name: 'Add load', exact: true }).click();
    const nodes = page.locator('.react-flow__node');
    expect(await nodes.count()).toBe(8);
    for (const n of await nodes.all()) {
      const b = (await n.boundingBox())!;
      expect(b.x).toBeGreaterThanOrEqual(pane.x);
      expect(b.y).toBeGreaterThanOrEqual(pane.y);
      expect(b.x + b.width).toBeLessThanOrEqual(pane.x + pane.width);
      expect(b.y + b.height).toBeLessThanOrEqual(pane.y + pane.height);
      expect(overlap(b, minimap)).toBe(false);
    }
    await page.getByRole('button', { name: 'Add capacitor bank' }).click();
    await selectNode(page, 'Capacitor bank CAP1');
    await page.keyboard.press('Control+c');
    for (let i = 0; i < 3; i++) await page.keyboard.press('Control+v');
    await page.getByLabel('Capacitor bank CAP4', { exact: true }).waitFor();
    const caps = await Promise.all([1, 2, 3, 4].map(async (k) => (await page.getByLabel(`Capacitor bank CAP${k}`, { exact: true }).locator('svg').first().boundingBox())!));
    for (let i = 0; i < caps.length; i++) for (let j = i + 1; j < caps.length; j++) expect(overlap(caps[i], caps[j]), `CAP${i + 1} and CAP${j + 1} overlap`).toBe(false);

    await page.getByRole('button', { name: 'Fit view' }).click();
    // The fit animates: wait until the viewport stops moving.
    const transform = () => page.locator('.react-flow__viewport').evaluate((v) => (v as HTMLElement).style.transform);
    let last = '';
    await expect
      .poll(async () => {
        await page.waitForTimeout(150);
        const now = await transform();
        const still = now === last;
        last = now;
        return still;
      }, { timeout: 15_000 })
      .toBe(true);
    for (const k of [1, 2, 3, 4, 5, 6, 7]) {
      const text = (await page.getByText(`LOAD${k}`, { exact: true }).boundingBox())!;
      expect(text.x).toBeGreaterThanOrEqual(pane.x);
      expect(text.x + text.width).toBeLessThanOrEqual(pane.x + pane.width);
      expect(text.y).toBeGreaterThanOrEqual(pane.y);
      expect(text.y + text.height).toBeLessThanOrEqual(pane.y + pane.height);
    }
    // Nothing drawn for a node (symbol, name, notes) sits under the minimap after the fit.
    for (const n of await page.locator('.react-flow__node, .react-flow__node *').all()) {
      const b = await n.boundingBox();
      if (!b || b.width === 0) continue;
      expect(overlap(b, minimap)).toBe(false);
    }
    for (const n of await page.locator('.react-flow__node [class*="text-ink-muted"]').all()) {
      const b = await n.boundingBox();
      if (!b) continue;
      expect(b.x + b.width).toBeLessThanOrEqual(pane.x + pane.width + 0.5);
    }
    await screenshot(page, 'trust-placement-fit');
    await page.close();
  });

  it('one click on the wire opens the neutral; an unsolvable edit marks the diagram stale; the phasor bus survives undo and the toggle', async () => {
    const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: 'Open neutral on a 208Y/120 V service' }).click();
    await page.waitForURL(/\/studies\//);
    const shift = page.getByLabel('Bus HOUSE', { exact: true }).getByTitle('Neutral-to-earth voltage (neutral shift)');
    await expect.poll(() => shift.textContent(), { timeout: 15_000 }).toMatch(/^N–E \d+\.\d+ V$/);
    const openShift = Number(/([\d.]+) V/.exec((await shift.textContent())!)![1]);
    expect(openShift).toBeGreaterThan(10);

    // The panel's phasor bus: choose the one not shown by default.
    const busSelect = page.getByRole('region', { name: 'Results' }).getByLabel('Bus for phasor diagram');
    await busSelect.waitFor();
    const other = (await busSelect.inputValue()) === 'PAD' ? 'HOUSE' : 'PAD';
    await busSelect.selectOption(other);

    // One click on the service drop's wire closes its neutral (the demo has it open), one more opens it.
    await page.getByRole('button', { name: 'Close neutral of connection DROP to bus PAD' }).click();
    await expect.poll(() => shift.textContent(), { timeout: 15_000 }).toMatch(/^N–E 0\.\d+ V$/);
    expect(await busSelect.inputValue()).toBe(other);
    await page.getByRole('button', { name: 'Open neutral of connection DROP to bus PAD' }).click();
    await expect.poll(async () => Number(/([\d.]+) V/.exec((await shift.textContent())!)![1]), { timeout: 15_000 }).toBeGreaterThan(10);
    expect(await busSelect.inputValue()).toBe(other);
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(() => shift.textContent(), { timeout: 15_000 }).toMatch(/^N–E 0\.\d+ V$/);
    expect(await busSelect.inputValue()).toBe(other);

    // A line conductor of zero impedance cannot be solved: the old values are marked stale.
    expect(await page.getByText(/^Stale values/).count()).toBe(0);
    await selectNode(page, 'Line / cable DROP');
    const za = props(page).getByRole('textbox', { name: /^Z A per m/ });
    await za.fill('0');
    await za.press('Enter');
    await expect.poll(() => page.getByText(/^Stale values/).count(), { timeout: 15_000 }).toBe(1);
    expect(await page.getByLabel('Bus HOUSE', { exact: true }).locator('[data-stale]').count()).toBe(1);
    // The note covers nothing drawn: it sits outside the diagram's area, not over its corner.
    const note = (await page.getByText(/^Stale values/).boundingBox())!;
    const diagram = (await page.getByLabel('Diagram', { exact: true }).boundingBox())!;
    expect(overlap(note, diagram), `the note ${JSON.stringify(note)} lies over the diagram ${JSON.stringify(diagram)}`).toBe(false);
    await screenshot(page, 'trust-stale');
    await page.getByRole('button', { name: 'Undo' }).click();
    await expect.poll(() => page.getByText(/^Stale values/).count(), { timeout: 15_000 }).toBe(0);
    await page.close();
  });
});
