/**
 * The set-up most browser test files share: the real product on a free port and one chromium,
 * started before the file's tests and stopped after them. (Kept out of harness.ts, which the
 * benchmarks import outside vitest.)
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { launchBrowser, startProduct, type RunningProduct } from './harness.ts';

/** Registers the start/stop hooks; `ready` receives the running product and browser before the first test. */
export function useProductAndBrowser(ready: (product: RunningProduct, browser: Browser) => void): void {
  let product: RunningProduct | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    product = await startProduct();
    browser = await launchBrowser();
    ready(product, browser);
  });
  afterAll(async () => {
    await browser?.close();
    await product?.stop();
  });
}
