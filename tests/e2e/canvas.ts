/**
 * What a person does on the study canvas, for the browser tests: wire two handles with the mouse,
 * click a wire, select a symbol, type into a property field.
 */
import type { Locator, Page } from 'playwright-core';

/** Drags from one handle to another with the mouse, as a person wires the diagram. */
export async function wire(page: Page, from: string, to: string) {
  const a = await page.getByLabel(from, { exact: true }).boundingBox();
  const b = await page.getByLabel(to, { exact: true }).boundingBox();
  if (!a || !b) throw new Error(`handle not on screen: ${!a ? from : to}`);
  await page.mouse.move(a.x + a.width / 2, a.y + a.height / 2);
  await page.mouse.down();
  await page.mouse.move((a.x + b.x) / 2, (a.y + b.y) / 2, { steps: 6 });
  await page.mouse.move(b.x + b.width / 2, b.y + b.height / 2, { steps: 6 });
  await page.mouse.up();
}

/**
 * Clicks a wire at a share `along` of its length, as a person selects a connection. The middle
 * (0.5) carries the wire's one-click open control; a quarter of the way selects the wire itself.
 */
export async function clickWire(page: Page, label: string, along = 0.25) {
  const pt = await page.locator(`[aria-label="${label}"] path.react-flow__edge-interaction`).evaluate((p: SVGPathElement, share: number) => {
    const q = p.getPointAtLength(p.getTotalLength() * share);
    const m = p.getScreenCTM()!;
    return { x: q.x * m.a + q.y * m.c + m.e, y: q.x * m.b + q.y * m.d + m.f };
  }, along);
  await page.mouse.click(pt.x, pt.y);
}

/** Selects a node by clicking its symbol. */
export async function selectNode(page: Page, label: string) {
  await page.getByLabel(label, { exact: true }).locator('svg').first().click();
}

/** The properties panel. */
export function properties(page: Page): Locator {
  return page.getByRole('region', { name: 'Properties' });
}

/** Types into a property field and applies it with Enter. */
export async function setField(page: Page, label: RegExp, value: string) {
  const input = properties(page).getByRole('textbox', { name: label });
  await input.fill(value);
  await input.press('Enter');
}
