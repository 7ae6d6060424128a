/**
 * Regenerates the README screenshot: `node --import tsx tests/e2e/readme-screenshot.ts docs/screenshots/workspace.png`.
 * Starts the real product with demo data, signs in as the demo engineer and opens the open-neutral demo study.
 */
import { launchBrowser, signIn, startProduct } from './harness.ts';
const product = await startProduct();
const browser = await launchBrowser();
try {
  const page = await browser.newPage({ viewport: { width: 1440, height: 1000 } });
  await signIn(page, product.baseUrl, 'engineer@wyeward.test');
  await page.waitForURL(`${product.baseUrl}/`);
  await page.getByRole('link', { name: /open neutral/i }).first().click();
  await page.getByRole('region', { name: 'Results' }).waitFor();
  await page.waitForTimeout(4000);
  await page.screenshot({ path: process.argv[2] ?? '/tmp/shot.png' });
} finally {
  await browser.close();
  await product.stop();
}
