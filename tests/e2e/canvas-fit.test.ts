/**
 * The open-neutral demo study as an engineer first sees it in a 1280×900 window, after it loads and
 * fits: the minimap and the lost-neutral alert hide nothing drawn for a node (symbol, name, values),
 * the Fit view control keeps it so, and the chips (open control, currents) of the wires do not
 * overlap one another, on one wire or on the two wires of a single-phase load.
 */
import { describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import path from 'node:path';
import { ARTIFACTS, screenshot, signIn, type RunningProduct } from './harness.ts';
import { useProductAndBrowser } from './product-fixture.ts';
import { clickWire } from './canvas.ts';

type Box = { x: number; y: number; width: number; height: number };

function overlap(a: Box, b: Box) {
  return a.x < b.x + b.width && a.x + a.width > b.x && a.y < b.y + b.height && a.y + a.height > b.y;
}

/** Waits until the viewport stops moving (a fit animates). */
async function settled(page: Page) {
  const transform = () => page.locator('.react-flow__viewport').evaluate((v) => (v as HTMLElement).style.transform);
  let last = '';
  await expect
    .poll(
      async () => {
        await page.waitForTimeout(150);
        const now = await transform();
        const still = now === last;
        last = now;
        return still;
      },
      { timeout: 15_000 },
    )
    .toBe(true);
}

/** Every box drawn for a node (its symbol, name and value lines) with its text, as the page lays it out. */
function nodeBoxes(page: Page): Promise<{ text: string; box: Box }[]> {
  return page.locator('.react-flow__node').evaluateAll((nodes) =>
    nodes.flatMap((n) =>
      [n, ...n.querySelectorAll('*')].flatMap((el) => {
        const r = el.getBoundingClientRect();
        if (r.width === 0 || r.height === 0) return [];
        // The box of a node itself is drawn only where its children are.
        if (el === n) return [];
        const text = el.children.length === 0 ? (el.textContent ?? '') : '';
        const owner = n.querySelector('[aria-label]')?.getAttribute('aria-label') ?? '';
        return [{ text: `${owner}: ${el.tagName} ${text}`, box: { x: r.x, y: r.y, width: r.width, height: r.height } }];
      }),
    ),
  );
}

/** What covers the drawing: the minimap and the alert, where either sits over the canvas pane. */
async function covers(page: Page): Promise<{ name: string; box: Box }[]> {
  const pane = (await page.locator('.react-flow').boundingBox())!;
  const out: { name: string; box: Box }[] = [{ name: 'minimap', box: (await page.locator('.react-flow__minimap').boundingBox())! }];
  const alert = (await page.getByRole('alert', { name: 'Neutral lost' }).boundingBox())!;
  if (overlap(alert, pane)) out.push({ name: 'alert', box: alert });
  return out;
}

async function expectNothingCovered(page: Page) {
  const hidden: string[] = [];
  const over = await covers(page);
  for (const { text, box } of await nodeBoxes(page)) for (const c of over) if (overlap(box, c.box)) hidden.push(`${c.name} covers ${text}`);
  expect(hidden).toEqual([]);
}

describe('the open-neutral demo fits clear of the minimap and the alert', () => {
  let product: RunningProduct;
  let browser: Browser;

  useProductAndBrowser((p, b) => {
    product = p;
    browser = b;
  });

  it('at 1280×900 no node label is under the minimap or the alert, after the first fit and after Fit view; chips of a wire do not overlap', async () => {
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    await signIn(page, product.baseUrl, 'engineer@wyeward.test');
    await page.waitForURL(`${product.baseUrl}/`);
    await page.getByRole('link', { name: 'Open neutral on a 208Y/120 V service' }).click();
    await page.waitForURL(/\/studies\//);
    await page.getByRole('alert', { name: 'Neutral lost' }).waitFor({ timeout: 20_000 });
    await page.getByRole('region', { name: 'Results' }).getByRole('table', { name: 'Load voltages' }).waitFor({ timeout: 20_000 });
    await settled(page);
    await screenshot(page, 'canvas-fit-first');
    await expectNothingCovered(page);
    // The alert above the diagram does not push the canvas and its minimap out of the window.
    const minimap = (await page.locator('.react-flow__minimap').boundingBox())!;
    expect(minimap.y + minimap.height).toBeLessThanOrEqual(900);

    await page.getByRole('button', { name: 'Fit view' }).click();
    await settled(page);
    await expectNothingCovered(page);
    // Closing the neutral takes the alert away and opening it brings it back: the canvas changes size
    // and the fitted view is fitted again, so nothing drawn leaves the pane or goes under the minimap.
    const alert = page.getByRole('alert', { name: 'Neutral lost' });
    await clickWire(page, 'Connection DROP to bus PAD', 0.5);
    await page.getByRole('button', { name: 'Close neutral', exact: true }).click();
    await expect.poll(() => alert.count(), { timeout: 15_000 }).toBe(0);
    await page.getByRole('button', { name: 'Open neutral', exact: true }).click();
    await alert.waitFor({ timeout: 15_000 });
    await settled(page);
    await expectNothingCovered(page);
    const pane = (await page.locator('.react-flow').boundingBox())!;
    const outside = (await nodeBoxes(page)).filter(({ box }) => box.x < pane.x || box.y < pane.y || box.x + box.width > pane.x + pane.width || box.y + box.height > pane.y + pane.height);
    expect(outside.map((o) => o.text)).toEqual([]);
    // The window as the engineer sees it.
    await page.screenshot({ path: path.join(ARTIFACTS, 'canvas-fit-window.png') });

    // The chips (open control, what is open, each current) of the wires do not overlap one another,
    // neither on one wire nor on the wires side by side (the two terminals of a single-phase load).
    const clashes = await page.locator('.react-flow__edgelabel-renderer > *').evaluateAll((labels) => {
      const chips = labels.flatMap((label, wire) =>
        [...label.querySelectorAll('button, span.whitespace-nowrap')].map((c) => ({ wire, text: c.textContent ?? '', r: c.getBoundingClientRect() })),
      );
      const out: string[] = [];
      for (let i = 0; i < chips.length; i++)
        for (let j = i + 1; j < chips.length; j++) {
          const a = chips[i].r;
          const b = chips[j].r;
          // A pixel of slack: a chip's border may touch the line under it.
          const dx = Math.min(a.right, b.right) - Math.max(a.left, b.left);
          const dy = Math.min(a.bottom, b.bottom) - Math.max(a.top, b.top);
          if (dx > 1 && dy > 1) out.push(`${chips[i].text} / ${chips[j].text} (${dx.toFixed(1)}×${dy.toFixed(1)} px)`);
        }
      return out;
    });
    expect(clashes).toEqual([]);
    await screenshot(page, 'canvas-fit-after-fit');
    await page.close();
  });
});
