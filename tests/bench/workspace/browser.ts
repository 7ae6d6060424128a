/**
 * Benchmark and visual check in Debian's chromium (prints figures, saves screenshots to
 * test-artifacts/workspace-results/): starts the vite dev server on a free port, opens the results
 * preview page for each demo (live solve in the real Web Worker), screenshots it, then measures the
 * worker round trip on the 300-element study. Run: `node --import tsx tests/bench/workspace/browser.ts`.
 */
import { spawn } from 'node:child_process';
import { mkdirSync } from 'node:fs';
import { cpus, loadavg } from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { freePort } from './bench-product.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const shots = path.join(root, 'test-artifacts', 'workspace-results');
const median = (xs: number[]) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

const port = await freePort();
const vite = spawn(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), '--port', String(port), '--strictPort', '--host', '127.0.0.1'], { cwd: root, stdio: ['ignore', 'pipe', 'pipe'] });
await new Promise<void>((ok, fail) => {
  const t = setTimeout(() => fail(new Error('vite did not start in 60 s')), 60_000);
  vite.stdout.on('data', (d: Buffer) => {
    if (d.toString().includes('Local')) {
      clearTimeout(t);
      ok();
    }
  });
  vite.once('exit', (code) => fail(new Error(`vite exited ${code}`)));
});
const base = `http://127.0.0.1:${port}/tests/bench/workspace/preview.html`;
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'] });
try {
  mkdirSync(shots, { recursive: true });
  const page = await browser.newPage({ viewport: { width: 1150, height: 900 } });
  page.on('pageerror', (e) => console.log(`page error: ${e.message}`));
  const views: [string, string][] = [
    ['open-neutral', '?demo=open-neutral-208y120&standard=north-american&select=KITCHEN'],
    ['delta-wye', '?demo=delta-wye-bank&standard=iec-60445&select=PM208'],
    ['split-phase', '?demo=split-phase-120-240&standard=north-american&select=LIGHTS'],
    ['earth-fault', '?demo=feeder-earth-fault&standard=iec-60445&select=END'],
  ];
  for (const [name, query] of views) {
    await page.goto(base + query);
    await page.getByRole('table', { name: 'Bus voltages' }).waitFor({ timeout: 60_000 });
    await page.screenshot({ path: path.join(shots, `${name}.png`), fullPage: true });
    console.log(`screenshot ${name}: ${await page.getByRole('status').first().textContent()}`);
  }
  await page.goto(`${base}?bench=roundtrip&runs=30`);
  await page.waitForFunction(() => window.__bench !== undefined, undefined, { timeout: 300_000 });
  const b = (await page.evaluate(() => window.__bench))!;
  if (b.error) console.log(`round trip failed: ${b.error}`);
  else
    console.log(
      `chromium worker round trip, 300-element study, value edit (post → answer on the page, ${b.roundTripMs.length} runs): median ${median(b.roundTripMs).toFixed(1)} ms, min ${Math.min(...b.roundTripMs).toFixed(1)} ms; inside the worker median ${median(b.workerMs).toFixed(1)} ms`,
    );
  console.log(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')}`);
} finally {
  await browser.close();
  vite.kill('SIGTERM');
}
