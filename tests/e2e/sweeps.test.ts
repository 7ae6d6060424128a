/**
 * Case editor, sweeps and the lost-neutral envelope in a real browser, on the open-neutral demo with
 * its drop's neutral closed: a case opening the neutral is created in the workspace and saved with
 * the study; a small sweep of a load's kW runs on it in the Web Worker pool and its CSV is checked
 * point by point against the engine's solve of the same circuit (the saved study, the case applied,
 * the value written; computed here, never copied); a point becomes a case; a large sweep is
 * cancelled; the envelope's worst load voltages are the engine's; a two-parameter sweep too large
 * for the browser runs on the server and its first points are the engine's too.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { applyCase, demoCircuits, lostNeutralEnvelope, solveCircuit, sweepCircuit, type CircuitInput } from '../../shared/engine/index.ts';
import { screenshot, signInAndImport, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';

const demo = demoCircuits.find((d) => d.key === 'open-neutral-208y120')!.circuit;
const base = { ...demo, name: 'Lane 14 sweeps', elements: demo.elements.map((e) => (e.id === 'DROP' ? { ...e, open: [] } : e)) } as CircuitInput;

describe('cases, sweeps and the envelope in a real browser', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('creates a case, sweeps on it (CSV equal to the engine), makes a point a case, cancels a sweep, runs the envelope, hands a large sweep to the server', async () => {
    const { page, errors, studyId } = await signInAndImport(browser, product.baseUrl, 'engineer@wyeward.test', base, { acceptDownloads: true });
    await page.goto(`${product.baseUrl}/studies/${studyId}`);

    // ---- a case from the editor: the drop's neutral opened ----
    const editor = page.getByRole('region', { name: 'Study cases' });
    await editor.waitFor({ timeout: 30_000 });
    await editor.getByRole('button', { name: 'New case' }).click();
    await editor.getByLabel('Case name').fill('Neutral lost');
    await editor.getByRole('button', { name: 'Create case' }).click();
    expect(await editor.getByLabel('Case shown').inputValue()).not.toBe('base');
    await editor.getByLabel('Element to change').selectOption('DROP');
    await editor.getByLabel('Value to change').selectOption({ label: 'open conductors' });
    await editor.getByRole('checkbox', { name: 'neutral' }).check();
    await editor.getByRole('button', { name: 'Set in case' }).click();
    await expect.poll(() => editor.getByRole('list', { name: 'Changes of this case' }).textContent()).toContain('DROP: open conductors none → neutral');
    const overlay = page.getByRole('complementary', { name: 'Case shown on the canvas' });
    expect(await overlay.textContent()).toContain('Neutral lost');
    expect(await overlay.textContent()).toContain('DROP: open conductors none → neutral');

    // saved with the study
    await page.getByRole('button', { name: 'Save study' }).click();
    await page.getByRole('dialog').getByRole('button', { name: 'Save' }).click();
    await expect.poll(() => page.getByText('Unsaved changes').count()).toBe(0);
    const saved = (await (await page.request.get(`${product.baseUrl}/api/studies/${studyId}`)).json()) as { content: { circuit: CircuitInput & { cases: { id: string; name: string }[] } } };
    const savedCases = saved.content.circuit.cases;
    expect(savedCases.map((c) => c.name)).toEqual(['Neutral lost']);
    const onCase = applyCase(saved.content.circuit, savedCases[0].id);

    // the case shown is what is solved: the neutral shift drawn at HOUSE is the case's, then the base's again
    const badge = page.getByLabel('Bus HOUSE').getByTitle('Neutral-to-earth voltage (neutral shift)');
    const shiftOf = (c: CircuitInput) => solveCircuit(c).buses.find((b) => b.bus === 'HOUSE')!.neutralToEarth!.mag;
    const shownShift = async () => Number(/^N–E ([\d.]+) V$/.exec((await badge.textContent()) ?? '')?.[1]);
    // (C) the engine on the saved case and on the base; the badge rounds to the digits it shows
    await expect.poll(async () => Math.abs((await shownShift()) - shiftOf(onCase)), { timeout: 15_000 }).toBeLessThan(0.05);
    expect(shiftOf(onCase)).toBeGreaterThan(shiftOf(saved.content.circuit) + 10);
    await editor.getByLabel('Case shown').selectOption('base');
    await expect.poll(async () => Math.abs((await shownShift()) - shiftOf(saved.content.circuit)), { timeout: 15_000 }).toBeLessThan(0.05);
    expect(await overlay.count()).toBe(0);
    await editor.getByLabel('Case shown').selectOption({ label: 'Neutral lost' });

    // ---- a 1-D sweep of KITCHEN's kW on the case shown ----
    const sweep = page.getByRole('region', { name: /^Sweep on the case shown/ });
    await sweep.getByLabel('Parameter 1 element').selectOption('KITCHEN');
    await sweep.getByLabel('Parameter 1 value').selectOption('each.kw');
    await sweep.getByLabel('Parameter 1 from').fill('0.5');
    await sweep.getByLabel('Parameter 1 to').fill('6');
    await sweep.getByLabel('Parameter 1 points').fill('12');
    await sweep.getByRole('button', { name: 'Run sweep (12 points)' }).click();
    await expect.poll(() => sweep.getByRole('status').first().textContent(), { timeout: 30_000 }).toMatch(/^Done: 12 points/);
    expect(await sweep.getByRole('img', { name: /^KITCHEN terminal voltage \(pu\) against KITCHEN every phase › P \(kW\)/ }).count()).toBe(1);
    expect(await sweep.getByRole('progressbar', { name: 'Sweep progress' }).getAttribute('aria-valuenow')).toBe('12');

    const [download] = await Promise.all([page.waitForEvent('download'), sweep.getByRole('link', { name: 'Export CSV' }).click()]);
    const text1 = readFileSync((await download.path())!, 'utf8');
    // CRLF line ends, as the product's other CSV exports; no bare CR or LF
    expect(text1.endsWith('\r\n')).toBe(true);
    expect(text1.replace(/\r\n/g, '')).not.toMatch(/[\r\n]/);
    const csv = text1.slice(0, -2).split('\r\n');
    expect(csv[0]).toMatch(/^# Caution: .*lost neutral/i);
    const header = csv[1].split(',');
    expect(header[0]).toBe('KITCHEN every phase › P (kW)');
    const col = header.indexOf('HEATER terminal voltage (pu)');
    expect(col).toBeGreaterThan(0);
    expect(csv).toHaveLength(2 + 12);
    for (const line of csv.slice(2)) {
      const cells = line.split(',');
      const kw = Number(cells[0]);
      // (C) the engine's solve of the saved study with the case applied and the kW written
      const load = solveCircuit(sweepCircuit(onCase, ['KITCHEN.each.kw'], [kw])).loads.find((l) => l.id === 'HEATER')!;
      expect(Number(cells[col])).toBeCloseTo(load.branches[0].pu!, 6);
      expect(cells[cells.length - 1]).toBe('ok');
    }
    await screenshot(page, 'sweep-1d');
    // the line chart is drawn on its canvas: pixels of the line's colour (#1f5f8b) along it
    const linePixels = await sweep.getByRole('img', { name: /^KITCHEN terminal voltage \(pu\) against/ }).evaluate((el) => {
      const c = el as HTMLCanvasElement;
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < d.length; i += 4) if (Math.abs(d[i] - 0x1f) < 24 && Math.abs(d[i + 1] - 0x5f) < 24 && Math.abs(d[i + 2] - 0x8b) < 24) n++;
      return n;
    });
    expect(linePixels).toBeGreaterThan(100);
    // the results tables are painted in a layer of their own (an isolated ancestor the sweep panel is outside of), so a redrawn sweep chart does not repaint them
    const layers = await page.evaluate(() => {
      const isolatedAncestor = (el: Element | null) => {
        for (let e = el?.parentElement ?? null; e; e = e.parentElement) if (getComputedStyle(e).isolation === 'isolate') return e;
        return null;
      };
      const table = document.querySelector('table[aria-label="Bus voltages"]');
      const sweepPanel = document.querySelector('section[aria-label="Sweeps and envelope"]');
      const wrap = isolatedAncestor(table);
      return { tableIsolated: !!wrap, sweepInside: !!wrap && !!sweepPanel && wrap.contains(sweepPanel), sweepFound: !!sweepPanel };
    });
    expect(layers).toEqual({ tableIsolated: true, sweepInside: false, sweepFound: true });

    // ---- the picked point becomes a case ----
    const chart = sweep.getByRole('img', { name: /^KITCHEN terminal voltage/ });
    const box = (await chart.boundingBox())!;
    await page.mouse.click(box.x + box.width * 0.9, box.y + box.height / 2);
    await sweep.getByRole('button', { name: 'Make this point a case' }).click();
    await expect.poll(() => editor.getByLabel('Case shown').locator('option').allTextContents()).toEqual(['Base (as drawn)', 'Neutral lost', expect.stringMatching(/^Sweep point: KITCHEN every phase › P \(kW\) = /)]);
    expect(await editor.getByRole('list', { name: 'Changes of this case' }).textContent()).toContain('DROP: open conductors none → neutral');
    // both cases built here are compared with the base
    const compare = page.getByRole('table', { name: 'Study cases compared' });
    await expect.poll(async () => (await compare.getByRole('columnheader').allTextContents()).length, { timeout: 30_000 }).toBe(4);
    expect((await compare.getByRole('columnheader').allTextContents()).slice(0, 3)).toEqual(['Quantity', 'Base', 'Neutral lost']);
    const kitchenRow = await compare.getByRole('row', { name: /^KITCHEN terminal voltage, per unit/ }).getByRole('cell').allTextContents();
    // (C) the engine: the load's pu on the base and on the saved case
    const puOf = (c: CircuitInput) => solveCircuit(c).loads.find((l) => l.id === 'KITCHEN')!.branches[0].pu!;
    expect(kitchenRow[0]).toBe(`${puOf(saved.content.circuit).toFixed(3)} pu`);
    expect(kitchenRow[1].startsWith(`${puOf(onCase).toFixed(3)} pu`)).toBe(true);

    // ---- a large sweep is cancelled ----
    const sweep2 = page.getByRole('region', { name: /^Sweep on the case shown/ });
    await sweep2.getByLabel('Parameter 1 element').selectOption('HEATER');
    await sweep2.getByLabel('Parameter 1 value').selectOption('each.kw');
    await sweep2.getByLabel('Parameter 1 points').fill('20000');
    await sweep2.getByRole('button', { name: 'Run sweep (20000 points)' }).click();
    await sweep2.getByRole('button', { name: 'Cancel sweep' }).click();
    await expect.poll(() => sweep2.getByRole('status').first().textContent()).toMatch(/^Cancelled after \d+ of 20000 points/);

    // ---- the envelope on the first case (neutral lost) ----
    await editor.getByLabel('Case shown').selectOption({ label: 'Neutral lost' });
    const env = page.getByRole('region', { name: 'Lost-neutral envelope' });
    await env.getByRole('button', { name: /^Run envelope \(125 combinations\)/ }).click();
    const table = env.getByRole('table', { name: 'Lost-neutral envelope per load' });
    await table.waitFor({ timeout: 30_000 });
    const expected = lostNeutralEnvelope(onCase, { bus: 'HOUSE' });
    for (const l of expected.loads) {
      const cells = await table.getByRole('row', { name: new RegExp(`^${l.id} `) }).getByRole('cell').allTextContents();
      expect(cells[1]).toBe(`${l.minVolts.toFixed(1)} V = ${l.minPu.toFixed(3)} pu`);
      expect(cells[2]).toBe(`${l.maxVolts.toFixed(1)} V = ${l.maxPu.toFixed(3)} pu`);
    }
    expect(await env.getByRole('img', { name: /^Locus of the star point at HOUSE: 125 combinations/ }).count()).toBe(1);
    expect(await env.textContent()).toContain(`${(expected.outsideShare * 100).toFixed(1)} % of 125 combinations`);
    expect(await env.textContent()).toContain('hazard to remove');
    await screenshot(page, 'envelope');

    // ---- a sweep too large for the browser runs on the server (saved study, the case shown): its first points are the engine's ----
    const sweep3 = page.getByRole('region', { name: /^Sweep on the case shown/ });
    await sweep3.getByLabel('Parameter 1 element').selectOption('KITCHEN');
    await sweep3.getByLabel('Parameter 1 value').selectOption('each.kw');
    await sweep3.getByLabel('Parameter 1 from').fill('0.5');
    await sweep3.getByLabel('Parameter 1 to').fill('6');
    await sweep3.getByLabel('Parameter 1 points').fill('201');
    await sweep3.getByRole('button', { name: '+ Second parameter (heat map)' }).click();
    await sweep3.getByLabel('Parameter 2 element').selectOption('HEATER');
    await sweep3.getByLabel('Parameter 2 value').selectOption('each.kw');
    await sweep3.getByLabel('Parameter 2 from').fill('1');
    await sweep3.getByLabel('Parameter 2 to').fill('4');
    await sweep3.getByLabel('Parameter 2 points').fill('100');
    expect(await sweep3.getByRole('button', { name: 'Run sweep (20100 points)' }).isDisabled()).toBe(true);
    await sweep3.getByRole('button', { name: /^Run on the server \(20100 points, revision 2\)/ }).click();
    await expect.poll(async () => Number(/^Solving: (\d+) of 20100/.exec((await sweep3.getByRole('status').first().textContent()) ?? '')?.[1] ?? 0), { timeout: 120_000 }).toBeGreaterThan(0);
    await sweep3.getByRole('button', { name: 'Cancel sweep' }).click();
    await expect.poll(() => sweep3.getByRole('status').first().textContent()).toMatch(/^Cancelled after \d+ of 20100 points/);
    expect(await sweep3.getByRole('img', { name: /^Heat map of KITCHEN terminal voltage \(pu\)/ }).count()).toBe(1);
    // 20 100 cells: one image of the cells, not an element per cell
    const heat = sweep3.getByRole('img', { name: /^Heat map of KITCHEN terminal voltage \(pu\)/ });
    expect(await heat.locator('image').count()).toBe(1);
    expect(await heat.locator('rect').count()).toBeLessThanOrEqual(1);
    const [download3] = await Promise.all([page.waitForEvent('download'), sweep3.getByRole('link', { name: 'Export CSV' }).click()]);
    const csv3 = readFileSync((await download3.path())!, 'utf8').slice(0, -2).split('\r\n');
    const h3 = csv3[1].split(',');
    expect(h3.slice(0, 2)).toEqual(['KITCHEN every phase › P (kW)', 'HEATER every phase › P (kW)']);
    const heaterCol = h3.indexOf('HEATER terminal voltage (pu)');
    for (const line of csv3.slice(2, 7)) {
      const cells = line.split(',');
      const values = [Number(cells[0]), Number(cells[1])];
      // (C) the engine's solve of the saved case with both values written
      const load = solveCircuit(sweepCircuit(onCase, ['KITCHEN.each.kw', 'HEATER.each.kw'], values)).loads.find((l) => l.id === 'HEATER')!;
      expect(Number(cells[heaterCol])).toBeCloseTo(load.branches[0].pu!, 6);
    }
    const text = (await page.locator('body').innerText()) ?? '';
    expect(text).not.toMatch(/~|case-\d/);
    expect(errors).toEqual([]);
  });
});
