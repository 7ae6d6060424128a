/**
 * The product as the browser benchmarks run it: a production build of the client in a temp
 * directory, the server (bench-server.ts) with the demo data on a free port, Debian's chromium
 * headless, and the demo engineer signed in on a 1400×900 page. `close()` stops them all and
 * removes the temp directories.
 */
import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

const root = path.resolve(import.meta.dirname, '../../..');

/** A free TCP port on the loopback interface. */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      const port = typeof a === 'object' && a ? a.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export interface BenchProduct {
  base: string;
  browser: Browser;
  page: Page;
  close(): Promise<void>;
}

/**
 * Builds, starts and signs in. `name` names the temp directories; `unminified` builds without
 * minifying (for readable CPU profiles); `initScript` runs in the page before any of its scripts.
 */
export async function startBenchProduct(name: string, { unminified = false, initScript }: { unminified?: boolean; initScript?: string } = {}): Promise<BenchProduct> {
  const dist = mkdtempSync(path.join(tmpdir(), `wyeward-${name}-dist-`));
  const data = mkdtempSync(path.join(tmpdir(), `wyeward-${name}-data-`));
  const build = spawnSync(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', dist, '--emptyOutDir', '--logLevel', 'warn', ...(unminified ? ['--minify', 'false'] : [])], { cwd: root, encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`vite build failed:\n${build.stderr}`);
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const server = spawn(process.execPath, ['--import', 'tsx', path.join(import.meta.dirname, 'bench-server.ts')], {
    cwd: root,
    env: { ...process.env, PORT: String(port), APP_URL: base, DATA_DIR: data, DEMO: '1', NODE_ENV: 'production', WYEWARD_BENCH_DIST: dist },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let log = '';
  server.stdout.on('data', (d) => (log += d));
  server.stderr.on('data', (d) => (log += d));
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  const close = async () => {
    await browser.close();
    server.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 1500));
    rmSync(dist, { recursive: true, force: true });
    rmSync(data, { recursive: true, force: true });
  };
  try {
    for (let i = 0; ; i++) {
      if (server.exitCode !== null) throw new Error(`server exited:\n${log}`);
      const ok = await fetch(`${base}/api/health`).then((r) => r.ok).catch(() => false);
      if (ok) break;
      if (i > 800) throw new Error(`server did not start:\n${log}`);
      await new Promise((r) => setTimeout(r, 250));
    }
    const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    page.on('pageerror', (e) => console.log(`page error: ${e.message}`));
    if (initScript) await page.addInitScript(initScript);
    await page.goto(`${base}/sign-in`);
    await page.getByLabel(/e-?mail/i).fill('engineer@wyeward.test');
    await page.getByLabel(/password/i).fill('wyeward-demo');
    await page.getByRole('button', { name: /sign in/i }).click();
    // generous: on a loaded machine the first sign-in (password hash, first queries) can take long
    await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 180_000 }).catch(async (e) => {
      throw new Error(`sign-in did not finish: ${(await page.locator('body').innerText()).slice(0, 400)}`, { cause: e });
    });
    return { base, browser, page, close };
  } catch (err) {
    await close();
    throw err;
  }
}
