/**
 * Benchmark (prints figures): frame times in chromium while a node of the workspace canvas is
 * dragged, on the 300-element study, in a production build. Builds the client into a temporary
 * directory, starts the product on it (bench-server.ts, fresh data, demo accounts), signs in as the
 * demo engineer, creates the study through the API, opens its workspace and drags a bus node for
 * about two seconds while requestAnimationFrame records frame intervals. Also saves a screenshot
 * (test-artifacts/workspace-results/workspace-300.png). Run: `node --import tsx tests/bench/workspace/drag.ts`.
 */
import { spawn, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { cpus, loadavg, tmpdir } from 'node:os';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { study300 } from './study-300.ts';

const root = path.resolve(import.meta.dirname, '../../..');
const shots = path.join(root, 'test-artifacts', 'workspace-results');
const pct = (xs: number[], p: number) => {
  const s = xs.slice().sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))];
};

async function freePort(): Promise<number> {
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

const dist = mkdtempSync(path.join(tmpdir(), 'wyeward-drag-dist-'));
const data = mkdtempSync(path.join(tmpdir(), 'wyeward-drag-data-'));
const build = spawnSync(process.execPath, [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', dist, '--emptyOutDir', '--logLevel', 'warn'], { cwd: root, encoding: 'utf8' });
if (build.status !== 0) throw new Error(`vite build failed:\n${build.stderr}`);
const port = await freePort();
const server = spawn(process.execPath, ['--import', 'tsx', path.join(import.meta.dirname, 'bench-server.ts')], {
  cwd: root,
  env: { ...process.env, PORT: String(port), DATA_DIR: data, DEMO: '1', NODE_ENV: 'production', WYEWARD_BENCH_DIST: dist },
  stdio: ['ignore', 'pipe', 'pipe'],
});
let log = '';
server.stdout.on('data', (d) => (log += d));
server.stderr.on('data', (d) => (log += d));
const base = `http://127.0.0.1:${port}`;
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', headless: true, args: ['--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking'] });
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
  await page.goto(`${base}/sign-in`);
  await page.getByLabel(/e-?mail/i).fill('engineer@wyeward.test');
  await page.getByLabel(/password/i).fill('wyeward-demo');
  await page.getByRole('button', { name: /sign in/i }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
  const created = await page.evaluate(async (circuit) => {
    const res = await fetch('/api/studies', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ name: 'Bench: 300-element feeder', content: { circuit } }) });
    return { status: res.status, body: await res.json() };
  }, study300());
  if (created.status !== 201) throw new Error(`study not created: ${JSON.stringify(created)}`);
  const t0 = Date.now();
  await page.goto(`${base}/studies/${created.body.id}`);
  await page.locator('.react-flow__node').first().waitFor({ timeout: 120_000 });
  const nodes = await page.locator('.react-flow__node').count();
  console.log(`workspace open with ${nodes} canvas nodes after ${((Date.now() - t0) / 1000).toFixed(1)} s`);
  await page.waitForTimeout(1500);
  mkdirSync(shots, { recursive: true });
  await page.screenshot({ path: path.join(shots, 'workspace-300.png') });

  // Drag a bus node well inside the view along a loop while recording frame intervals.
  const node = page.locator('.react-flow__node').nth(Math.min(nodes - 1, 40));
  await node.scrollIntoViewIfNeeded();
  const box = (await node.boundingBox())!;
  const cx = box.x + box.width / 2;
  const cy = box.y + box.height / 2;
  // A string, not a function: tsx's transform adds helpers (__name) that do not exist in the page.
  await page.evaluate(`(() => {
    window.__frames = [];
    window.__stop = false;
    let last = performance.now();
    const tick = (t) => { window.__frames.push(t - last); last = t; if (!window.__stop) requestAnimationFrame(tick); };
    requestAnimationFrame(tick);
  })()`);
  await page.mouse.move(cx, cy);
  await page.mouse.down();
  const steps = 120;
  for (let i = 1; i <= steps; i++) {
    const a = (2 * Math.PI * i) / steps;
    await page.mouse.move(cx + (100 * i) / steps + 60 * Math.sin(a), cy + 40 * (1 - Math.cos(a)));
    await page.waitForTimeout(16);
  }
  await page.mouse.up();
  const frames = (await page.evaluate('(() => { window.__stop = true; return window.__frames.slice(1); })()')) as number[];
  const after = (await node.boundingBox())!;
  console.log(`dragged node moved by ${Math.hypot(after.x - box.x, after.y - box.y).toFixed(0)} px (the pointer ends 100 px right of where it started; snap to grid may round)`);
  const long = frames.filter((f) => f > 50).length;
  console.log(
    `drag (${steps} mouse moves): ${frames.length} frames, interval median ${pct(frames, 50).toFixed(1)} ms, p95 ${pct(frames, 95).toFixed(1)} ms, max ${Math.max(...frames).toFixed(1)} ms, ${long} frame(s) over 50 ms`,
  );
  console.log(`machine: ${cpus().length} cores, load average ${loadavg().map((x) => x.toFixed(1)).join(' / ')} (headless, software rendering)`);
} finally {
  await browser.close();
  server.kill('SIGTERM');
  await new Promise((r) => setTimeout(r, 1500));
  rmSync(dist, { recursive: true, force: true });
  rmSync(data, { recursive: true, force: true });
}
